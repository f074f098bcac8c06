import type { ComplexImage } from '../core/complex-image.ts';
import { throwIfAborted } from '../core/errors.ts';
import { SeededRandom } from '../core/random.ts';
import {
  CartesianEncoding,
  type CoilSamples,
  type EncodingOperator,
  peakSensitivityPower,
} from '../encoding/index.ts';
import type { WaveletFilters } from '../wavelets/daubechies-filters.ts';
import { WaveletSteps } from '../wavelets/wavelet-steps.ts';
import { dataTermFromNormal, PROX_MAX_STEPS, PROX_TOLERANCE } from './cs-tv-encoding.ts';
import { nextMomentum, uphill, waveletTvLoop } from './cs-wavelet-solver.ts';
import { NormalProxSolver } from './normal-prox.ts';
import { runPrimalDual, TV_WAVELET_STEP } from './primal-dual-loop.ts';
import { StoppingRule } from './stopping-rule.ts';
import { totalVariation } from './total-variation.ts';

export interface CsWaveletEncodingOptions {
  filters: WaveletFilters;
  levels: number;
  /** Absolute weights (already multiplied by the back-projection peak). */
  lambdaAbs: number;
  lambdaTvAbs: number;
  iterations: number;
  tolerance: number;
  /** A seeded random circular shift of the wavelet grid per iteration (FISTA only), or none. */
  cycleSpinSeed: number | null;
  signal?: AbortSignal;
}

export interface CsWaveletEncodingResult {
  image: ComplexImage;
  iterations: number;
  rule: StoppingRule;
  objective: number;
  /** FISTA's Lipschitz constant L of EᴴE (the step is 1/L); 0 for the primal–dual form. */
  lipschitz: number;
  /** CG steps summed over the iterations (primal–dual form; each one EᴴE product). */
  proxSteps: number;
}

/**
 * min_x ½‖E x − y‖² + λ‖Ψx‖₁ (+ λ_TV·TV_iso(x)) on any encoding operator E (multi-coil Cartesian
 * with maps, a trajectory through the NUFFT), Ψ the detail bands of the periodised DWT as in the
 * single-coil solver (cs-wavelet-solver.ts). Start x⁰ = Eᴴy.
 *
 * Wavelet only: FISTA (Beck & Teboulle 2009) with step 1/L, L ≥ ‖EᴴE‖ (lipschitzBound). Since
 * EᴴE is linear, EᴴE z for the extrapolated z = x_k + β(x_k − x_{k−1}) is the same combination of
 * the stored EᴴE x_k and EᴴE x_{k−1}: one normal product per iteration, and it also gives the data
 * term ½‖Ex − y‖² = ½⟨x, EᴴEx⟩ − Re⟨x, Eᴴy⟩ + ½‖y‖² for the stopping rule at no extra cost.
 *
 * With TV: Chambolle & Pock 2011 with K = (∇, W), ‖K‖² ≤ 8 + 1, τ = σ = 0.99/3, and the data term in
 * the primal prox (I + τEᴴE)⁻¹(v + τEᴴy) by warm-started CG, as solveCsTvEncoding does; the data
 * term for the stopping rule follows from the solve itself, τEᴴEx = b − x (to the CG tolerance).
 */
export function solveCsWaveletEncoding(
  operator: EncodingOperator<CoilSamples>,
  y: CoilSamples,
  options: CsWaveletEncodingOptions,
): CsWaveletEncodingResult {
  let dataNorm = 0;
  for (let i = 0; i < y.data.length; i++) dataNorm += y.data[i] * y.data[i];
  const problem: Problem = {
    operator,
    backProjection: operator.adjoint(y).data,
    halfDataNorm: 0.5 * dataNorm,
    steps: new WaveletSteps(operator.shapes.nx, operator.shapes.ny, options.filters, options.levels),
    options,
  };
  return options.lambdaTvAbs > 0 ? primalDual(problem) : fista(problem);
}

interface Problem {
  operator: EncodingOperator<CoilSamples>;
  backProjection: Float64Array;
  halfDataNorm: number;
  steps: WaveletSteps;
  options: CsWaveletEncodingOptions;
}

/** ½‖Ex − y‖² from x, EᴴEx and the problem's Eᴴy and ½‖y‖². */
function dataTerm(x: Float64Array, normal: Float64Array, problem: Problem): number {
  return dataTermFromNormal(x, normal, problem.backProjection, problem.halfDataNorm);
}

/**
 * An upper bound on ‖EᴴE‖. Cartesian: ‖E x‖² = Σ_c ‖M F S_c x‖² ≤ Σ_c ‖S_c x‖² ≤ max_pixel Σ_c|S_c|²·‖x‖²
 * (F unitary, M a 0/1 mask), exact for one coil without maps. Other operators: 40 power iterations
 * from a seeded random image (they approach ‖EᴴE‖ from below), times 1.05.
 */
export function lipschitzBound(operator: EncodingOperator<CoilSamples>): number {
  if (operator instanceof CartesianEncoding) {
    const maps = operator.sensitivities;
    return maps ? peakSensitivityPower(maps) : 1;
  }
  const rng = new SeededRandom(1);
  const x = operator.createImage();
  for (let i = 0; i < x.data.length; i++) x.data[i] = rng.normal();
  const product = operator.createImage();
  let estimate = 0;
  for (let it = 0; it < 40; it++) {
    let norm = 0;
    for (let i = 0; i < x.data.length; i++) norm += x.data[i] * x.data[i];
    norm = Math.sqrt(norm);
    if (norm === 0) return 1;
    for (let i = 0; i < x.data.length; i++) x.data[i] /= norm;
    operator.normal(x, product);
    estimate = 0;
    for (let i = 0; i < x.data.length; i++) estimate += x.data[i] * product.data[i];
    x.data.set(product.data);
  }
  return 1.05 * estimate;
}

function fista(problem: Problem): CsWaveletEncodingResult {
  const { operator, backProjection: b, steps, options } = problem;
  const { lambdaAbs, signal } = options;
  const lipschitz = lipschitzBound(operator);
  const rng = options.cycleSpinSeed === null ? null : new SeededRandom(options.cycleSpinSeed);
  const x = operator.createImage();
  x.data.set(b);
  const size = x.data.length;
  const xPrev = x.data.slice();
  const normalX = operator.normal(x);
  const normalPrev = normalX.data.slice();
  const v = new Float64Array(size);
  const z = new Float64Array(size);
  // Adaptive restart (O'Donoghue & Candès 2015) as in the single-coil FISTA; not with cycle spinning.
  const restart = rng === null;
  const rule = new StoppingRule(options.tolerance);
  let l1 = 0;
  let l1Prev = 0;
  let objective = Number.NaN;
  let t = 1;
  let beta = 0;
  let run = 0;
  for (let it = 0; it < options.iterations; it++) {
    throwIfAborted(signal);
    // Gradient step at z = x + β(x − x_prev): v = z − (EᴴE z − Eᴴy)/L.
    const xd = x.data;
    const nx = normalX.data;
    for (let i = 0; i < size; i++) {
      z[i] = xd[i] + beta * (xd[i] - xPrev[i]);
      const nz = nx[i] + beta * (nx[i] - normalPrev[i]);
      v[i] = z[i] - (nz - b[i]) / lipschitz;
    }
    xPrev.set(xd);
    normalPrev.set(nx);
    l1Prev = l1;
    l1 = steps.shrink(xd, v, lambdaAbs / lipschitz, rng);
    operator.normal(x, normalX);
    const change = relativeDifference(xd, xPrev);
    run = it + 1;
    objective = dataTerm(xd, normalX.data, problem) + lambdaAbs * l1;
    if (restart && uphill(z, xd, xPrev)) t = 1;
    const tNext = nextMomentum(t);
    beta = (t - 1) / tNext;
    t = tNext;
    const before = () =>
      it === 0 ? Number.POSITIVE_INFINITY : dataTerm(xPrev, normalPrev, problem) + lambdaAbs * l1Prev;
    if (rule.converged(change, () => objective, before)) break;
  }
  return { image: x, iterations: run, rule, objective, lipschitz, proxSteps: 0 };
}

function primalDual(problem: Problem): CsWaveletEncodingResult {
  const { operator, backProjection: b, steps, options } = problem;
  const { nx, ny } = operator.shapes;
  const { lambdaAbs, lambdaTvAbs } = options;
  const x = operator.createImage();
  x.data.set(b);
  const xd = x.data;
  const size = xd.length;
  const prox = new NormalProxSolver(operator);
  const rhs = new Float64Array(size);
  const normal = new Float64Array(size);
  const normalOld = new Float64Array(size);
  const objectiveAt = (image: Float64Array, normalImage: Float64Array): number =>
    dataTerm(image, normalImage, problem) +
    lambdaAbs * steps.detailL1(image) +
    lambdaTvAbs * totalVariation(image, nx, ny);
  operator.normal(x, { nx, ny, data: normal });
  let proxSteps = 0;
  const { back, loop } = waveletTvLoop(steps, lambdaAbs, lambdaTvAbs, options);
  const { iterations: run, rule } = runPrimalDual(xd, {
    ...loop,
    primalStep: (div) => {
      normalOld.set(normal);
      // b = v + τEᴴy with v = x − τKᴴ(p, q) = x + τ div p − τ Wᴴq; warm start at the current x.
      for (let i = 0; i < size; i++) rhs[i] = xd[i] + TV_WAVELET_STEP * (div[i] - back[i] + b[i]);
      proxSteps += prox.solve(x, rhs, TV_WAVELET_STEP, PROX_TOLERANCE, PROX_MAX_STEPS);
      // (I + τEᴴE)x = rhs, so EᴴEx = (rhs − x)/τ to the CG tolerance.
      for (let i = 0; i < size; i++) normal[i] = (rhs[i] - xd[i]) / TV_WAVELET_STEP;
    },
    objectiveNow: () => objectiveAt(xd, normal),
    objectiveBefore: (xOld) => objectiveAt(xOld, normalOld),
  });
  operator.normal(x, { nx, ny, data: normal });
  return {
    image: x,
    iterations: run,
    rule,
    objective: objectiveAt(xd, normal),
    lipschitz: 0,
    proxSteps,
  };
}

/** ‖a − b‖ / ‖a‖ (‖a − b‖ when a = 0). */
function relativeDifference(a: Float64Array, b: Float64Array): number {
  let diff = 0;
  let norm = 0;
  for (let i = 0; i < a.length; i++) {
    const d = a[i] - b[i];
    diff += d * d;
    norm += a[i] * a[i];
  }
  return norm > 0 ? Math.sqrt(diff / norm) : Math.sqrt(diff);
}
