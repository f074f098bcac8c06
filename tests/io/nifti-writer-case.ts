import type { NiftiVolume } from '../../src/io/nifti-writer.ts';

/**
 * The volumes of tests/fixtures/io/written-volumes.nii: 5 columns × 3 rows × 2 volumes whose value
 * names its place, v = 100·volume + 10·row + column + 0.25 (row 0 at the top), so nibabel's reading
 * (tests/reference/nifti_writer_facts.py) shows where each value landed.
 */
const nx = 5;
const ny = 3;
const volume = (t: number): NiftiVolume => ({
  nx,
  ny,
  data: Float32Array.from({ length: nx * ny }, (_, k) => 100 * t + 10 * Math.floor(k / nx) + (k % nx) + 0.25),
});

export const writerCase = {
  volumes: [volume(0), volume(1)],
  description: 'kspace-planner: first,second',
};

/**
 * The volumes of tests/fixtures/io/written-volumes-3d.nii: 4 columns × 3 rows × 2 slices × 2 volumes,
 * v = 1000·volume + 100·slice + 10·row + column + 0.25 (row 0 at the top), read by the same script.
 */
const volume3d = (t: number): NiftiVolume => ({
  nx: 4,
  ny: 3,
  nz: 2,
  data: Float32Array.from(
    { length: 24 },
    (_, k) => 1000 * t + 100 * Math.floor(k / 12) + 10 * Math.floor((k % 12) / 4) + (k % 4) + 0.25,
  ),
});

export const writerCase3d = {
  volumes: [volume3d(0), volume3d(1)],
  description: 'kspace-planner: first,second (3D)',
};
