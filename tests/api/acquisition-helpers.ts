import { expect } from 'vitest';
import { binary, type TestApp } from './helpers.ts';

/** A zero-filled reconstruction of `body` (201), with the URLs of its acquisition bundle; its id. */
export async function reconstructWithBundle(
  t: Pick<TestApp, 'http'>,
  body: Record<string, unknown>,
): Promise<string> {
  const res = await t
    .http()
    .post('/v1/reconstructions')
    .send({ method: { name: 'zero-filled' }, ...body });
  expect(res.status).toBe(201);
  expect(res.body.acquisition).toEqual({
    nifti: `/v1/results/${res.body.id}/acquisition.nii`,
    json: `/v1/results/${res.body.id}/acquisition.json`,
  });
  return res.body.id;
}

/** The bytes of a binary download (200). */
export async function download(t: Pick<TestApp, 'http'>, path: string): Promise<Buffer> {
  const res = await t.http().get(path).buffer(true).parse(binary);
  expect(res.status).toBe(200);
  return res.body as Buffer;
}

/** Bytes of the NIfTI-1 header and extension flag the export writes before the voxels (nifti1.h). */
export const VOXELS_AT = 352;

// biome-ignore lint/suspicious/noExplicitAny: acquisition.json as parsed; the test reads a few of its fields
export type BundleJson = Record<string, any>;
export type Bundle = { nifti: Buffer; header: Buffer; json: BundleJson };

/** A result's acquisition bundle as GET /v1/results/{id}/acquisition.nii and .json give it. */
export async function exported(t: Pick<TestApp, 'http'>, id: string): Promise<Bundle> {
  const nifti = await download(t, `/v1/results/${id}/acquisition.nii`);
  const header = await download(t, `/v1/results/${id}/acquisition.json`);
  return { nifti, header, json: JSON.parse(header.toString('utf8')) };
}

/** POST /v1/raw with the bundle's two parts, `nifti` and `header`. */
export function importBundle(t: Pick<TestApp, 'http'>, nifti: Buffer, header: Buffer | string) {
  return t
    .http()
    .post('/v1/raw')
    .attach('nifti', nifti, 'acquisition.nii')
    .attach('header', Buffer.from(header), 'acquisition.json');
}

/** The exported voxels as float32 (little-endian, as the export writes them). */
export function voxels(nifti: Buffer): Float32Array {
  return new Float32Array(nifti.buffer.slice(nifti.byteOffset + VOXELS_AT, nifti.byteOffset + nifti.length));
}

/** How many values differ in their bits (Object.is: −0 and NaN count); the lengths must agree. */
export function differing(a: ArrayLike<number>, b: ArrayLike<number>): number {
  expect(a.length).toBe(b.length);
  let count = 0;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) count++;
  return count;
}
