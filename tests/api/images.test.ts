import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { debianFile } from '../io/debian-files.ts';
import {
  expectDocumented,
  expectProblem,
  expectStoredCopy,
  postProblem,
  sharedTestApp,
  testApp,
  uploadFile,
} from './helpers.ts';

const fixture = (name: string) => readFileSync(new URL(`../fixtures/io/${name}`, import.meta.url));

describe('POST/GET/DELETE /v1/images', () => {
  const t = sharedTestApp({ limits: { maxUploadBytes: 200_000, maxMatrixSide: 256 } });

  it('uploads MR_small.dcm: 201, Location, 64×64 DICOM with the docs/references.md §12.1 statistics', async () => {
    const res = await uploadFile(t, debianFile('pydicom', 'MR_small.dcm'), 'scan.dcm');
    expect(res.status).toBe(201);
    await expectDocumented('POST', '/v1/images', res);
    expect(res.headers.location).toBe(`/v1/images/${res.body.id}`);
    expect(res.body).toMatchObject({ nx: 64, ny: 64, format: 'dicom' });
    // min 127, max 2145, mean 518.88134765625 (docs/references.md §12.1, pydicom)
    expect(res.body.stats).toEqual({ min: 127, max: 2145, mean: 518.88134765625 });
    await expectStoredCopy(t, res);
  });

  it('uploads NIfTI with a slice choice (functional.nii slice 0: 17×21, scl scaling noted)', async () => {
    const res = await uploadFile(
      t,
      debianFile('nibabel', 'functional.nii'),
      'f.nii',
      '/v1/images?slice=0&volume=3',
    );
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ nx: 17, ny: 21, format: 'nifti' });
    expect(res.body.details).toMatchObject({ slice: 0, volume: 3, sclSlope: 0.07540696859359741 });
    expect(res.body.notes.join(' ')).toMatch(/scl_slope/);
  });

  it('the slice may also be a form field before the file (multipart/form-data, RFC 7578)', async () => {
    const res = await t
      .http()
      .post('/v1/images')
      .field('slice', '2')
      .field('volume', '1')
      .attach('file', debianFile('nibabel', 'functional.nii'), 'f.nii');
    expect(res.status).toBe(201);
    expect(res.body.details).toMatchObject({ slice: 2, volume: 1 });
    const bad = await t
      .http()
      .post('/v1/images')
      .field('slice', '-3')
      .attach('file', debianFile('nibabel', 'functional.nii'), 'f.nii');
    expectProblem(bad, 422, 'slice');
  });

  it('uploads 16-bit PNG and colour PNG (luminance noted)', async () => {
    const grey = await uploadFile(t, fixture('ramp16.png'), 'r.png');
    expect(grey.status).toBe(201);
    expect(grey.body.stats.max).toBe(65246); // 34·1919, tests/reference/io_raster_facts.py
    const colour = await uploadFile(t, fixture('astronaut64.png'), 'a.png');
    expect(colour.status).toBe(201);
    expect(colour.body.notes.join(' ')).toMatch(/luminance/);
  });

  it('DELETE removes the image: 204, then GET is a 404 problem', async () => {
    const res = await uploadFile(t, fixture('camera64.png'), 'c.png');
    const del = await t.http().delete(`/v1/images/${res.body.id}`);
    expect(del.status).toBe(204);
    expectProblem(await t.http().get(`/v1/images/${res.body.id}`), 404, 'id');
    expectProblem(await t.http().delete(`/v1/images/${res.body.id}`), 404, 'id');
  });

  it('JPEG-LS / JPEG 2000 DICOM → 415 naming the transfer syntax (docs/references.md §12.1)', async () => {
    for (const name of ['MR_small_jpeg_ls_lossless.dcm', 'MR_small_jp2klossless.dcm']) {
      const res = await uploadFile(t, debianFile('pydicom', name), 'x.dcm');
      const problem = expectProblem(res, 415, 'file');
      expect(problem.detail).toMatch(/1\.2\.840\.10008\.1\.2\.4\.(80|90)/);
      await expectDocumented('POST', '/v1/images', res);
    }
  });

  it('truncated DICOM, ANALYZE header, text file → 415 problem+json', async () => {
    for (const [bytes, name] of [
      [debianFile('pydicom', 'MR_truncated.dcm'), 't.dcm'],
      [debianFile('nibabel', 'analyze.hdr'), 'a.hdr'],
      [Buffer.from('not an image'), 'x.txt'],
      [fixture('truncated.png'), 't.png'],
    ] as const) {
      expectProblem(await uploadFile(t, bytes, name), 415, 'file');
    }
  });

  it('frame / slice out of range → 422 naming the field; negative → 422 from the schema', async () => {
    const frame = await uploadFile(t, debianFile('pydicom', 'MR_small.dcm'), 'm.dcm', '/v1/images?frame=3');
    expect(expectProblem(frame, 422, 'frame').errors[0].allowed).toBe('0 ≤ frame ≤ 0');
    const slice = await uploadFile(
      t,
      debianFile('nibabel', 'anatomical.nii'),
      'a.nii',
      '/v1/images?slice=99',
    );
    expectProblem(slice, 422, 'slice');
    expectProblem(await uploadFile(t, fixture('camera64.png'), 'c.png', '/v1/images?slice=-1'), 422, 'slice');
  });

  it('upload larger than the configured 200 000-byte limit → 413 problem on field "file"', async () => {
    const big = Buffer.alloc(250_000, 1);
    expectProblem(await uploadFile(t, big, 'big.bin'), 413, 'file');
  });

  it('no file part → 400; not multipart → 415', async () => {
    expectProblem(await t.http().post('/v1/images').field('other', 'x'), 400, 'file');
    await postProblem(t, '/v1/images', { file: 'x' }, 415);
  });
});

describe('an image larger than maxMatrixSide is refused with 422 (limit)', () => {
  it('MR_small (64×64) with maxMatrixSide 32', async () => {
    const t = await testApp({ limits: { maxMatrixSide: 32 } });
    try {
      const res = await uploadFile(t, debianFile('pydicom', 'MR_small.dcm'), 'm.dcm');
      const problem = expectProblem(res, 422, 'file');
      expect(problem.type).toBe('/problems/limit-exceeded');
      expect(problem.errors[0].allowed).toBe('≤ 32 per side');
    } finally {
      await t.close();
    }
  });
});

describe('no patient identifier from a DICOM header is ever stored, logged or returned (docs/design.md §4.5; docs/references.md §10.1)', () => {
  // MR_small.dcm: Patient's Name "CompressedSamples^MR1", Patient ID "4MR1", Institution Name "TOSHIBA" [L].
  const identifiers = ['CompressedSamples^MR1', 'CompressedSamples', '4MR1', 'TOSHIBA'];

  it('upload, read back and delete-free: responses, pino logs and every file under DATA_DIR are clean', async () => {
    const file = debianFile('pydicom', 'MR_small.dcm');
    // The test means something only if the identifiers are in the upload.
    for (const id of identifiers) expect(file.includes(Buffer.from(id, 'latin1'))).toBe(true);
    const t = await testApp({ logger: { level: 'trace' } });
    const responses: string[] = [];
    // Even the client's file name carries the patient name: it must not be kept either.
    const upload = await uploadFile(t, file, 'CompressedSamples^MR1-4MR1.dcm');
    expect(upload.status).toBe(201);
    responses.push(upload.text, JSON.stringify(upload.headers));
    const info = await t.http().get(`/v1/images/${upload.body.id}`);
    responses.push(info.text, JSON.stringify(info.headers));
    // A second copy with a bad frame: the error path must be clean as well.
    const bad = await uploadFile(t, file, 'CompressedSamples^MR1.dcm', '/v1/images?frame=7');
    expect(bad.status).toBe(422);
    responses.push(bad.text);
    await t.close();
    expect(t.logs.length).toBeGreaterThan(0);
    const stored = readdirSync(t.dataDir).map((name) => readFileSync(join(t.dataDir, name)));
    expect(stored.length).toBeGreaterThan(0);
    for (const id of identifiers) {
      for (const text of responses) expect(text).not.toContain(id);
      for (const line of t.logs) expect(line).not.toContain(id);
      for (const bytes of stored) expect(bytes.includes(Buffer.from(id, 'latin1'))).toBe(false);
    }
  });
});

describe('a NIfTI header with a bad field → 422 naming it (nifti1.h, NIfTI Data Format Working Group)', () => {
  it('anatomical.nii with vox_offset −4 (float32 at byte 108, big-endian) → 422 on file.vox_offset', async () => {
    const bytes = Buffer.from(debianFile('nibabel', 'anatomical.nii'));
    bytes.writeFloatBE(-4, 108);
    const t = await testApp();
    try {
      const res = await uploadFile(t, bytes, 'a.nii');
      const problem = expectProblem(res, 422, 'file.vox_offset');
      expect(problem.type).toBe('/problems/out-of-range');
      expect(problem.errors[0].allowed).toMatch(/≥ 352/);
      await expectDocumented('POST', '/v1/images', res);
    } finally {
      await t.close();
    }
  });
});
