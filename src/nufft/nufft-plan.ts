import { type ComplexImage, createComplexImage } from '../core/complex-image.ts';
import { LimitError, ValidationError } from '../core/errors.ts';
import { fftPlan } from '../core/fft-plan.ts';
import { expectedRelativeError } from './accuracy-table.ts';
import { kaiserBessel, kaiserBesselBeta, kaiserBesselTransform } from './kaiser-bessel.ts';
import { checkNufftOptions, type NufftOptions } from './nufft-options.ts';

/**
 * Two-dimensional non-uniform FFT by Kaiser–Bessel gridding (Jackson et al. 1991; shape β of
 * Beatty et al. 2005) on an α-times oversampled grid, scaled like the project's orthonormal
 * centred DFT:
 *
 *   type 2 (forward)  y_p = (1/√(nx·ny)) Σ_{i,j} x[i][j] e^(−i2π(kx_p·n/nx − ky_p·m/ny))
 *   type 1 (adjoint)  x[i][j] = (1/√(nx·ny)) Σ_p y_p e^(+i2π(kx_p·n/nx − ky_p·m/ny))
 *
 * with n = j − ⌊nx/2⌋, m = i − ⌊ny/2⌋ and (kx, ky) in cycles per field of view (y up, as in the
 * phantom frame; the FOV is the image's [−1, 1] extent, so 1 cycle/FOV = ½ cycle per unit). The
 * grid point in row v, column u sits at kx = u − ⌊nx/2⌋, ky = −(v − ⌊ny/2⌋), so on those points
 * the forward transform equals fft2c. The transform is periodic: kx and kx + nx give the same value.
 *
 * The plan precomputes, per point and axis, the first tap and the kernel weights, so the hot loops
 * only multiply and add. It owns its grid and scratch: not re-entrant (one thread, one call at a time).
 */
export interface NufftPlan {
  readonly nx: number;
  readonly ny: number;
  /** Number of k-space points. */
  readonly count: number;
  readonly width: number;
  readonly oversampling: number;
  /** Kernel shape from the requested α (the grid may be a little larger, which only lowers the error). */
  readonly beta: number;
  /** Oversampled grid sides (≥ α·n, rounded up to a size the FFT plans handle quickly). */
  readonly gridNx: number;
  readonly gridNy: number;
  /** Relative 2-norm error against the exact sums expected for this W and α (see accuracy-table.ts). */
  readonly expectedRelativeError: number;
  /** Type 2: image → interleaved samples (2·count numbers), into `out` when given. */
  forward(image: ComplexImage, out?: Float64Array): Float64Array;
  /** Type 1, the exact adjoint of forward: interleaved samples → image, into `out` when given. */
  adjoint(samples: Float64Array, out?: ComplexImage): ComplexImage;
  /**
   * The gridding pair on real weights without FFTs (used by density compensation):
   * out_p = Σ_q w_q · Σ_ℓ C(g_p − ℓ) C(g_q − ℓ), i.e. interpolation after spreading.
   */
  spreadInterpolate(weights: Float64Array, out: Float64Array): void;
}

/** Weights per axis a plan may precompute (2²⁵ doubles per axis: 512 MB for both axes). */
export const MAX_PLAN_WEIGHTS = 2 ** 25;

/** Smallest size ≥ n whose odd factor is at most 15, so the 1D FFT plans stay on their fast paths. */
export function fastGridSize(n: number): number {
  for (let g = Math.max(1, Math.ceil(n - 1e-9)); ; g++) {
    if (g / (g & -g) <= 15) return g;
  }
}

function checkTrajectory(kx: Float64Array, ky: Float64Array): void {
  if (kx.length !== ky.length) {
    throw new ValidationError({
      field: 'trajectory',
      message: `kx and ky must have the same length, got ${kx.length} and ${ky.length}`,
    });
  }
  for (let p = 0; p < kx.length; p++) {
    if (!Number.isFinite(kx[p]) || !Number.isFinite(ky[p])) {
      throw new ValidationError({
        field: `trajectory.${p}`,
        message: `k-space coordinates must be finite, got [${kx[p]}, ${ky[p]}]`,
        allowed: 'finite numbers (cycles per field of view)',
      });
    }
  }
}

/** Per-axis interpolation table: padded first tap, tap count (W or W + 1) and weights per point. */
interface AxisTaps {
  start: Int32Array;
  taps: Uint8Array;
  weights: Float64Array;
}

/**
 * Taps for grid coordinates g (oversampled-grid units, any real value): every grid index ℓ with
 * |g − ℓ| ≤ W/2, i.e. W taps, or W + 1 when g − W/2 is an integer. A tap exactly on the edge of the
 * support gets half the kernel value there, the mid-point value of the jump, so that the sum over
 * ℓ matches ĉ by the Poisson summation formula also for points on the grid.
 */
function axisTaps(
  coordinate: (p: number) => number,
  count: number,
  gridSize: number,
  pad: number,
  width: number,
  beta: number,
): AxisTaps {
  const stride = width + 1;
  const start = new Int32Array(count);
  const taps = new Uint8Array(count);
  const weights = new Float64Array(count * stride);
  const half = width / 2;
  for (let p = 0; p < count; p++) {
    let g = coordinate(p);
    g -= gridSize * Math.floor(g / gridSize);
    if (g >= gridSize) g -= gridSize;
    const first = Math.ceil(g - half);
    const last = Math.floor(g + half);
    start[p] = first + pad;
    taps[p] = last - first + 1;
    for (let l = first; l <= last; l++) {
      const u = g - l;
      const c = kaiserBessel(u, width, beta);
      weights[p * stride + (l - first)] = Math.abs(u) === half ? c / 2 : c;
    }
  }
  return { start, taps, weights };
}

/** Deapodisation and orthonormal scale along one axis: 1/(√n · ĉ(offset/G)) per pixel. */
function deapodisation(n: number, gridSize: number, width: number, beta: number): Float64Array {
  const d = new Float64Array(n);
  const centre = Math.floor(n / 2);
  for (let j = 0; j < n; j++) {
    d[j] = 1 / (Math.sqrt(n) * kaiserBesselTransform((j - centre) / gridSize, width, beta));
  }
  return d;
}

/** Core grid index of pixel offset n, i.e. n mod G (the ifftshift placement). */
function wrapIndex(n: number, gridSize: number): number {
  return ((n % gridSize) + gridSize) % gridSize;
}

/** Creates a plan for an ny×nx image and the points (kx[p], ky[p]) in cycles per FOV. */
export function createNufftPlan(
  nx: number,
  ny: number,
  kx: Float64Array,
  ky: Float64Array,
  options: NufftOptions = {},
): NufftPlan {
  const { width, oversampling } = checkNufftOptions(options);
  if (!Number.isInteger(nx) || nx < 1 || !Number.isInteger(ny) || ny < 1) {
    throw new ValidationError({
      field: 'matrix',
      message: `sides must be positive integers, got ${ny}×${nx}`,
    });
  }
  const count = kx.length;
  if (count * (width + 1) > MAX_PLAN_WEIGHTS) {
    throw new LimitError({
      field: 'trajectory',
      message: `${count} points with kernel width ${width} need more interpolation weights than a plan may hold`,
      allowed: `points × (width + 1) ≤ ${MAX_PLAN_WEIGHTS}`,
    });
  }
  checkTrajectory(kx, ky);
  const beta = kaiserBesselBeta(width, oversampling);
  const gx = fastGridSize(oversampling * nx);
  const gy = fastGridSize(oversampling * ny);
  const pad = Math.ceil(width / 2) + 1;
  const px = gx + 2 * pad;
  const py = gy + 2 * pad;
  const stride = width + 1;
  const sx = gx / nx;
  const sy = gy / ny;
  // Row coordinate runs against ky (rows grow downwards, ky points up).
  const xTaps = axisTaps((p) => kx[p] * sx, count, gx, pad, width, beta);
  const yTaps = axisTaps((p) => -ky[p] * sy, count, gy, pad, width, beta);
  const dx = deapodisation(nx, gx, width, beta);
  const dy = deapodisation(ny, gy, width, beta);
  const colOfPixel = Int32Array.from({ length: nx }, (_, j) => wrapIndex(j - Math.floor(nx / 2), gx) + pad);
  const rowOfPixel = Int32Array.from({ length: ny }, (_, i) => wrapIndex(i - Math.floor(ny / 2), gy) + pad);

  const grid = new Float64Array(2 * px * py);
  const rowPlan = fftPlan(gx);
  const colPlan = fftPlan(gy);
  const rowScratch = new Float64Array(2 * gx);
  const colIn = new Float64Array(2 * gy);
  const colOut = new Float64Array(2 * gy);

  /** Unnormalised DFT (sign −1) or its adjoint (sign +1) along one padded row, in place. */
  function rowTransform(paddedRow: number, sign: -1 | 1): void {
    const off = 2 * (paddedRow * px + pad);
    const line = grid.subarray(off, off + 2 * gx);
    if (sign === -1) {
      rowScratch.set(line);
      rowPlan.forward(line, rowScratch);
      return;
    }
    for (let c = 0; c < gx; c++) {
      rowScratch[2 * c] = line[2 * c];
      rowScratch[2 * c + 1] = -line[2 * c + 1];
    }
    rowPlan.forward(line, rowScratch);
    for (let c = 0; c < gx; c++) line[2 * c + 1] = -line[2 * c + 1];
  }

  /** The same along one core column (stride px). */
  function columnTransform(paddedCol: number, sign: -1 | 1): void {
    const conj = sign === 1 ? -1 : 1;
    for (let r = 0, at = 2 * (pad * px + paddedCol); r < gy; r++, at += 2 * px) {
      colIn[2 * r] = grid[at];
      colIn[2 * r + 1] = conj * grid[at + 1];
    }
    colPlan.forward(colOut, colIn);
    for (let r = 0, at = 2 * (pad * px + paddedCol); r < gy; r++, at += 2 * px) {
      grid[at] = colOut[2 * r];
      grid[at + 1] = conj * colOut[2 * r + 1];
    }
  }

  /** Copies the periodic continuation of the core into the pads (after the forward FFT). */
  function wrapIntoPads(): void {
    for (let b = pad; b < pad + gy; b++) {
      const base = 2 * b * px;
      for (let a = 0; a < px; a++) {
        if (a >= pad && a < pad + gx) continue;
        const src = base + 2 * (pad + wrapIndex(a - pad, gx));
        grid[base + 2 * a] = grid[src];
        grid[base + 2 * a + 1] = grid[src + 1];
      }
    }
    for (let b = 0; b < py; b++) {
      if (b >= pad && b < pad + gy) continue;
      const src = 2 * (pad + wrapIndex(b - pad, gy)) * px;
      grid.copyWithin(2 * b * px, src, src + 2 * px);
    }
  }

  /** Adds the pads into the core cells they alias (after spreading). */
  function foldPads(): void {
    for (let b = 0; b < py; b++) {
      if (b >= pad && b < pad + gy) continue;
      const dst = 2 * (pad + wrapIndex(b - pad, gy)) * px;
      const src = 2 * b * px;
      for (let a = 0; a < 2 * px; a++) grid[dst + a] += grid[src + a];
    }
    for (let b = pad; b < pad + gy; b++) {
      const base = 2 * b * px;
      for (let a = 0; a < px; a++) {
        if (a >= pad && a < pad + gx) continue;
        const dst = base + 2 * (pad + wrapIndex(a - pad, gx));
        grid[dst] += grid[base + 2 * a];
        grid[dst + 1] += grid[base + 2 * a + 1];
      }
    }
  }

  const { start: startX, taps: tapsX, weights: wX } = xTaps;
  const { start: startY, taps: tapsY, weights: wY } = yTaps;

  // Interleaved offset of each point's first tap in the padded grid, and the row stride.
  const firstTap = new Int32Array(count);
  for (let p = 0; p < count; p++) firstTap[p] = 2 * (startY[p] * px + startX[p]);
  const rowStride = 2 * px;

  function interpolate(out: Float64Array): void {
    for (let p = 0, o = 0; p < count; p++, o += stride) {
      const nxTaps = tapsX[p];
      const nyTaps = tapsY[p];
      let row = firstTap[p];
      let re = 0;
      let im = 0;
      for (let ty = 0; ty < nyTaps; ty++, row += rowStride) {
        let rr = 0;
        let ri = 0;
        for (let tx = 0, at = row; tx < nxTaps; tx++, at += 2) {
          const w = wX[o + tx];
          rr += w * grid[at];
          ri += w * grid[at + 1];
        }
        const w = wY[o + ty];
        re += w * rr;
        im += w * ri;
      }
      out[2 * p] = re;
      out[2 * p + 1] = im;
    }
  }

  /** Adds each value times the kernel around its point: complex interleaved, or real when `real`. */
  function spread(values: Float64Array, real: boolean): void {
    for (let p = 0, o = 0; p < count; p++, o += stride) {
      const nxTaps = tapsX[p];
      const nyTaps = tapsY[p];
      const vr = real ? values[p] : values[2 * p];
      const vi = real ? 0 : values[2 * p + 1];
      let row = firstTap[p];
      for (let ty = 0; ty < nyTaps; ty++, row += rowStride) {
        const wy = wY[o + ty];
        const yr = wy * vr;
        const yi = wy * vi;
        for (let tx = 0, at = row; tx < nxTaps; tx++, at += 2) {
          const w = wX[o + tx];
          grid[at] += w * yr;
          grid[at + 1] += w * yi;
        }
      }
    }
  }

  /**
   * Pixel (i, j) of the image ↔ its place on the oversampled grid, scaled by the deapodisation
   * dy[i]·dx[j]: the forward transform writes the image onto the grid, the adjoint reads it back.
   */
  const exchangeImage = (image: Float64Array, direction: 'toGrid' | 'fromGrid'): void => {
    const toGrid = direction === 'toGrid';
    for (let i = 0; i < ny; i++) {
      const rowBase = 2 * rowOfPixel[i] * px;
      for (let j = 0; j < nx; j++) {
        const s = dy[i] * dx[j];
        const at = rowBase + 2 * colOfPixel[j];
        const pixel = 2 * (i * nx + j);
        if (toGrid) {
          grid[at] = image[pixel] * s;
          grid[at + 1] = image[pixel + 1] * s;
        } else {
          image[pixel] = grid[at] * s;
          image[pixel + 1] = grid[at + 1] * s;
        }
      }
    }
  };

  return {
    nx,
    ny,
    count,
    width,
    oversampling,
    beta,
    gridNx: gx,
    gridNy: gy,
    expectedRelativeError: expectedRelativeError(width, oversampling),

    forward(image, out) {
      if (image.nx !== nx || image.ny !== ny) {
        throw new RangeError(`plan is for ${ny}×${nx}, image is ${image.ny}×${image.nx}`);
      }
      const target = out ?? new Float64Array(2 * count);
      if (target.length !== 2 * count) throw new RangeError(`out must hold ${2 * count} numbers`);
      grid.fill(0);
      exchangeImage(image.data, 'toGrid');
      // Only the ny image rows hold data, so only they need a row transform.
      for (let i = 0; i < ny; i++) rowTransform(rowOfPixel[i], -1);
      for (let c = pad; c < pad + gx; c++) columnTransform(c, -1);
      wrapIntoPads();
      interpolate(target);
      return target;
    },

    adjoint(samples, out) {
      if (samples.length !== 2 * count) throw new RangeError(`samples must hold ${2 * count} numbers`);
      const target = out ?? createComplexImage(nx, ny);
      if (target.nx !== nx || target.ny !== ny) {
        throw new RangeError(`plan is for ${ny}×${nx}, out is ${target.ny}×${target.nx}`);
      }
      grid.fill(0);
      spread(samples, false);
      foldPads();
      for (let c = pad; c < pad + gx; c++) columnTransform(c, 1);
      // Only the ny image rows are read back, so only they need a row transform.
      for (let i = 0; i < ny; i++) rowTransform(rowOfPixel[i], 1);
      exchangeImage(target.data, 'fromGrid');
      return target;
    },

    spreadInterpolate(weights, out) {
      if (weights.length !== count || out.length !== count) {
        throw new RangeError(`weights and out must hold ${count} numbers`);
      }
      grid.fill(0);
      spread(weights, true);
      foldPads();
      wrapIntoPads();
      for (let p = 0, o = 0; p < count; p++, o += stride) {
        let row = firstTap[p];
        let re = 0;
        for (let ty = 0; ty < tapsY[p]; ty++, row += rowStride) {
          let rr = 0;
          for (let tx = 0, at = row; tx < tapsX[p]; tx++, at += 2) rr += wX[o + tx] * grid[at];
          re += wY[o + ty] * rr;
        }
        out[p] = re;
      }
    },
  };
}
