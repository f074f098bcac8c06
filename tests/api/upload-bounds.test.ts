import { crc32, deflateSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { debianFile } from '../io/debian-files.ts';
import { deflatedDicomBomb, gzippedNifti2Bomb } from '../io/inflation-bombs.ts';
import {
  expectDocumented,
  expectProblem,
  sharedTestApp,
  type TestApp,
  testApp,
  uploadFile,
} from './helpers.ts';

/** A PNG chunk: length, type, data, CRC-32 of type and data (PNG specification, W3C 2003, §5.3). */
function pngChunk(type: string, data: Buffer): Buffer {
  const length = Buffer.alloc(4);
  length.writeUInt32BE(data.length);
  const typed = Buffer.concat([Buffer.from(type, 'latin1'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(typed) >>> 0);
  return Buffer.concat([length, typed, crc]);
}

/** A valid-looking 8-bit greyscale PNG that declares width×height but carries one row of data. */
function pngDeclaring(width: number, height: number): Buffer {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 0; // colour type: greyscale
  const signature = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
  const idat = deflateSync(Buffer.alloc(width + 1));
  return Buffer.concat([
    signature,
    pngChunk('IHDR', ihdr),
    pngChunk('IDAT', idat),
    pngChunk('IEND', Buffer.alloc(0)),
  ]);
}

/**
 * Peak growth while `work` runs, sampled every millisecond: RSS of the whole process (server and its
 * worker thread) and ArrayBuffer memory of the main thread (where the upload is received).
 */
async function peakGrowth<T>(
  work: () => Promise<T>,
): Promise<{ result: T; rss: number; arrayBuffers: number }> {
  const before = process.memoryUsage();
  let rss = before.rss;
  let arrayBuffers = before.arrayBuffers;
  const sample = setInterval(() => {
    const now = process.memoryUsage();
    rss = Math.max(rss, now.rss);
    arrayBuffers = Math.max(arrayBuffers, now.arrayBuffers);
  }, 1);
  try {
    const result = await work();
    const now = process.memoryUsage();
    rss = Math.max(rss, now.rss);
    arrayBuffers = Math.max(arrayBuffers, now.arrayBuffers);
    return { result, rss: rss - before.rss, arrayBuffers: arrayBuffers - before.arrayBuffers };
  } finally {
    clearInterval(sample);
  }
}

const mebibyte = 1024 * 1024;

describe('decompression bombs are refused with 422 limit-exceeded and bounded memory', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await testApp(); // default limits: 64 MiB uploads, 1024-pixel sides
    // Warm the worker up (modules loaded, deflate path taken once) so that only the bomb is measured.
    const warm = await uploadFile(t, debianFile('pydicom', 'image_dfl.dcm'), 'w.dcm');
    expect(warm.status).toBe(201);
  });
  afterAll(async () => t.close());

  it('a 0.3 MB deflated DICOM that would inflate to 400 MiB: 422 on "file", peak growth < 200 MB', async () => {
    const bomb = deflatedDicomBomb(400);
    expect(bomb.length).toBeLessThan(500_000);
    const { result, rss, arrayBuffers } = await peakGrowth(() => uploadFile(t, bomb, 'bomb.dcm'));
    const problem = expectProblem(result, 422, 'file');
    expect(problem.type).toBe('/problems/limit-exceeded');
    await expectDocumented('POST', '/v1/images', result);
    // Measured: unbounded inflation (the previous code) peaked at +1214 MB RSS and answered 201; with the
    // 64 MiB bound +60 MB. 200 MB leaves room for the copy of the inflated data set (another 64 MiB).
    expect(rss).toBeLessThan(200 * mebibyte);
    expect(arrayBuffers).toBeLessThan(200 * mebibyte);
  });

  it('a .nii.gz declaring 153 MB of voxels behind 400 MiB of gzip: 422 on "file", peak growth < 200 MB', async () => {
    const bomb = gzippedNifti2Bomb(400, (header) => header.writeBigInt64LE(60000n, 16 + 8 * 3));
    const { result, rss, arrayBuffers } = await peakGrowth(() => uploadFile(t, bomb, 'bomb.nii.gz'));
    expect(expectProblem(result, 422, 'file').type).toBe('/problems/limit-exceeded');
    expect(rss).toBeLessThan(200 * mebibyte);
    expect(arrayBuffers).toBeLessThan(200 * mebibyte);
  });

  it('a .nii.gz with 400 MiB of zeros after a valid image decodes (201) without inflating the zeros', async () => {
    const bomb = gzippedNifti2Bomb(400);
    const { result, rss } = await peakGrowth(() =>
      uploadFile(t, bomb, 'padded.nii.gz', '/v1/images?slice=0&volume=1'),
    );
    expect(result.status).toBe(201);
    expect(result.body).toMatchObject({ nx: 32, ny: 20, format: 'nifti' });
    expect(rss).toBeLessThan(200 * mebibyte);
  });

  it('a PNG declaring 60000×60000 pixels (a few hundred bytes) → 422 limit-exceeded, not "damaged"', async () => {
    const png = pngDeclaring(60000, 60000);
    expect(png.length).toBeLessThan(1000);
    const res = await uploadFile(t, png, 'huge.png');
    const problem = expectProblem(res, 422, 'file');
    expect(problem.type).toBe('/problems/limit-exceeded');
    expect(problem.errors[0].message).toContain('60000×60000');
    expect(problem.errors[0].allowed).toBe('≤ 1024 per side');
  });
});

describe('RLE output is bounded by the matrix limit before it is decoded', () => {
  it('MR_small_RLE.dcm (64×64) with maxMatrixSide 32 → 422 limit-exceeded', async () => {
    const t = await testApp({ limits: { maxMatrixSide: 32 } });
    try {
      const res = await uploadFile(t, debianFile('pydicom', 'MR_small_RLE.dcm'), 'r.dcm');
      expect(expectProblem(res, 422, 'file').type).toBe('/problems/limit-exceeded');
    } finally {
      await t.close();
    }
  });
});

describe('malformed multipart bodies → 400 problem+json (RFC 2046 §5.1.1), never 500', () => {
  const t = sharedTestApp();

  const part = Buffer.from(
    '--XYZ\r\nContent-Disposition: form-data; name="file"; filename="a.png"\r\n' +
      'Content-Type: application/octet-stream\r\n\r\nnot an image',
  );
  const closing = Buffer.from('\r\n--XYZ--\r\n');
  const cases: Array<[string, string, Buffer, string]> = [
    ['no boundary parameter', 'multipart/form-data', Buffer.concat([part, closing]), 'body'],
    [
      'a boundary that never occurs',
      'multipart/form-data; boundary=OTHER',
      Buffer.concat([part, closing]),
      'body',
    ],
    ['cut off inside the file part', 'multipart/form-data; boundary=XYZ', part, 'file'],
    ['cut off inside the part headers', 'multipart/form-data; boundary=XYZ', part.subarray(0, 40), 'body'],
  ];
  for (const [name, contentType, body, field] of cases) {
    it(`${name} → 400 naming "${field}"`, async () => {
      const res = await t.http().post('/v1/images').set('content-type', contentType).send(body);
      const problem = expectProblem(res, 400, field);
      expect(problem.detail).toMatch(/multipart/);
      await expectDocumented('POST', '/v1/images', res);
    });
  }

  it('the well-formed body with the same part reaches the decoder (415: not an image)', async () => {
    const res = await t
      .http()
      .post('/v1/images')
      .set('content-type', 'multipart/form-data; boundary=XYZ')
      .send(Buffer.concat([part, closing]));
    expectProblem(res, 415, 'file');
  });
});
