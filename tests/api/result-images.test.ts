import { readFileSync } from 'node:fs';
import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { binary, expectDocumented, expectProblem, postJson, sharedTestApp } from './helpers.ts';

const volumeOrder = ['reconstruction', 'zero-filled', 'reference', 'error-map'];

/** A NIfTI-1 file's header fields at the offsets of nifti1.h (docs/references.md §10.2), little-endian. */
function niftiHeader(bytes: Buffer) {
  return {
    sizeofHdr: bytes.readInt32LE(0),
    dim: Array.from({ length: 8 }, (_, i) => bytes.readInt16LE(40 + 2 * i)),
    datatype: bytes.readInt16LE(70),
    bitpix: bytes.readInt16LE(72),
    voxOffset: bytes.readFloatLE(108),
    sclSlope: bytes.readFloatLE(112),
    descrip: bytes.toString('latin1', 148, 228).replace(/\0+$/, ''),
    qformCode: bytes.readInt16LE(252),
    sformCode: bytes.readInt16LE(254),
    magic: bytes.toString('latin1', 344, 348),
  };
}

/** Volume t of a float32 NIfTI in image order (row 0 at the top), undoing the writer's upward j. */
function volumeOf(bytes: Buffer, t: number, nx: number, ny: number): Float64Array {
  const out = new Float64Array(nx * ny);
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      out[(ny - 1 - j) * nx + i] = bytes.readFloatLE(352 + 4 * (t * nx * ny + j * nx + i));
    }
  }
  return out;
}

describe('result images at full precision', () => {
  const t = sharedTestApp();
  let id = '';
  const get = (path: string) => t.http().get(path).buffer(true).parse(binary);

  it('images.nii: float32 NIfTI-1 with the named images along the 4th dimension', async () => {
    const raw = readFileSync(new URL('../fixtures/ismrmrd/shepp-logan-4coil.h5', import.meta.url));
    const rawId = (await t.http().post('/v1/raw').attach('file', raw, 'a.h5')).body.id;
    const recon = await postJson(t, '/v1/reconstructions', {
      source: { rawId },
      matrix: { nx: 64, ny: 64 },
      sampling: { pattern: 'cartesian-uniform', acceleration: 2 },
      method: { name: 'zero-filled' },
    });
    expect(recon.status).toBe(201);
    id = recon.body.id;
    const res = await get(`/v1/results/${id}/images.nii`);
    expect(res.status).toBe(200);
    await expectDocumented('GET', `/v1/results/${id}/images.nii`, res);
    expect(res.headers['x-volumes']).toBe(volumeOrder.join(','));
    const bytes = res.body as Buffer;
    // The layout nibabel reads from the writer (tests/reference/fixtures/nifti-writer.json).
    expect(niftiHeader(bytes)).toEqual({
      sizeofHdr: 348,
      dim: [4, 64, 64, 1, 4, 1, 1, 1],
      datatype: 16,
      bitpix: 32,
      voxOffset: 352,
      sclSlope: 0,
      descrip: `kspace-planner: ${volumeOrder.join(',')}`,
      qformCode: 0,
      sformCode: 0,
      magic: 'n+1\0',
    });
    expect(bytes.length).toBe(352 + 4 * 64 * 64 * 4);
    // The error map is | |reconstruction| − |reference| | of the stored volumes (float32 rounding).
    const [recons, , reference, errorMap] = [0, 1, 2, 3].map((v) => volumeOf(bytes, v, 64, 64));
    let worst = 0;
    for (let i = 0; i < errorMap.length; i++) {
      worst = Math.max(worst, Math.abs(errorMap[i] - Math.abs(recons[i] - reference[i])));
    }
    expect(worst).toBeLessThan(1e-5 * Math.max(...reference));
    expect(Math.max(...errorMap)).toBeGreaterThan(0);
  });

  it('depth=16: 16-bit grey PNG, levels round(65535·v/white) with white = the reference maximum', async () => {
    const nii = (await get(`/v1/results/${id}/images.nii`)).body as Buffer;
    const reference = volumeOf(nii, 2, 64, 64);
    const white = Math.max(...reference);
    for (const [volume, name, level] of [
      [0, 'reconstruction', white],
      [3, 'error-map', Math.max(...volumeOf(nii, 3, 64, 64))],
    ] as const) {
      const res = await get(`/v1/results/${id}/${name}.png?depth=16`);
      expect(res.status).toBe(200);
      await expectDocumented('GET', `/v1/results/${id}/${name}.png`, res);
      // The white level is kept in float64; the volumes are float32.
      const stated = Number(res.headers['x-grey-white']);
      expect(Math.abs(stated - level)).toBeLessThan(1e-6 * level);
      expect(res.headers['x-grey-scale']).toBe('linear');
      const png = sharp(res.body as Buffer);
      const meta = await png.metadata();
      expect(meta).toMatchObject({ format: 'png', depth: 'ushort', channels: 1, width: 64, height: 64 });
      // Read back as one 16-bit grey channel (sharp would otherwise expand it to sRGB).
      const { data } = await png
        .toColourspace('grey16')
        .raw({ depth: 'ushort' })
        .toBuffer({ resolveWithObject: true });
      const levels = new Uint16Array(data.buffer, data.byteOffset, data.byteLength / 2);
      const values = volumeOf(nii, volume, 64, 64);
      let mismatches = 0;
      for (let i = 0; i < values.length; i++) {
        const expected = Math.round((65535 * Math.min(Math.max(values[i], 0), stated)) / stated);
        if (levels[i] !== expected) mismatches++;
      }
      expect(mismatches).toBe(0);
    }
    // The 8-bit image stays as it was.
    const eight = await get(`/v1/results/${id}/reconstruction.png`);
    expect((await sharp(eight.body as Buffer).metadata()).depth).toBe('uchar');
  });

  it('depth=16 of an image kept in 8 bits only is a 422 naming depth; unknown results 404', async () => {
    expectProblem(await t.http().get(`/v1/results/${id}/mask.png?depth=16`), 422, 'depth');
    expectProblem(await t.http().get(`/v1/results/${id}/mask.png?depth=12`), 422, 'depth');
    expectProblem(await t.http().get('/v1/results/nope/images.nii'), 404, 'id');
    expectProblem(await t.http().get('/v1/results/nope/reference.png?depth=16'), 404, 'id');
  });
});
