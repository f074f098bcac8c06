import {
  type CoilMaps,
  createMultiCoilArray,
  type MultiCoilKspace,
  scalePixels,
  sumOfSquaresOverCoils,
  transformPlaneInPlace,
} from '../encoding/index.ts';
import type { AcsBlock } from './acs-region.ts';

/** Pixels whose low-resolution root-sum-of-squares is below this fraction of its maximum get S = 0. */
export const ACS_MAP_SUPPORT_THRESHOLD = 0.05;

/** The calibration's name as responses report it. */
export const ACS_MAP_METHOD = 'acs-lowres-rss';

/**
 * Hann window of `length` points that is positive at both ends,
 * w(t) = ½(1 − cos(2π(t + 1)/(length + 1))), t = 0 … length − 1 (common practice).
 */
function hannWindow(length: number): Float64Array {
  const w = new Float64Array(length);
  for (let t = 0; t < length; t++) w[t] = 0.5 * (1 - Math.cos((2 * Math.PI * (t + 1)) / (length + 1)));
  return w;
}

/**
 * Coil sensitivities estimated from the ACS block (Pruessmann, Weiger, Börnert & Boesiger 2001
 * estimate them from low-resolution reference images; common practice for auto-calibrated SENSE):
 * each coil's central k-space inside the block, tapered by a separable Hann window to keep the
 * truncation from ringing, gives a low-resolution coil image l_c = F⁻¹(w ⊙ y_c); the maps are
 *   S_c = l_c / √(Σ_c′ |l_c′|²)
 * where that root-sum-of-squares is at least ACS_MAP_SUPPORT_THRESHOLD of its maximum, and 0 elsewhere
 * (outside the object the ratio is noise; SENSE then leaves those pixels 0). Inside the support
 * Σ|S_c|² = 1, and S_c ≈ S_c,true·e^(iφ), φ the phase of the blurred object, so a SENSE
 * reconstruction with these maps carries the object's magnitude and loses its phase.
 */
export function estimateAcsMaps(kspace: MultiCoilKspace, block: AcsBlock): CoilMaps {
  const { coils, nx, ny } = kspace;
  const n = nx * ny;
  const maps = createMultiCoilArray(coils, nx, ny);
  const wy = hannWindow(block.rows);
  const wx = hannWindow(block.cols);
  const d = maps.data;
  for (let c = 0; c < coils; c++) {
    for (let r = 0; r < block.rows; r++) {
      const row = block.rowStart + r;
      for (let q = 0; q < block.cols; q++) {
        const k = 2 * (c * n + row * nx + block.colStart + q);
        const w = wy[r] * wx[q];
        d[k] = kspace.data[k] * w;
        d[k + 1] = kspace.data[k + 1] * w;
      }
    }
    transformPlaneInPlace(d, c * n, nx, ny, 1);
  }
  const rss = sumOfSquaresOverCoils(maps);
  let peak = 0;
  for (let i = 0; i < n; i++) {
    rss[i] = Math.sqrt(rss[i]);
    peak = Math.max(peak, rss[i]);
  }
  const floor = ACS_MAP_SUPPORT_THRESHOLD * peak;
  const scale = rss.map((r) => (r >= floor && r > 0 ? 1 / r : 0));
  scalePixels(maps, scale);
  return maps;
}
