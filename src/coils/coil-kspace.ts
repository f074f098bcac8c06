import { createMultiCoilArray, type MultiCoilKspace } from '../encoding/index.ts';
import { gridScale, kspaceOnAxesByRows, type Phantom, ShapePhantom } from '../phantoms/index.ts';
import type { TrigPolynomialMaps } from './trig-fit.ts';

/**
 * The exact k-space of each coil image S_c·f of an analytic phantom f whose sensitivities are the
 * trigonometric polynomials of trig-fit.ts, on the ny×nx grid and in the orthonormal centred-DFT scale
 * of phantomGridKspace (K times √(nx·ny)/4):
 *   y_c(kx, ky) = Σ_{p,q} a_{c,q,p} · K(kx − p/T, ky − q/T)        (Guerquin-Kern et al. 2012)
 * with kx = (u − ⌊nx/2⌋)/2, ky = −(v − ⌊ny/2⌋)/2. Since T = 2L, every shifted frequency lies on an
 * axis L times finer than the grid: K is evaluated once on that finer grid (widened by P points each
 * side) and each harmonic reads it at an offset, so the cost is about L² phantom grids, not (2P + 1)².
 * With the single coefficient a_{0,0} = 1 the result equals phantomGridKspace exactly.
 */
export function analyticCoilKspace(
  phantom: Phantom,
  fit: TrigPolynomialMaps,
  nx: number,
  ny: number,
): MultiCoilKspace {
  const { coils, order: P, periodFactor: L, coefficients } = fit;
  const m = 2 * P + 1;
  const period = 2 * L;
  const cx = Math.floor(nx / 2);
  const cy = Math.floor(ny / 2);
  // Fine axes in units of 1/T: x index mx = L·(u − cx) − p, y index my = −L·(v − cy) − q.
  const mxMin = -L * cx - P;
  const mxMax = L * (nx - 1 - cx) + P;
  const myMin = -L * (ny - 1 - cy) - P;
  const myMax = L * cy + P;
  const fx = mxMax - mxMin + 1;
  const fy = myMax - myMin + 1;
  const kxFine = Float64Array.from({ length: fx }, (_, a) => (mxMin + a) / period);
  const kyFine = Float64Array.from({ length: fy }, (_, b) => (myMin + b) / period);
  const fine = transformOnAxes(phantom, kxFine, kyFine); // fy×fx, element (b, a) = K(kxFine[a], kyFine[b])

  const out = createMultiCoilArray(coils, nx, ny);
  const n = nx * ny;
  const d = out.data;
  // Row by row, so one output row and the fine rows it reads stay in cache across all harmonics.
  for (let c = 0; c < coils; c++) {
    const base = 2 * c * n;
    for (let v = 0; v < ny; v++) {
      const outRow = base + 2 * v * nx;
      for (let qi = 0; qi < m; qi++) {
        const b = -L * (v - cy) - (qi - P) - myMin;
        for (let pi = 0; pi < m; pi++) {
          const at = 2 * ((c * m + qi) * m + pi);
          const ar = coefficients[at];
          const ai = coefficients[at + 1];
          if (ar === 0 && ai === 0) continue;
          const rowStart = 2 * (b * fx + (-L * cx - (pi - P) - mxMin));
          if (ai === 0) {
            for (let u = 0; u < nx; u++) {
              const f = rowStart + 2 * L * u;
              d[outRow + 2 * u] += ar * fine[f];
              d[outRow + 2 * u + 1] += ar * fine[f + 1];
            }
          } else {
            for (let u = 0; u < nx; u++) {
              const f = rowStart + 2 * L * u;
              const kr = fine[f];
              const ki = fine[f + 1];
              d[outRow + 2 * u] += ar * kr - ai * ki;
              d[outRow + 2 * u + 1] += ar * ki + ai * kr;
            }
          }
        }
      }
    }
  }
  const scale = gridScale(nx, ny);
  for (let i = 0; i < d.length; i++) d[i] *= scale;
  return out;
}

/** K on the Cartesian product of two axes, interleaved (kyAxis.length × kxAxis.length). */
function transformOnAxes(phantom: Phantom, kxAxis: Float64Array, kyAxis: Float64Array): Float64Array {
  if (phantom instanceof ShapePhantom) return phantom.kspaceOnAxes(kxAxis, kyAxis);
  const out = new Float64Array(2 * kxAxis.length * kyAxis.length);
  kspaceOnAxesByRows(phantom, kxAxis, kyAxis, (values, offset) => out.set(values, offset));
  return out;
}
