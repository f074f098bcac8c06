import { gunzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { DecodeError, ValidationError } from '../../src/core/errors.ts';
import { decodeImage } from '../../src/io/decode-image.ts';
import { decodeNifti, niftiKind } from '../../src/io/nifti.ts';
import { at, debianFile, sum } from './debian-files.ts';

// Facts from docs/references.md §12.2 ([L]: raw headers and data read with nibabel 5.0.0 from the Debian files).
// Orientation rule of src/io/nifti.ts: column = voxel i, row = ny − 1 − j.

describe('NIfTI decoder on the nibabel test files (docs/references.md §12.2)', () => {
  it('anatomical.nii: big-endian int16 33×41×25; every slice summed gives the volume sum 284166082, min −610, max 30393', () => {
    const bytes = debianFile('nibabel', 'anatomical.nii');
    expect(niftiKind(bytes)).toBe('nifti-1');
    let total = 0;
    let min = Number.POSITIVE_INFINITY;
    let max = Number.NEGATIVE_INFINITY;
    for (let slice = 0; slice < 25; slice++) {
      const { image, meta } = decodeNifti(bytes, { slice });
      expect([image.nx, image.ny]).toEqual([33, 41]);
      expect(meta.littleEndian).toBe(false);
      total += sum(image.data);
      min = Math.min(min, ...image.data);
      max = Math.max(max, ...image.data);
    }
    expect(total).toBe(284166082);
    expect(min).toBe(-610);
    expect(max).toBe(30393);
  });

  it('functional.nii: scl_slope 0.07540696859359741, scl_inter 3100.76171875; raw voxel [0,0,0,0] = 11980 → 4004.137202501297', () => {
    const { image, meta } = decodeNifti(debianFile('nibabel', 'functional.nii'), { slice: 0, volume: 0 });
    expect([image.nx, image.ny]).toEqual([17, 21]);
    expect(meta.sclSlope).toBe(0.07540696859359741);
    expect(meta.sclInter).toBe(3100.76171875);
    expect(meta.volumes).toBe(20);
    // voxel (i=0, j=0) is the bottom-left pixel: row ny − 1 = 20, column 0.
    expect(at(image, 20, 0)).toBeCloseTo(4004.137202501297, 9);
  });

  it('example4d.nii.gz (gzip, extension, vox_offset 416): dims 128×96×24×2, data max 1162 over both volumes', async () => {
    const bytes = debianFile('nibabel', 'example4d.nii.gz');
    let max = Number.NEGATIVE_INFINITY;
    let total = 0;
    for (let volume = 0; volume < 2; volume++) {
      for (let slice = 0; slice < 24; slice++) {
        const { image } = await decodeImage(bytes, { slice, volume });
        expect([image.nx, image.ny]).toEqual([128, 96]);
        max = Math.max(max, ...image.data);
        total += sum(image.data);
      }
    }
    expect(max).toBe(1162);
    expect(total).toBe(101985356);
  });

  it('standard.nii.gz: uint8 4×5×7 with 30 voxels of 255 (sum 7650) over all slices', async () => {
    const bytes = debianFile('nibabel', 'standard.nii.gz');
    let total = 0;
    for (let slice = 0; slice < 7; slice++) total += sum((await decodeImage(bytes, { slice })).image.data);
    expect(total).toBe(7650);
  });

  it('default slice is the middle one ⌊nz/2⌋ and volume 0', () => {
    const { meta } = decodeNifti(debianFile('nibabel', 'anatomical.nii'));
    expect(meta.slice).toBe(12);
    expect(meta.volume).toBe(0);
  });

  it('slice out of range is a ValidationError naming field "slice" and the allowed range', () => {
    try {
      decodeNifti(debianFile('nibabel', 'anatomical.nii'), { slice: 25 });
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(ValidationError);
      expect((error as ValidationError).problems[0]).toMatchObject({
        field: 'slice',
        allowed: '0 ≤ slice ≤ 24',
      });
    }
  });

  it('example_nifti2.nii.gz (magic "n+2") is supported explicitly: dims 32×20×12×2, int16', async () => {
    const bytes = debianFile('nibabel', 'example_nifti2.nii.gz');
    expect(niftiKind(gunzipSync(bytes))).toBe('nifti-2');
    const { image, meta } = await decodeImage(bytes, { slice: 0, volume: 1 });
    expect([image.nx, image.ny]).toEqual([32, 20]);
    expect(meta).toMatchObject({ version: 2, dims: [4, 32, 20, 12, 2], datatype: 'int16' });
  });

  it('nifti1.hdr and nifti2.hdr (header of a pair, "ni1"/"ni2") are refused with a DecodeError saying so', () => {
    for (const name of ['nifti1.hdr', 'nifti2.hdr']) {
      expect(() => decodeNifti(debianFile('nibabel', name))).toThrow(/\.hdr\/\.img pair/);
    }
  });

  it('analyze.hdr (ANALYZE 7.5, no magic) is refused as not NIfTI', async () => {
    await expect(decodeImage(debianFile('nibabel', 'analyze.hdr'))).rejects.toThrow(/ANALYZE/);
  });

  it('a truncated .nii (data cut short) is a DecodeError, not a crash', () => {
    const bytes = debianFile('nibabel', 'functional.nii');
    expect(() => decodeNifti(bytes.subarray(0, bytes.length - 100))).toThrow(DecodeError);
  });
});
