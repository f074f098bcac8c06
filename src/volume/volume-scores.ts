import type { RealImage } from '../core/real-image.ts';
import { hfen, type MetricSet, nrmse, psnr, ssim } from '../metrics/index.ts';

/** Per-plane scores; null where the reference plane is empty (all zero: no norm, no peak, no range). */
export interface SliceScores {
  nrmse: (number | null)[];
  psnr: (number | null)[];
  ssim: (number | null)[];
  hfen: (number | null)[];
}

function isEmpty(image: RealImage): boolean {
  for (const v of image.data) if (v !== 0) return false;
  return true;
}

function flat(planes: readonly RealImage[]): RealImage {
  const n = planes[0].nx * planes[0].ny;
  const data = new Float64Array(n * planes.length);
  planes.forEach((plane, i) => {
    data.set(plane.data, i * n);
  });
  return { nx: planes[0].nx, ny: planes[0].ny * planes.length, data };
}

/** The 2D scores of one plane (§3.6), the same a 2D request reports; null for an empty reference. */
export function scorePlane(estimate: RealImage, reference: RealImage): MetricSet | null {
  if (isEmpty(reference)) return null;
  return {
    nrmse: nrmse(estimate, reference),
    psnr: psnr(estimate, reference),
    ssim: ssim(estimate, reference),
    hfen: hfen(estimate, reference),
  };
}

/**
 * Scores of a reconstructed volume against its reference from its planes' scores (scorePlane, which
 * a worker may have computed) and the planes themselves (docs/design.md §3.6, §2.5):
 *   NRMSE = ‖x̂ − x‖₂ / ‖x‖₂ and PSNR = 10 log10(max|x|² / MSE) over every voxel;
 *   SSIM, HFEN = the mean of the planes' 2D SSIM (Wang et al. 2004 define it on 2D windows) and 2D
 *   HFEN over the planes whose reference is not empty (empty planes score null).
 */
export function volumeScores(
  planeScores: readonly (MetricSet | null)[],
  estimates: readonly RealImage[],
  references: readonly RealImage[],
): { volume: MetricSet; slices: SliceScores } {
  const slices: SliceScores = { nrmse: [], psnr: [], ssim: [], hfen: [] };
  for (const plane of planeScores) {
    for (const metric of ['nrmse', 'psnr', 'ssim', 'hfen'] as const)
      slices[metric].push(plane ? plane[metric] : null);
  }
  const scored = planeScores.filter((plane) => plane !== null);
  const mean = (metric: 'ssim' | 'hfen') =>
    scored.length > 0 ? scored.reduce((sum, plane) => sum + plane[metric], 0) / scored.length : Number.NaN;
  const estimate = flat(estimates);
  const reference = flat(references);
  return {
    volume: {
      nrmse: nrmse(estimate, reference),
      psnr: psnr(estimate, reference),
      ssim: mean('ssim'),
      hfen: mean('hfen'),
    },
    slices,
  };
}

/** volumeScores with every plane scored here. */
export function scoreVolume(
  estimates: readonly RealImage[],
  references: readonly RealImage[],
): { volume: MetricSet; slices: SliceScores } {
  return volumeScores(
    estimates.map((estimate, i) => scorePlane(estimate, references[i])),
    estimates,
    references,
  );
}
