import { loadSlices, type SliceSource, type TuningSlice } from './anatomy-set.ts';

/**
 * Anatomy never used in tuning, for checking the tuned defaults (docs/tuning/held-out.csv).
 * Independent images:
 *   python3-pydicom  pydicom/data/test_files/MR_small.dcm  64×64 MR slice (pydicom's test data)
 *   python3-nibabel  nibabel/tests/data/anatomical.nii     33×41×25 human T1 volume (nibabel's test data),
 *                    slices 8 and 16
 * Other slices and the other volume of the tuning files (same subject, so a weaker check):
 *   mricron-data     inia19-t1-brain.nii.gz slice 40 (tuned on 56, 72, 88)
 *   python3-nibabel  example4d.nii.gz slice 9 of volume 1 (tuned on 6, 12, 18 of volume 0)
 * The `ch2*` templates of mricron-data stay reserved (loadSlices refuses them); its remaining
 * templates are label atlases (piecewise constant), not anatomy.
 */
const PYDICOM = '/usr/lib/python3/dist-packages/pydicom/data/test_files';
const NIBABEL = '/usr/lib/python3/dist-packages/nibabel/tests/data';
const MRICRON = '/usr/share/mricron/templates';

export const HELD_OUT_FILES: SliceSource[] = [
  { package: 'python3-pydicom', path: `${PYDICOM}/MR_small.dcm`, slices: [0] },
  { package: 'python3-nibabel', path: `${NIBABEL}/anatomical.nii`, slices: [8, 16] },
  { package: 'mricron-data', path: `${MRICRON}/inia19-t1-brain.nii.gz`, slices: [40] },
  { package: 'python3-nibabel', path: `${NIBABEL}/example4d.nii.gz`, slices: [9], volume: 1 },
];

export function loadHeldOutSet(n: number): Promise<TuningSlice[]> {
  return loadSlices(HELD_OUT_FILES, n);
}
