import { fft2c, ifft2c } from '../core/centered-fft.ts';
import { type ComplexImage, createComplexImage } from '../core/complex-image.ts';
import { throwIfAborted } from '../core/errors.ts';
import { SeededRandom } from '../core/random.ts';
import { daubechiesFilters, type WaveletName } from '../wavelets/daubechies-filters.ts';
import { checkDwtShape } from '../wavelets/dwt2.ts';
import { WaveletSteps } from '../wavelets/wavelet-steps.ts';
import { maskedDataProx, maskedResidual, zeroFilledPeak } from './cs-tv.ts';
import type { ReconInput } from './method.ts';
import { runPrimalDual, TV_WAVELET_STEP } from './primal-dual-loop.ts';
import { type ConvergenceReport, StoppingRule } from './stopping-rule.ts';
import { totalVariation } from './total-variation.ts';

export const CS_WAVELET_DEFAULT_WAVELET: WaveletName = 'db4';
export const CS_WAVELET_DEFAULT_LEVELS = 4;
export const CS_WAVELET_DEFAULT_ITERATIONS = 150;
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
  /** Stop when the iterate and the objective change by less than this, relatively (StoppingRule). */
  tolerance?: number;
  /** A new random circular shift of the wavelet grid every iteration (FISTA only). */
  cycleSpinning?: boolean;
  /** Seed of the cycle-spinning shifts. */
  seed?: number;
  /** Monotone FISTA (Beck & Teboulle 2009b): keep the previous iterate when the objective would rise. */
  monotone?: boolean;
  /**
   * Adaptive restart of FISTA's momentum (O'Donoghue & Candès 2015, gradient scheme): when
   * ⟨z_k − x_k, x_k − x_{k−1}⟩ > 0 the momentum points uphill, so t is reset to 1. Default on for
   * plain FISTA; ignored with cycle spinning (the shifted proxes make the test noise) and MFISTA.
   */
  restart?: boolean;
  /** Record the objective after every iteration in `info.objectiveHistory`. */
  recordObjective?: boolean;
  signal?: AbortSignal;
}

export interface CsWaveletInfo extends ConvergenceReport {
  solver: string;
  wavelet: WaveletName;
  levels: number;
  lambda: number;
  lambdaAbsolute: number;
  lambdaTv: number;
  lambdaTvAbsolute: number;
  cycleSpinning: boolean;
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
    steps: new WaveletSteps(nx, ny, daubechiesFilters(wavelet), levels),
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
      : fista(
          setup,
          cycleSpinning ? new SeededRandom(options.seed ?? 1) : null,
          options.monotone ?? false,
          (options.restart ?? true) && !cycleSpinning && !options.monotone,
        );
  const objective = objectiveOf(setup, run.image.data, run.kspace);
  return {
    image: run.image,
    info: {
      solver:
        lambdaTv > 0
          ? 'Chambolle–Pock primal–dual, K = (∇, W), τ = σ = 0.99/3'
          : `${options.monotone ? 'monotone ' : ''}FISTA, step 1 (L = 1)${run.restarts > 0 ? `, ${run.restarts} adaptive restarts` : ''}`,
      wavelet,
      levels,
      lambda: options.lambda,
      lambdaAbsolute: setup.lambdaAbs,
      lambdaTv,
      lambdaTvAbsolute: setup.lambdaTvAbs,
      cycleSpinning,
      ...run.rule.report(run.iterations, iterations),
      objective,
      ...(setup.history ? { objectiveHistory: setup.history } : {}),
    },
  };
}

interface Setup {
  input: ReconInput;
  steps: WaveletSteps;
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
  rule: StoppingRule;
  /** Momentum restarts (FISTA with adaptive restart). */
  restarts: number;
}

/** ½‖M X − y‖² for k-space X. */
function dataTerm(X: Float64Array, input: ReconInput): number {
  return maskedResidual(X, input.kspace.data, input.mask);
}

/** Φ(x) = ½‖M F x − y‖² + λ‖Ψx‖₁ (+ λ_TV TV(x)) for the image x and its k-space F x. */
function objectiveOf(setup: Setup, image: Float64Array, kspace: Float64Array): number {
  const { nx, ny } = setup.steps;
  let objective = dataTerm(kspace, setup.input) + setup.lambdaAbs * setup.steps.detailL1(image);
  if (setup.lambdaTvAbs > 0) objective += setup.lambdaTvAbs * totalVariation(image, nx, ny);
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

function fista(setup: Setup, rng: SeededRandom | null, monotone: boolean, restart: boolean): Run {
  const { input, lambdaAbs, history, signal, steps } = setup;
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
  const u = createComplexImage(nx, ny);
  let objective = Number.POSITIVE_INFINITY;
  if (monotone) objective = dataTerm(X, input) + lambdaAbs * steps.detailL1(image.data);
  const rule = new StoppingRule(setup.tolerance);
  let t = 1;
  let run = 0;
  let restarts = 0;
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
    const l1 = steps.shrink(u.data, vd, lambdaAbs, rng);
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
    const change = norm > 0 ? Math.sqrt(diff / norm) : Math.sqrt(diff);
    if (restart && uphill(Z, U, X)) {
      t = 1;
      restarts++;
    }
    const tNext = nextMomentum(t);
    const accept = !monotone || candidate <= objective;
    const before = objective;
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
    if (
      rule.converged(
        change,
        () => objective,
        () => before,
      )
    )
      break;
  }
  return { image, kspace: X, iterations: run, rule, restarts };
}

/** FISTA's momentum sequence t_{k+1} = (1 + √(1 + 4t_k²))/2 (Beck & Teboulle 2009), t_0 = 1. */
export function nextMomentum(t: number): number {
  return (1 + Math.sqrt(1 + 4 * t * t)) / 2;
}

/** ⟨z − u, u − x⟩ > 0 (real part; F is unitary, so k-space copies give the image-domain value). */
export function uphill(z: Float64Array, u: Float64Array, x: Float64Array): boolean {
  let dot = 0;
  for (let i = 0; i < z.length; i++) dot += (z[i] - u[i]) * (u[i] - x[i]);
  return dot > 0;
}

/**
 * The primal–dual loop settings with K = (∇, W): τ = σ = TV_WAVELET_STEP, the TV dual of
 * runPrimalDual and the wavelet dual q (projection onto |q| ≤ λ per detail coefficient), whose
 * Wᴴq the primal step reads from `back`.
 */
export function waveletTvLoop(
  steps: WaveletSteps,
  lambdaAbs: number,
  lambdaTvAbs: number,
  run: { iterations: number; tolerance: number; signal?: AbortSignal | undefined },
) {
  const { nx, ny } = steps;
  const q = new Float64Array(2 * nx * ny);
  const back = new Float64Array(2 * nx * ny);
  const loop = {
    nx,
    ny,
    sigma: TV_WAVELET_STEP,
    lambdaTv: lambdaTvAbs,
    iterations: run.iterations,
    tolerance: run.tolerance,
    signal: run.signal,
    dualStep: (xBar: Float64Array) => steps.dualStep(q, back, xBar, TV_WAVELET_STEP, lambdaAbs),
  };
  return { back, loop };
}

function primalDual(setup: Setup): Run {
  const { input, lambdaAbs, lambdaTvAbs, history, steps } = setup;
  const { nx, ny } = input.kspace;
  const size = 2 * nx * ny;
  const x = ifft2c({ nx, ny, data: maskedData(input) });
  const xd = x.data;
  const work = createComplexImage(nx, ny);
  const kspace = maskedData(input);
  const kspaceOld = new Float64Array(size);
  const { back, loop } = waveletTvLoop(steps, lambdaAbs, lambdaTvAbs, setup);
  const { iterations: run, rule } = runPrimalDual(xd, {
    ...loop,
    // Primal step v = x − τKᴴ(p, q) = x + τ div p − τ Wᴴq, then the exact data prox in k-space.
    primalStep: (div) => {
      kspaceOld.set(kspace);
      for (let i = 0; i < size; i++) work.data[i] = xd[i] + TV_WAVELET_STEP * (div[i] - back[i]);
      maskedDataProx(work, x, kspace, input, TV_WAVELET_STEP);
    },
    objectiveNow: () => objectiveOf(setup, xd, kspace),
    objectiveBefore: (xOld) => objectiveOf(setup, xOld, kspaceOld),
    ...(history ? { recordObjective: (objective: number) => history.push(objective) } : {}),
  });
  return { image: x, kspace, iterations: run, rule, restarts: 0 };
}
