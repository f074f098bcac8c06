import { describe, expect, it } from 'vitest';
import { DecodeError, LimitError } from '../../src/core/errors.ts';
import { decodeImage } from '../../src/io/decode-image.ts';
import { decodeDicom } from '../../src/io/dicom.ts';
import { deflatedDicomBomb, gzippedNifti2Bomb, gzippedWithZeros } from './inflation-bombs.ts';

// 300 MiB behind about 0.3 MB of input; the bound is the default 64 MiB upload limit.
const maxBytes = 64 * 1024 * 1024;

async function rejection(promise: Promise<unknown>): Promise<unknown> {
  try {
    await promise;
  } catch (error) {
    return error;
  }
  throw new Error('expected a rejection');
}

describe('decompression of uploads stops at a bound', () => {
  it('a deflated DICOM data set that would inflate to 300 MiB → LimitError on "file" at the upload limit', () => {
    const bomb = deflatedDicomBomb(300);
    expect(bomb.length).toBeLessThan(400_000);
    let caught: unknown;
    try {
      decodeDicom(bomb, { maxBytes });
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(LimitError);
    expect((caught as LimitError).problems[0]).toMatchObject({ field: 'file' });
    expect((caught as LimitError).problems[0].allowed).toContain(String(maxBytes));
  });

  it('a .nii.gz whose header declares 153 MB of voxels → LimitError before the rest is inflated', async () => {
    // nifti2.h: dim[] are int64 from byte 16; dim[3] = 60000 makes 32×20×60000×2 int16 voxels.
    let voxOffset = 0;
    const bomb = gzippedNifti2Bomb(300, (header) => {
      header.writeBigInt64LE(60000n, 16 + 8 * 3);
      voxOffset = Number(header.readBigInt64LE(168)); // nifti2.h: vox_offset, int64 at byte 168
    });
    const error = await rejection(decodeImage(bomb, { maxBytes }));
    expect(error).toBeInstanceOf(LimitError);
    expect((error as LimitError).problems[0].field).toBe('file');
    const declared = voxOffset + 32 * 20 * 60000 * 2 * 2;
    expect(declared).toBeGreaterThan(maxBytes);
    expect((error as LimitError).problems[0].message).toContain(`declares ${declared} bytes`);
  });

  it('a .nii.gz with 300 MiB of zeros after its image: inflation stops at the declared length and the image decodes', async () => {
    const { image, meta } = await decodeImage(gzippedNifti2Bomb(300), { maxBytes, slice: 0, volume: 1 });
    // Same answer as the untouched example_nifti2.nii.gz (tests/io/nifti.test.ts).
    expect([image.nx, image.ny]).toEqual([32, 20]);
    expect(meta).toMatchObject({ version: 2, dims: [4, 32, 20, 12, 2], datatype: 'int16' });
  });

  it('gzip of anything but NIfTI is refused as unrecognised after its first bytes (415)', async () => {
    const error = await rejection(decodeImage(gzippedWithZeros(Buffer.alloc(0), 300), { maxBytes }));
    expect(error).toBeInstanceOf(DecodeError);
    expect((error as DecodeError).message).toMatch(/unrecognised/);
  });

  it('a gzip stream cut short or with flipped bytes is a DecodeError, not a crash', async () => {
    const bomb = gzippedNifti2Bomb(0);
    await expect(decodeImage(bomb.subarray(0, 200), { maxBytes })).rejects.toThrow(DecodeError);
    const flipped = Buffer.from(bomb);
    for (let i = 20; i < 60; i++) flipped[i] ^= 0xff;
    await expect(decodeImage(flipped, { maxBytes })).rejects.toThrow(DecodeError);
  });
});
