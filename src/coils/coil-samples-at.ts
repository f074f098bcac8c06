import { gridScale, type Phantom } from '../phantoms/index.ts';
import type { TrigPolynomialMaps } from './trig-fit.ts';

/**
 * The exact transform of each coil image S_c·f at arbitrary points k = (kx_i, ky_i) in cycles per
 * FOV (the trajectory's unit; twice cycles per phantom unit), S_c the trigonometric polynomial of
 * trig-fit.ts:
 *   y_c(k) = s · Σ_{p,q} a_{c,q,p} · K(kx/2 − p/T, ky/2 − q/T)        (Guerquin-Kern et al. 2012)
 * with s = √(nx·ny)/4 the grid scale of analyticCoilKspace, of which this is the form for points off
 * the grid (non-Cartesian trajectories). K is evaluated once per harmonic at the shifted points and
 * added into every coil; harmonics whose coefficient is zero in every coil are skipped (an exact
 * saving). With the single coefficient a_{0,0} = 1 the values equal s·K(k/2) bit for bit (the
 * single-coil trajectory samples). Output coil-major, interleaved, `kx.length` samples per coil.
 */
export function analyticCoilSamplesAt(
  phantom: Phantom,
  fit: TrigPolynomialMaps,
  kx: Float64Array,
  ky: Float64Array,
  nx: number,
  ny: number,
): Float64Array {
  const { coils, order: P, periodFactor: L, coefficients } = fit;
  const m = 2 * P + 1;
  const period = 2 * L;
  const count = kx.length;
  const out = new Float64Array(2 * coils * count);
  const shiftedX = new Float64Array(count);
  const shiftedY = new Float64Array(count);
  for (let qi = 0; qi < m; qi++) {
    for (let pi = 0; pi < m; pi++) {
      if (!usedByAnyCoil(coefficients, coils, m, qi, pi)) continue;
      const sx = (pi - P) / period;
      const sy = (qi - P) / period;
      for (let i = 0; i < count; i++) {
        shiftedX[i] = kx[i] / 2 - sx;
        shiftedY[i] = ky[i] / 2 - sy;
      }
      const k = phantom.kspaceAt(shiftedX, shiftedY);
      for (let c = 0; c < coils; c++) {
        const at = 2 * ((c * m + qi) * m + pi);
        const ar = coefficients[at];
        const ai = coefficients[at + 1];
        if (ar === 0 && ai === 0) continue;
        const base = 2 * c * count;
        for (let i = 0; i < count; i++) {
          const kr = k[2 * i];
          const ki = k[2 * i + 1];
          out[base + 2 * i] += ar * kr - ai * ki;
          out[base + 2 * i + 1] += ar * ki + ai * kr;
        }
      }
    }
  }
  const scale = gridScale(nx, ny);
  for (let i = 0; i < out.length; i++) out[i] *= scale;
  return out;
}

function usedByAnyCoil(
  coefficients: Float64Array,
  coils: number,
  m: number,
  qi: number,
  pi: number,
): boolean {
  for (let c = 0; c < coils; c++) {
    const at = 2 * ((c * m + qi) * m + pi);
    if (coefficients[at] !== 0 || coefficients[at + 1] !== 0) return true;
  }
  return false;
}
