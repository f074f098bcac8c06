import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { niftiFloat32Volumes } from '../../src/io/nifti-writer.ts';
import { writerCase, writerCase3d } from './nifti-writer-case.ts';

/** nibabel's reading of the committed file (tests/reference/nifti_writer_facts.py). */
const facts = JSON.parse(
  readFileSync(new URL('../reference/fixtures/nifti-writer.json', import.meta.url), 'utf8'),
) as { dim: number[]; values: number[]; descrip: string; vox_offset: number; shape: number[] };
const committed = readFileSync(new URL('../fixtures/io/written-volumes.nii', import.meta.url));
/** The same for the file of 3D volumes. */
const facts3d = JSON.parse(
  readFileSync(new URL('../reference/fixtures/nifti-writer-3d.json', import.meta.url), 'utf8'),
) as { dim: number[]; values: number[]; descrip: string; shape: number[]; dtype: string };
const committed3d = readFileSync(new URL('../fixtures/io/written-volumes-3d.nii', import.meta.url));

describe('niftiFloat32Volumes (NIfTI-1, docs/references.md §10.2)', () => {
  it('writes the very bytes nibabel read for the committed file', () => {
    const written = niftiFloat32Volumes(writerCase.volumes, writerCase.description);
    expect(written.equals(committed)).toBe(true);
  });

  it('nibabel sees x fastest, rows flipped upward, volumes along the 4th dimension', () => {
    // nibabel 5.0: a Nifti1Image, float32, dim [4, 5, 3, 1, 2], voxels from byte 352, no scaling.
    expect(facts).toMatchObject({
      class: 'Nifti1Image',
      sizeof_hdr: 348,
      datatype: 16,
      bitpix: 32,
      vox_offset: 352,
      scl_slope: null,
      magic: 'n+1',
      qform_code: 0,
      sform_code: 0,
      dtype: 'float32',
    });
    expect(facts.dim).toEqual([4, 5, 3, 1, 2, 1, 1, 1]);
    expect(facts.descrip).toBe(writerCase.description);
    // data[i, j, 0, t] = image t at column i, row ny − 1 − j.
    const { nx, ny } = writerCase.volumes[0];
    let k = 0;
    for (let t = 0; t < 2; t++) {
      for (let j = 0; j < ny; j++) {
        for (let i = 0; i < nx; i++) {
          expect(facts.values[k++]).toBe(writerCase.volumes[t].data[(ny - 1 - j) * nx + i]);
        }
      }
    }
  });

  it('3D volumes: nibabel sees dim [4, nx, ny, nz, volumes], slice k of volume t at data[:, :, k, t]', () => {
    const written = niftiFloat32Volumes(writerCase3d.volumes, writerCase3d.description);
    expect(written.equals(committed3d)).toBe(true);
    // nibabel 5.0 (tests/reference/nifti_writer_facts.py): a 4 × 3 × 2 × 2 float32 array.
    expect(facts3d.dim).toEqual([4, 4, 3, 2, 2, 1, 1, 1]);
    expect(facts3d.shape).toEqual([4, 3, 2, 2]);
    expect(facts3d.dtype).toBe('float32');
    expect(facts3d.descrip).toBe(writerCase3d.description);
    // data[i, j, k, t] = volume t, slice k, column i, row ny − 1 − j; the case's values name their place.
    let n = 0;
    for (let t = 0; t < 2; t++) {
      for (let k = 0; k < 2; k++) {
        for (let j = 0; j < 3; j++) {
          for (let i = 0; i < 4; i++)
            expect(facts3d.values[n++]).toBe(1000 * t + 100 * k + 10 * (2 - j) + i + 0.25);
        }
      }
    }
  });

  it('refuses volumes of different sizes and a description that is not short ASCII', () => {
    const [a] = writerCase.volumes;
    expect(() => niftiFloat32Volumes([a, { nx: 2, ny: 2, data: new Float32Array(4) }], '')).toThrow(
      RangeError,
    );
    expect(() => niftiFloat32Volumes([a], 'x'.repeat(80))).toThrow(RangeError);
    expect(() => niftiFloat32Volumes([], '')).toThrow(RangeError);
    const [v3] = writerCase3d.volumes;
    expect(() => niftiFloat32Volumes([v3, { ...v3, nz: 1, data: v3.data.subarray(0, 12) }], '')).toThrow(
      RangeError,
    );
  });
});
