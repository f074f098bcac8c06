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
