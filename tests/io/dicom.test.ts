import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { DecodeError, ValidationError } from '../../src/core/errors.ts';
import { decodeImage } from '../../src/io/decode-image.ts';
import { decodeDicom } from '../../src/io/dicom.ts';
import { at, debianFile, sum } from './debian-files.ts';

// Facts from docs/references.md §12.1 ([L]: read with pydicom 2.3.1 from the Debian package files).
const mrSmall = {
  nx: 64,
  ny: 64,
  min: 127,
  max: 2145,
  sum: 2125338,
  p00: 905,
  p01: 1019,
  p6363: 862,
  p3232: 182,
};

function expectMrSmall(name: string): void {
  const { image, meta } = decodeDicom(debianFile('pydicom', name));
  expect([image.nx, image.ny]).toEqual([mrSmall.nx, mrSmall.ny]);
  expect(at(image, 0, 0)).toBe(mrSmall.p00);
  expect(at(image, 0, 1)).toBe(mrSmall.p01);
  expect(at(image, 63, 63)).toBe(mrSmall.p6363);
  expect(at(image, 32, 32)).toBe(mrSmall.p3232);
  expect(sum(image.data)).toBe(mrSmall.sum);
  expect(Math.min(...image.data)).toBe(mrSmall.min);
  expect(Math.max(...image.data)).toBe(mrSmall.max);
  expect(meta.signed).toBe(true); // Pixel Representation 1 (docs/references.md §12.1)
}

describe('DICOM decoder on the pydicom test files (docs/references.md §12.1)', () => {
  it('MR_small.dcm (Explicit VR LE, signed 16-bit, trailing padding element): pixels, sum, min, max', () => {
    expectMrSmall('MR_small.dcm');
    const { meta } = decodeDicom(debianFile('pydicom', 'MR_small.dcm'));
    expect(meta.pixelSpacingMm).toEqual([0.3125, 0.3125]); // Pixel Spacing 0.3125\0.3125
    expect(meta.photometric).toBe('MONOCHROME2');
    expect(meta.rescaleSlope).toBe(1); // no Rescale attributes: slope 1, intercept 0 (PS3.3 C.11.1)
    expect(meta.rescaleIntercept).toBe(0);
  });

  for (const name of ['MR_small_bigendian.dcm', 'MR_small_expb.dcm', 'MR_small_implicit.dcm']) {
    it(`${name}: identical pixel array to MR_small (other transfer syntax)`, () => expectMrSmall(name));
  }

  it('MR_small_RLE.dcm: RLE Lossless (PS3.5 Annex G) decodes to the identical pixel array', () => {
    expectMrSmall('MR_small_RLE.dcm');
  });

  it('MR_small_padded.dcm: 8320-byte Pixel Data, the first 8192 bytes used, identical to MR_small', () => {
    expectMrSmall('MR_small_padded.dcm');
  });

  it('MR_truncated.dcm (8130 of 8192 pixel bytes) fails with a clear DecodeError, no crash', () => {
    expect(() => decodeDicom(debianFile('pydicom', 'MR_truncated.dcm'))).toThrow(DecodeError);
    expect(() => decodeDicom(debianFile('pydicom', 'MR_truncated.dcm'))).toThrow(/truncated/);
  });

  for (const [name, uid] of [
    ['MR_small_jpeg_ls_lossless.dcm', '1.2.840.10008.1.2.4.80'],
    ['MR_small_jp2klossless.dcm', '1.2.840.10008.1.2.4.90'],
  ]) {
    it(`${name}: compressed transfer syntax ${uid} is refused naming the syntax (PS3.5 UIDs, docs/references.md §10.1)`, () => {
      expect(() => decodeDicom(debianFile('pydicom', name))).toThrow(new RegExp(uid.replaceAll('.', '\\.')));
    });
  }

  it('decimal_rescale.dcm: Rescale Slope 2, Intercept −4096 on all-zero stored pixels ⇒ every value −4096 (docs/references.md §12.2)', () => {
    const { image, meta } = decodeDicom(debianFile('nicom', 'decimal_rescale.dcm'));
    expect([image.nx, image.ny]).toEqual([128, 96]); // 96 rows × 128 columns
    expect(image.data.every((v) => v === -4096)).toBe(true);
    expect(meta.rescaleSlope).toBe(2);
    expect(meta.rescaleIntercept).toBe(-4096);
  });

  it('nicom 0.dcm: 256×256 uint16 with Bits Stored 12, Implicit VR LE, pixel sum 134184960 (docs/references.md §12.2)', () => {
    const { image, meta } = decodeDicom(debianFile('nicom', '0.dcm'));
    expect([image.nx, image.ny]).toEqual([256, 256]);
    expect(sum(image.data)).toBe(134184960);
    expect(meta.bitsStored).toBe(12);
    expect(meta.signed).toBe(false);
  });

  it('decodeImage detects DICOM by "DICM" at offset 128 even though the preamble looks like TIFF (PS3.10)', async () => {
    const bytes = debianFile('pydicom', 'MR_small.dcm');
    expect(bytes.subarray(128, 132).toString('latin1')).toBe('DICM');
    const decoded = await decodeImage(bytes);
    expect(decoded.format).toBe('dicom');
  });

  it('frame choice: frame 1 of a single-frame file is a ValidationError naming field "frame"', () => {
    const attempt = () => decodeDicom(debianFile('pydicom', 'MR_small.dcm'), { frame: 1 });
    expect(attempt).toThrow(ValidationError);
    try {
      attempt();
    } catch (error) {
      expect((error as ValidationError).problems[0]).toMatchObject({
        field: 'frame',
        allowed: '0 ≤ frame ≤ 0',
      });
    }
  });
});

describe('DICOM pixel handling on edited copies of MR_small.dcm (PS3.3 C.7.6.3, C.11.1)', () => {
  // MR_small (explicit VR LE) carries Photometric Interpretation "MONOCHROME2" as an even-length CS value,
  // so the same-length "MONOCHROME1" can be written over it in place.
  function withPhotometric(value: string): Buffer {
    const bytes = Buffer.from(debianFile('pydicom', 'MR_small.dcm'));
    const at = bytes.indexOf('MONOCHROME2', 0, 'latin1');
    expect(at).toBeGreaterThan(132);
    bytes.write(value, at, 'latin1');
    return bytes;
  }

  it('MONOCHROME1 is inverted to min + max − value so larger is brighter (PS3.3: lowest value displays white)', () => {
    const original = decodeDicom(debianFile('pydicom', 'MR_small.dcm')).image;
    const inverted = decodeDicom(withPhotometric('MONOCHROME1')).image;
    // min 127, max 2145 from docs/references.md §12.1: p[0,0] = 905 → 127 + 2145 − 905 = 1367.
    expect(at(inverted, 0, 0)).toBe(127 + 2145 - 905);
    for (let i = 0; i < original.data.length; i++) expect(inverted.data[i]).toBe(2272 - original.data[i]);
  });

  it('signed pixels: stored 0xFFFF with Pixel Representation 1 reads −1 (two’s complement, common practice)', () => {
    const bytes = Buffer.from(debianFile('pydicom', 'MR_small.dcm'));
    // Pixel Data starts at byte 1500 (dicom-parser dataOffset; 8192 bytes follow), little-endian int16.
    bytes.writeUInt16LE(0xffff, 1500);
    const { image } = decodeDicom(bytes);
    expect(at(image, 0, 0)).toBe(-1);
    expect(at(image, 0, 1)).toBe(1019);
  });
});

interface DicomFacts {
  file: string;
  transferSyntax: string;
  rows: number;
  columns: number;
  frames: number;
  frameFacts: Array<{ sum: number; min: number; max: number; pixels: Array<[number, number, number]> }>;
}

describe('DICOM multi-frame, 32-bit, RLE, RGB, Deflated, Rescale: against pydicom (tests/reference/io_dicom_facts.py)', () => {
  const fixture = JSON.parse(
    readFileSync(new URL('../reference/fixtures/io-dicom.json', import.meta.url), 'utf8'),
  ) as { files: DicomFacts[] };
  for (const facts of fixture.files) {
    it(`${facts.file} (${facts.transferSyntax}, ${facts.frames} frame(s)): every frame matches pydicom`, () => {
      const bytes = debianFile('pydicom', facts.file);
      for (let frame = 0; frame < facts.frames; frame++) {
        const { image, meta } = decodeDicom(bytes, { frame });
        expect([image.nx, image.ny]).toEqual([facts.columns, facts.rows]);
        expect(meta.frames).toBe(facts.frames);
        const expected = facts.frameFacts[frame];
        // Float sums in another order: relative 1e-12.
        expect(Math.abs(sum(image.data) - expected.sum)).toBeLessThanOrEqual(
          1e-12 * Math.max(1, Math.abs(expected.sum)),
        );
        for (const [row, col, value] of expected.pixels) expect(at(image, row, col)).toBeCloseTo(value, 9);
      }
      expect(() => decodeDicom(bytes, { frame: facts.frames })).toThrow(ValidationError);
    });
  }
});
