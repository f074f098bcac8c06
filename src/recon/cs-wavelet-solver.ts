import { fft2c, ifft2c } from '../core/centered-fft.ts';
import { type ComplexImage, createComplexImage } from '../core/complex-image.ts';
import { throwIfAborted } from '../core/errors.ts';
import { SeededRandom } from '../core/random.ts';
import { circularShift, randomShift } from '../wavelets/cycle-spin.ts';
import { daubechiesFilters, type WaveletFilters, type WaveletName } from '../wavelets/daubechies-filters.ts';
import { checkDwtShape, forwardDwt2, inverseDwt2 } from '../wavelets/dwt2.ts';
import { detailL1, softThresholdDetails } from '../wavelets/soft-threshold.ts';
import { zeroFilledPeak } from './cs-tv.ts';
import type { ReconInput } from './method.ts';
import { divergence, gradient, totalVariation, tvDualStep } from './total-variation.ts';

export const CS_WAVELET_DEFAULT_WAVELET: WaveletName = 'db4';
export const CS_WAVELET_DEFAULT_LEVELS = 4;
export const CS_WAVELET_DEFAULT_ITERATIONS = 100;
export const CS_WAVELET_DEFAULT_TOLERANCE = 1e-5;

export interface CsWaveletOptions {
  /** Wavelet weight relative to max |F_cᴴ y| (the cs-tv convention): λ_abs = lambda · max |F_cᴴ y|. */
  lambda: number;
  /** Optional isotropic-TV weight, relative in the same way; > 0 switches to the primal–dual solver. */
  lambdaTv?: number;
  wavelet?: WaveletName;
  /** DWT levels; nx and ny must be divisible by 2^levels (RangeError otherwise). */
  levels?: number;
  iterations?: number;
  /** Stop when ‖x_k − x_{k−1}‖ / ‖x_k‖ < tolerance. */
  tolerance?: number;
  /** A new random circular shift of the wavelet grid every iteration (FISTA only). */
  cycleSpinning?: boolean;
  /** Seed of the cycle-spinning shifts. */
  seed?: number;
  /** Monotone FISTA (Beck & Teboulle 2009b): keep the previous iterate when the objective would rise. */
  monotone?: boolean;
  /** Record the objective after every iteration in `info.objectiveHistory`. */
  recordObjective?: boolean;
  signal?: AbortSignal;
}

export interface CsWaveletInfo {
  solver: string;
  wavelet: WaveletName;
  levels: number;
  lambda: number;
  lambdaAbsolute: number;
  lambdaTv: number;
  lambdaTvAbsolute: number;
  cycleSpinning: boolean;
  iterations: number;
  iterationLimit: number;
  tolerance: number;
  relativeChange: number;
  converged: boolean;
  /** ½‖M F x − y‖² + λ_abs‖Ψx‖₁ (+ λ_TV,abs TV(x)) at the returned x, with the unshifted transform. */
  objective: number;
  /**
   * Objective after each iteration. With cycle spinning each entry uses that iteration's shifted
   * transform, so the sequence measures a different function at every step.
   */
  objectiveHistory?: number[];
}

/**
 * ℓ1-wavelet compressed sensing on the single-coil Cartesian model (Lustig, Donoho & Pauly 2007):
 *   min_x ½‖M F_c x − y‖² + λ‖Ψx‖₁ (+ λ_TV·TV_iso(x)),
 * x complex, F_c the centred orthonormal DFT, M the 0/1 mask, Ψ the detail bands of the periodised
 * orthogonal Daubechies DWT (src/wavelets; the coarse approximation is not penalised, common
 * practice), ‖·‖₁ over complex moduli. Start: the zero-filled image F_cᴴ y.
 *
 * Wavelet only: FISTA (Beck & Teboulle 2009) with step 1/L, L = ‖(MF)ᴴMF‖ = 1 for the orthonormal F
 * and a 0/1 mask. The gradient step z − F_cᴴ(M F_c z − y) is F_cᴴ of F_c z with the sampled points
 * replaced by y, and F_c z is a combination of the stored F_c x_k, so each iteration costs one
 * inverse FFT (to the image), one DWT pair (the prox: complex soft-threshold of the coefficients),
 * and one forward FFT (back to k-space, which also gives the data term of the objective).
 * With cycle spinning the prox is Sᴴ Wᴴ soft(W S v) for a random circular shift S per iteration.
 *
 * With TV: the first-order primal–dual method of Chambolle & Pock 2011 (θ = 1) with K = (∇, W),
 * ‖K‖² ≤ ‖∇‖² + ‖W‖² ≤ 8 + 1, so τ = σ = 0.99/3; the duals are projected onto the λ_TV ball per
 * pixel (as cs-tv does) and onto |q| ≤ λ per wavelet coefficient; the data step is the exact prox in
 * k-space of cs-tv. Cycle spinning and the monotone variant are FISTA options only (a RangeError
 * otherwise: the primal–dual dual variable belongs to one fixed transform).
 */
export function solveCsWavelet(
  input: ReconInput,
  options: CsWaveletOptions,
): { image: ComplexImage; info: CsWaveletInfo } {
  const { nx, ny } = input.kspace;
  const wavelet = options.wavelet ?? CS_WAVELET_DEFAULT_WAVELET;
  const levels = options.levels ?? CS_WAVELET_DEFAULT_LEVELS;
  const iterations = options.iterations ?? CS_WAVELET_DEFAULT_ITERATIONS;
  const tolerance = options.tolerance ?? CS_WAVELET_DEFAULT_TOLERANCE;
  const lambdaTv = options.lambdaTv ?? 0;
  const cycleSpinning = options.cycleSpinning ?? false;
  checkDwtShape(nx, ny, levels);
  if (!(options.lambda >= 0) || !(lambdaTv >= 0)) {
    throw new RangeError(`lambda and lambdaTv must be ≥ 0, got ${options.lambda}, ${lambdaTv}`);
  }
  if (!Number.isInteger(iterations) || iterations < 1) {
    throw new RangeError(`iterations must be a positive integer, got ${iterations}`);
  }
  if (lambdaTv > 0 && (cycleSpinning || options.monotone)) {
    throw new RangeError('cycle spinning and the monotone variant apply to the wavelet-only (FISTA) solver');
  }
  if (cycleSpinning && options.monotone) {
    throw new RangeError(
      'the monotone variant compares objectives of one fixed transform: no cycle spinning',
    );
  }
  const peak = zeroFilledPeak(input);
  const setup: Setup = {
    input,
    filters: daubechiesFilters(wavelet),
    levels,
    iterations,
    tolerance,
    lambdaAbs: options.lambda * peak,
    lambdaTvAbs: lambdaTv * peak,
    history: options.recordObjective ? [] : undefined,
    signal: options.signal,
  };
  const run =
    lambdaTv > 0
      ? primalDual(setup)
      : fista(setup, cycleSpinning ? new SeededRandom(options.seed ?? 1) : null, options.monotone ?? false);
  const objective = finalObjective(setup, run.image, run.kspace);
  return {
    image: run.image,
    info: {
      solver:
        lambdaTv > 0
          ? 'Chambolle–Pock primal–dual, K = (∇, W), τ = σ = 0.99/3'
          : `${options.monotone ? 'monotone ' : ''}FISTA, step 1 (L = 1)`,
      wavelet,
      levels,
      lambda: options.lambda,
      lambdaAbsolute: setup.lambdaAbs,
      lambdaTv,
      lambdaTvAbsolute: setup.lambdaTvAbs,
      cycleSpinning,
      iterations: run.iterations,
      iterationLimit: iterations,
      tolerance,
      relativeChange: run.change,
      converged: run.change < tolerance,
      objective,
      ...(setup.history ? { objectiveHistory: setup.history } : {}),
    },
  };
}

interface Setup {
  input: ReconInput;
  filters: WaveletFilters;
  levels: number;
  iterations: number;
  tolerance: number;
  lambdaAbs: number;
  lambdaTvAbs: number;
  history: number[] | undefined;
  signal: AbortSignal | undefined;
}

interface Run {
  image: ComplexImage;
  /** F_c of the image. */
  kspace: Float64Array;
  iterations: number;
  change: number;
}

/** ½‖M X − y‖² for k-space X. */
function dataTerm(X: Float64Array, input: ReconInput): number {
  const { mask } = input;
  const y = input.kspace.data;
  let residual = 0;
  for (let i = 0; i < mask.length; i++) {
    if (!mask[i]) continue;
    const a = X[2 * i] - y[2 * i];
    const b = X[2 * i + 1] - y[2 * i + 1];
    residual += a * a + b * b;
  }
  return 0.5 * residual;
}

function finalObjective(setup: Setup, image: ComplexImage, kspace: Float64Array): number {
  const { nx, ny } = image;
  const coefficients = new Float64Array(image.data.length);
  forwardDwt2(coefficients, image.data, nx, ny, setup.filters, setup.levels);
  let objective =
    dataTerm(kspace, setup.input) + setup.lambdaAbs * detailL1(coefficients, nx, ny, setup.levels);
  if (setup.lambdaTvAbs > 0) objective += setup.lambdaTvAbs * totalVariation(image.data, nx, ny);
  return objective;
}

/** Zero-filled k-space M y (the input's k-space with unsampled points forced to zero). */
function maskedData(input: ReconInput): Float64Array {
  const out = new Float64Array(input.kspace.data.length);
  const y = input.kspace.data;
  for (let i = 0; i < input.mask.length; i++) {
    if (input.mask[i]) {
      out[2 * i] = y[2 * i];
      out[2 * i + 1] = y[2 * i + 1];
    }
  }
  return out;
}

function fista(setup: Setup, rng: SeededRandom | null, monotone: boolean): Run {
  const { input, filters, levels, lambdaAbs, history, signal } = setup;
  const { nx, ny } = input.kspace;
  const { mask } = input;
  const y = input.kspace.data;
  const size = 2 * nx * ny;
  // k-space copies of the iterates: X = F x_{k−1}, Z = F z_k, U = F u_k (the prox output).
  let X: Float64Array = maskedData(input);
  const Z = X.slice();
  let U: Float64Array = new Float64Array(size);
  const image = ifft2c({ nx, ny, data: X.slice() });
  const v = createComplexImage(nx, ny);
  const coefficients = new Float64Array(size);
  const shifted = rng ? new Float64Array(size) : coefficients;
  const u = createComplexImage(nx, ny);
  let objective = Number.POSITIVE_INFINITY;
  if (monotone) {
    forwardDwt2(coefficients, image.data, nx, ny, filters, levels);
    objective = dataTerm(X, input) + lambdaAbs * detailL1(coefficients, nx, ny, levels);
  }
  let t = 1;
  let run = 0;
  let change = Number.POSITIVE_INFINITY;
  for (let it = 0; it < setup.iterations; it++) {
    throwIfAborted(signal);
    // Gradient step with step 1: F(z − Fᴴ(MFz − y)) = F z with the sampled points set to y.
    const vd = v.data;
    for (let i = 0; i < mask.length; i++) {
      if (mask[i]) {
        vd[2 * i] = y[2 * i];
        vd[2 * i + 1] = y[2 * i + 1];
      } else {
        vd[2 * i] = Z[2 * i];
        vd[2 * i + 1] = Z[2 * i + 1];
      }
    }
    ifft2c(v, v);
    // Prox of λ‖Ψ S ·‖₁: soft-threshold the detail coefficients of the (shifted) image.
    let l1: number;
    if (rng) {
      const { dy, dx } = randomShift(rng, levels);
      circularShift(shifted, vd, nx, ny, dy, dx);
      forwardDwt2(coefficients, shifted, nx, ny, filters, levels);
      l1 = softThresholdDetails(coefficients, nx, ny, levels, lambdaAbs);
      inverseDwt2(shifted, coefficients, nx, ny, filters, levels);
      circularShift(u.data, shifted, nx, ny, -dy, -dx);
    } else {
      forwardDwt2(coefficients, vd, nx, ny, filters, levels);
      l1 = softThresholdDetails(coefficients, nx, ny, levels, lambdaAbs);
      inverseDwt2(u.data, coefficients, nx, ny, filters, levels);
    }
    U.set(u.data);
    fft2c({ nx, ny, data: U }, { nx, ny, data: U });
    const candidate = dataTerm(U, input) + lambdaAbs * l1;
    // Relative change ‖u_k − x_{k−1}‖ / ‖u_k‖, measured in k-space (F is unitary).
    let diff = 0;
    let norm = 0;
    for (let i = 0; i < size; i++) {
      const d = U[i] - X[i];
      diff += d * d;
      norm += U[i] * U[i];
    }
    change = norm > 0 ? Math.sqrt(diff / norm) : Math.sqrt(diff);
    const tNext = (1 + Math.sqrt(1 + 4 * t * t)) / 2;
    const accept = !monotone || candidate <= objective;
    if (monotone) {
      // MFISTA: x_k = argmin{Φ(u_k), Φ(x_{k−1})}; z = x_k + (t/t')(u_k − x_k) + ((t − 1)/t')(x_k − x_{k−1}).
      const keep = accept ? U : X;
      const a = t / tNext;
      const b = (t - 1) / tNext;
      for (let i = 0; i < size; i++) Z[i] = keep[i] + a * (U[i] - keep[i]) + b * (keep[i] - X[i]);
      if (accept) objective = candidate;
    } else {
      const b = (t - 1) / tNext;
      for (let i = 0; i < size; i++) Z[i] = U[i] + b * (U[i] - X[i]);
      objective = candidate;
    }
    if (accept) {
      [X, U] = [U, X];
      image.data.set(u.data);
    }
    t = tNext;
    run = it + 1;
    history?.push(objective);
    if (change < setup.tolerance) break;
  }
  return { image, kspace: X, iterations: run, change };
}

// Primal–dual steps: τσ‖K‖² < 1 with ‖K‖² ≤ ‖∇‖² + ‖W‖² ≤ 8 + 1 (Chambolle & Pock 2011).
const PD_TAU = 0.99 / 3;
const PD_SIGMA = 0.99 / 3;

function primalDual(setup: Setup): Run {
  const { input, filters, levels, lambdaAbs, lambdaTvAbs, history, signal } = setup;
  const { nx, ny } = input.kspace;
  const { mask } = input;
  const y = input.kspace.data;
  const n = nx * ny;
  const size = 2 * n;
  const x = ifft2c({ nx, ny, data: maskedData(input) });
  const xd = x.data;
  const work = createComplexImage(nx, ny);
  const xOld = new Float64Array(size);
  const xBar = new Float64Array(xd);
  const px = new Float64Array(size);
  const py = new Float64Array(size);
  const gx = new Float64Array(size);
  const gy = new Float64Array(size);
  const div = new Float64Array(size);
  const q = new Float64Array(size);
  const coefficients = new Float64Array(size);
  const back = new Float64Array(size);
  const kspace = new Float64Array(size);
  const h0 = ny >> levels;
  const w0 = nx >> levels;
  const wl2 = lambdaAbs * lambdaAbs;
  const damp = 1 / (1 + PD_TAU);
  let run = 0;
  let change = Number.POSITIVE_INFINITY;
  for (let it = 0; it < setup.iterations; it++) {
    throwIfAborted(signal);
    // Dual ascent on p (TV): projection onto the λ_TV ball per pixel, as cs-tv.
    gradient(gx, gy, xBar, nx, ny);
    tvDualStep(px, py, gx, gy, PD_SIGMA, lambdaTvAbs);
    // Dual ascent on q (wavelet): projection onto |q| ≤ λ per detail coefficient; the unpenalised
    // approximation band has q = 0 (its conjugate is the indicator of {0}).
    forwardDwt2(coefficients, xBar, nx, ny, filters, levels);
    for (let row = 0; row < ny; row++) {
      for (let col = 0; col < nx; col++) {
        const k = 2 * (row * nx + col);
        if (row < h0 && col < w0) continue;
        const a = q[k] + PD_SIGMA * coefficients[k];
        const b = q[k + 1] + PD_SIGMA * coefficients[k + 1];
        const s = a * a + b * b;
        const scale = s > wl2 ? lambdaAbs / Math.sqrt(s) : 1;
        q[k] = a * scale;
        q[k + 1] = b * scale;
      }
    }
    inverseDwt2(back, q, nx, ny, filters, levels);
    divergence(div, px, py, nx, ny);
    // Primal step v = x − τKᴴ(p, q) = x + τ div p − τ Wᴴq, then the exact data prox in k-space.
    xOld.set(xd);
    for (let i = 0; i < size; i++) work.data[i] = xd[i] + PD_TAU * (div[i] - back[i]);
    fft2c(work, work);
    const w = work.data;
    for (let i = 0; i < n; i++) {
      if (mask[i]) {
        w[2 * i] = (w[2 * i] + PD_TAU * y[2 * i]) * damp;
        w[2 * i + 1] = (w[2 * i + 1] + PD_TAU * y[2 * i + 1]) * damp;
      }
    }
    kspace.set(w);
    ifft2c(work, x);
    let diff = 0;
    let norm = 0;
    for (let i = 0; i < size; i++) {
      const value = xd[i];
      const d = value - xOld[i];
      diff += d * d;
      norm += value * value;
      xBar[i] = value + d;
    }
    run = it + 1;
    change = norm > 0 ? Math.sqrt(diff / norm) : Math.sqrt(diff);
    if (history) history.push(finalObjective(setup, x, kspace));
    if (change < setup.tolerance) break;
  }
  return { image: x, kspace, iterations: run, change };
}
