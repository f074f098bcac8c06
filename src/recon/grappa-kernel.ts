import { choleskyLower, solveLower, solveLowerConjugateTranspose } from '../core/complex-cholesky.ts';
import { ValidationError } from '../core/errors.ts';
import { createMultiCoilArray, type MultiCoilKspace } from '../encoding/index.ts';
import type { AcsBlock } from './acs-region.ts';

/** Kernel positions along ky that must fit inside the ACS rows for a kernel to be trained. */
export const MIN_TRAINING_ROWS = 2;

/**
 * Where a GRAPPA kernel reads: source rows at `offsets` (acquired rows relative to the target row,
 * ascending) and `width` columns centred on the target column, in every coil.
 */
export interface KernelGeometry {
  offsets: Int32Array;
  width: number;
}

/** Kernel weights: for target coil c, weights[c·n + m] multiplies source m = (coil·K + k)·width + w. */
export interface GrappaKernel {
  geometry: KernelGeometry;
  weights: Float64Array;
  /** Rows and columns of the calibration matrix (training samples × sources). */
  trainingSamples: number;
  sources: number;
}

/**
 * The source rows for one missing row: the ⌈ky/2⌉ nearest acquired rows above (smaller index) and
 * the ⌊ky/2⌋ nearest below, taking more from one side where the other runs out at the edge of
 * k-space. For every-R-th-row sampling this is the usual kernel of ky acquired lines R apart
 * around the target (Griswold et al. 2002), one geometry per missing offset 1 … R − 1; for random
 * lines it adapts to each gap. Sources too far apart for the kernel to sit at MIN_TRAINING_ROWS
 * positions inside the ACS rows are dropped, farthest first; null (the row stays empty) when none
 * is left or the row lies too far beyond the outermost acquired line (see below).
 */
export function kernelGeometryFor(
  target: number,
  acquiredRows: Uint8Array,
  ky: number,
  width: number,
  acsRows: number,
): KernelGeometry | null {
  const ny = acquiredRows.length;
  const above: number[] = [];
  const below: number[] = [];
  for (let i = target - 1; i >= 0 && above.length < ky; i--) if (acquiredRows[i]) above.push(i - target);
  for (let i = target + 1; i < ny && below.length < ky; i++) if (acquiredRows[i]) below.push(i - target);
  let wantAbove = Math.ceil(ky / 2);
  let wantBelow = ky - wantAbove;
  if (above.length < wantAbove) {
    wantBelow += wantAbove - above.length;
    wantAbove = above.length;
  }
  if (below.length < wantBelow) {
    wantAbove = Math.min(above.length, wantAbove + wantBelow - below.length);
    wantBelow = below.length;
  }
  // Locality: no source farther than ⌈ky/2⌉ local gaps (between the nearest acquired lines either
  // side; at the edge of k-space, between the two nearest on the one side). A line beyond the
  // outermost acquired line is extrapolated only as far as that spacing (every-R-th-row sampling
  // keeps its last rows; the sparse edge of variable-density random lines stays empty, as the ACS
  // cannot calibrate a long extrapolation).
  const side = above.length > 0 ? above : below;
  let gap: number;
  if (above.length > 0 && below.length > 0) gap = below[0] - above[0];
  else if (side.length >= 2 && Math.abs(side[0]) <= Math.abs(side[1] - side[0]))
    gap = Math.abs(side[1] - side[0]);
  else return null;
  const reach = Math.ceil(ky / 2) * gap;
  const chosen = [...above.slice(0, wantAbove), ...below.slice(0, wantBelow)].filter(
    (o) => Math.abs(o) <= reach,
  );
  // Drop the farthest source while the kernel (target row included) leaves fewer than
  // MIN_TRAINING_ROWS positions for it inside the ACS rows.
  const span = (list: number[]): number => Math.max(0, ...list) - Math.min(0, ...list) + 1;
  chosen.sort((a, b) => Math.abs(a) - Math.abs(b) || a - b);
  while (chosen.length > 0 && acsRows - span(chosen) + 1 < MIN_TRAINING_ROWS) chosen.pop();
  if (chosen.length === 0) return null;
  chosen.sort((a, b) => a - b);
  return { offsets: Int32Array.from(chosen), width };
}

export function geometryKey(geometry: KernelGeometry): string {
  return `${geometry.width}:${geometry.offsets.join(',')}`;
}

/**
 * Calibrates a kernel on the ACS block by regularised least squares (Griswold et al. 2002):
 *   W = argmin ‖A W − B‖² + λ‖W‖²,  (AᴴA + λI) W = AᴴB,
 * A = one row per training position (target row and every source inside the ACS rows, the whole
 * kernel inside the ACS columns) holding the C·K·width source samples, B = the C target samples.
 * λ = tikhonov · trace(AᴴA)/n, n = C·K·width: relative to the mean squared singular value of A,
 * so it does not depend on the data's scale. Solved by a complex Cholesky factorisation; a singular
 * system (tikhonov 0 with too few training rows) is a ValidationError naming `method.tikhonov`.
 */
export function calibrateKernel(
  kspace: MultiCoilKspace,
  acs: AcsBlock,
  geometry: KernelGeometry,
  tikhonov: number,
): GrappaKernel {
  const { coils: C, nx, ny } = kspace;
  const plane = nx * ny;
  const { offsets, width } = geometry;
  const K = offsets.length;
  const half = Math.floor(width / 2);
  const n = C * K * width;
  const minOffset = Math.min(0, offsets[0]);
  const maxOffset = Math.max(0, offsets[K - 1]);
  const rowFirst = acs.rowStart - minOffset;
  const rowLast = acs.rowStart + acs.rows - 1 - maxOffset;
  const colFirst = acs.colStart + half;
  const colLast = acs.colStart + acs.cols - 1 - half;
  const trainingRows = Math.max(0, rowLast - rowFirst + 1);
  const trainingCols = Math.max(0, colLast - colFirst + 1);
  const T = trainingRows * trainingCols;
  // A column-major (source m at 2·m·T) so the Gram matrix is dot products of contiguous columns.
  const a = new Float64Array(2 * n * T);
  const b = new Float64Array(2 * C * T);
  const d = kspace.data;
  let t = 0;
  for (let row = rowFirst; row <= rowLast; row++) {
    for (let col = colFirst; col <= colLast; col++, t++) {
      for (let c = 0; c < C; c++) {
        const target = 2 * (c * plane + row * nx + col);
        b[2 * (c * T + t)] = d[target];
        b[2 * (c * T + t) + 1] = d[target + 1];
        for (let k = 0; k < K; k++) {
          const sourceRow = 2 * (c * plane + (row + offsets[k]) * nx + col - half);
          const m0 = (c * K + k) * width;
          for (let w = 0; w < width; w++) {
            a[2 * ((m0 + w) * T + t)] = d[sourceRow + 2 * w];
            a[2 * ((m0 + w) * T + t) + 1] = d[sourceRow + 2 * w + 1];
          }
        }
      }
    }
  }
  const gram = new Float64Array(2 * n * n);
  const dot = new Float64Array(2);
  let trace = 0;
  for (let p = 0; p < n; p++) {
    for (let q = 0; q <= p; q++) {
      // (AᴴA)_pq = Σ_t conj(a_tp)·a_tq
      conjugateDot(a, 2 * p * T, a, 2 * q * T, T, dot);
      const [re, im] = dot;
      gram[2 * (p * n + q)] = re;
      gram[2 * (p * n + q) + 1] = im;
      gram[2 * (q * n + p)] = re;
      gram[2 * (q * n + p) + 1] = -im;
    }
    trace += gram[2 * (p * n + p)];
  }
  const lambda = (tikhonov * trace) / n;
  for (let p = 0; p < n; p++) gram[2 * (p * n + p)] += lambda;
  const weights = new Float64Array(2 * C * n);
  for (let c = 0; c < C; c++) {
    for (let m = 0; m < n; m++) {
      conjugateDot(a, 2 * m * T, b, 2 * c * T, T, dot);
      const [re, im] = dot;
      weights[2 * (c * n + m)] = re;
      weights[2 * (c * n + m) + 1] = im;
    }
  }
  if (T === 0 || choleskyLower(gram, n) >= 0) {
    throw new ValidationError({
      field: 'method.tikhonov',
      message: `the GRAPPA calibration for source rows ${Array.from(offsets).join(', ')} is singular (${T} training positions for ${n} weights)`,
      allowed: 'tikhonov > 0, a smaller kernel or more ACS lines',
    });
  }
  for (let c = 0; c < C; c++) {
    solveLower(gram, n, weights, c * n);
    solveLowerConjugateTranspose(gram, n, weights, c * n);
  }
  return { geometry, weights, trainingSamples: T, sources: n };
}

/** out = Σ_t conj(x_t)·y_t over `length` complex numbers from the offsets (interleaved arrays). */
function conjugateDot(
  x: Float64Array,
  xOffset: number,
  y: Float64Array,
  yOffset: number,
  length: number,
  out: Float64Array,
): void {
  let re = 0;
  let im = 0;
  for (let s = 0; s < 2 * length; s += 2) {
    const xr = x[xOffset + s];
    const xi = x[xOffset + s + 1];
    const yr = y[yOffset + s];
    const yi = y[yOffset + s + 1];
    re += xr * yr + xi * yi;
    im += xr * yi - xi * yr;
  }
  out[0] = re;
  out[1] = im;
}

/**
 * Fills the missing rows of `kspace` (rows with `acquiredRows[i] = 0`) with the kernel of each row's
 * geometry: y_c(row, col) = Σ_m s_m·W_cm over the source samples s around (row, col), samples
 * beyond the k-space edge taken as 0. Acquired rows are copied unchanged; rows without a kernel stay 0.
 */
export function applyKernels(
  kspace: MultiCoilKspace,
  acquiredRows: Uint8Array,
  kernelForRow: (row: number) => GrappaKernel | null,
): MultiCoilKspace {
  const { coils: C, nx, ny } = kspace;
  const plane = nx * ny;
  const out = createMultiCoilArray(C, nx, ny);
  const d = kspace.data;
  const o = out.data;
  for (let c = 0; c < C; c++) {
    for (let row = 0; row < ny; row++) {
      if (!acquiredRows[row]) continue;
      const at = 2 * (c * plane + row * nx);
      o.set(d.subarray(at, at + 2 * nx), at);
    }
  }
  let source = new Float64Array(0);
  for (let row = 0; row < ny; row++) {
    if (acquiredRows[row]) continue;
    const kernel = kernelForRow(row);
    if (!kernel) continue;
    const { offsets, width } = kernel.geometry;
    const K = offsets.length;
    const half = Math.floor(width / 2);
    const n = kernel.sources;
    if (source.length !== 2 * n) source = new Float64Array(2 * n);
    const w = kernel.weights;
    for (let col = 0; col < nx; col++) {
      source.fill(0);
      for (let c = 0; c < C; c++) {
        for (let k = 0; k < K; k++) {
          const r = row + offsets[k];
          const m0 = (c * K + k) * width;
          const rowAt = c * plane + r * nx;
          for (let q = 0; q < width; q++) {
            const col2 = col - half + q;
            if (col2 < 0 || col2 >= nx) continue;
            source[2 * (m0 + q)] = d[2 * (rowAt + col2)];
            source[2 * (m0 + q) + 1] = d[2 * (rowAt + col2) + 1];
          }
        }
      }
      for (let c = 0; c < C; c++) {
        let re = 0;
        let im = 0;
        const base = 2 * c * n;
        for (let m = 0; m < n; m++) {
          const sr = source[2 * m];
          const si = source[2 * m + 1];
          const wr = w[base + 2 * m];
          const wi = w[base + 2 * m + 1];
          re += sr * wr - si * wi;
          im += sr * wi + si * wr;
        }
        o[2 * (c * plane + row * nx + col)] = re;
        o[2 * (c * plane + row * nx + col) + 1] = im;
      }
    }
  }
  return out;
}
