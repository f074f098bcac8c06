import { existsSync, readFileSync } from 'node:fs';
import type { RealImage } from '../../src/core/real-image.ts';
import { decodeImage } from '../../src/io/decode-image.ts';
import { resampleBilinear } from '../../src/pipeline/resample.ts';

/**
 * The anatomy tuning set: 2D slices of open MR volumes that Debian packages ship.
 *   mricron-data  /usr/share/mricron/templates/inia19-t1-brain.nii.gz  INIA19 rhesus macaque T1 template,
 *                 brain extracted (Rohlfing et al. 2012), 168×206×128
 *   python3-nibabel  nibabel/tests/data/example4d.nii.gz  human EPI time series, 128×96×24×2
 * The `ch2*` templates of mricron-data are reserved for independent checks and never used here;
 * the label atlases of mricron-data (aal, brodmann, AICHAmc, JHU-WhiteMatter, HarvardOxford,
 * jhu189, natbrainlab, inia19-NeuroMaps) are piecewise constant, the very case the old defaults were tuned
 * on, and are left out.
 */
export interface TuningSlice {
  /** Short label: file stem and slice. */
  label: string;
  /** Debian package and path. */
  source: string;
  image: RealImage;
}

const MRICRON = '/usr/share/mricron/templates';
const NIBABEL = '/usr/lib/python3/dist-packages/nibabel/tests/data';

/** Slices of one file of a Debian package. */
export interface SliceSource {
  package: string;
  path: string;
  slices: number[];
  volume?: number;
}

export const TUNING_FILES: SliceSource[] = [
  { package: 'mricron-data', path: `${MRICRON}/inia19-t1-brain.nii.gz`, slices: [56, 72, 88] },
  { package: 'python3-nibabel', path: `${NIBABEL}/example4d.nii.gz`, slices: [6, 12, 18], volume: 0 },
];

/** Refuses the reserved files outright, whatever the list says. */
function assertNotReserved(path: string): void {
  const name = path.split('/').pop() ?? '';
  if (name.startsWith('ch2')) throw new Error(`${path} is reserved for independent checks`);
}

/** Every slice of the tuning set, resampled (bilinear) to n×n and scaled to peak 1. */
export function loadTuningSet(n: number): Promise<TuningSlice[]> {
  return loadSlices(TUNING_FILES, n);
}

/** The listed slices, resampled (bilinear) to n×n and scaled to peak 1; `volume` labels a 4D file's volume. */
export async function loadSlices(files: SliceSource[], n: number): Promise<TuningSlice[]> {
  const slices: TuningSlice[] = [];
  for (const file of files) {
    assertNotReserved(file.path);
    if (!existsSync(file.path)) {
      throw new Error(`${file.path} missing: apt-get install ${file.package}`);
    }
    const bytes = readFileSync(file.path);
    for (const slice of file.slices) {
      const decoded = await decodeImage(bytes, { slice, volume: file.volume ?? 0 });
      const image = resampleBilinear(decoded.image, n, n);
      let peak = 0;
      for (const v of image.data) peak = Math.max(peak, v);
      for (let i = 0; i < image.data.length; i++) image.data[i] /= peak;
      const stem = (file.path.split('/').pop() ?? '').replace(/\.(nii(\.gz)?|dcm)$/, '');
      const volume = file.volume ? `:v${file.volume}` : '';
      slices.push({ label: `${stem}:${slice}${volume}`, source: `${file.package} ${file.path}`, image });
    }
  }
  return slices;
}
