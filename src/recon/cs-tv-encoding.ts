import type { ComplexImage } from '../core/complex-image.ts';
import type { CoilSamples, EncodingOperator } from '../encoding/index.ts';
import { NormalProxSolver } from './normal-prox.ts';
import { runPrimalDual, TV_STEP } from './primal-dual-loop.ts';
import type { StoppingRule } from './stopping-rule.ts';
import { totalVariation } from './total-variation.ts';

/** CG stops at ‖r‖ ≤ 1e-10·‖b‖: far below the solver's own stopping tolerance (≥ 1e-7 in practice). */
export const PROX_TOLERANCE = 1e-10;
/** At most this many CG steps per proximal step (κ ≤ 1.35 for ‖E‖ ≤ 1 needs about 9 from a cold start). */
export const PROX_MAX_STEPS = 30;

/** What every cs-tv solver returns: the image, the run, its last changes and objective (with TV). */
export interface CsTvResult {
  image: ComplexImage;
  iterations: number;
  objective: number;
  relativeChange: number;
  objectiveChange: number;
  tv: number;
}

export interface CsTvEncodingResult extends CsTvResult {
  /** CG steps summed over all iterations (each costs one EᴴE product); 0 for the linearised solver. */
  proxSteps: number;
}

/**
 * min_x ½‖E x − y‖² + λ·TV_iso(x) on any encoding operator E (multi-coil SENSE with a TV penalty,
 * Block, Uecker & Frahm 2007; docs/references.md §5.4), by the same Chambolle–Pock iteration as the single-coil cs-tv
 * (Chambolle & Pock 2011, θ = 1, K = ∇, τ = σ = 0.99/√8) with the data term kept in the primal
 * prox: prox_τG(v) = (I + τEᴴE)⁻¹(v + τEᴴy), solved by warm-started conjugate gradients
 * (NormalProxSolver) instead of the k-space division that only a single unit coil allows.
 * Why this and not a dual variable for the data term (K = [E; ∇]): the iterates are those of the
 * single-coil solver whatever the coils (one coil with S = 1 reproduces it to rounding, since CG is
 * exact on F⁻¹MF after two steps), λ, τ and the stopping rule keep their meaning, and the step
 * sizes need no estimate of ‖E‖. The price is 1 + (CG steps) EᴴE products per iteration, i.e.
 * coils × that many FFT pairs, against one pair per coil for the dual form.
 * Start x⁰ = Eᴴy, p⁰ = 0; stops after `iterations` or by the StoppingRule (iterate and objective).
 */
export function solveCsTvEncoding(
  operator: EncodingOperator<CoilSamples>,
  y: CoilSamples,
  lambdaAbs: number,
  iterations: number,
  tolerance: number,
  signal?: AbortSignal,
): CsTvEncodingResult {
  const setup = operatorSetup(operator, y, lambdaAbs, iterations, tolerance, signal);
  const { x, backProjection, objectiveAt } = setup;
  const prox = new NormalProxSolver(operator);
  const rhs = new Float64Array(x.data.length);
  // EᴴE x and EᴴE x_old: the data term ½‖Ex − y‖² of the objective the stopping rule compares.
  const normal = operator.normal(x).data;
  const normalOld = new Float64Array(x.data.length);
  const xd = x.data;
  let proxSteps = 0;
  const { iterations: run, rule } = runPrimalDual(xd, {
    ...setup.loop,
    primalStep: (div) => {
      normalOld.set(normal);
      // b = v + τEᴴy with v = x + τ div p; the warm start is the current x.
      for (let i = 0; i < xd.length; i++) rhs[i] = xd[i] + TV_STEP * div[i] + TV_STEP * backProjection[i];
      proxSteps += prox.solve(x, rhs, TV_STEP, PROX_TOLERANCE, PROX_MAX_STEPS);
      // (I + τEᴴE)x = rhs, so EᴴEx = (rhs − x)/τ to the CG tolerance: no extra product.
      for (let i = 0; i < xd.length; i++) normal[i] = (rhs[i] - xd[i]) / TV_STEP;
    },
    objectiveNow: () => objectiveAt(xd, normal),
    objectiveBefore: (xOld) => objectiveAt(xOld, normalOld),
  });
  return operatorResult(operator, x, y, lambdaAbs, run, rule, proxSteps);
}

/**
 * What both operator solvers start from: x⁰ = Eᴴy (also kept as Eᴴy for the data term), the
 * objective Φ(x) from x and EᴴEx (dataTermFromNormal, no forward product), and the loop settings.
 */
function operatorSetup(
  operator: EncodingOperator<CoilSamples>,
  y: CoilSamples,
  lambdaAbs: number,
  iterations: number,
  tolerance: number,
  signal: AbortSignal | undefined,
) {
  const { nx, ny } = operator.shapes;
  const x = operator.adjoint(y);
  const backProjection = x.data.slice();
  let halfDataNorm = 0;
  for (let i = 0; i < y.data.length; i++) halfDataNorm += 0.5 * y.data[i] * y.data[i];
  const objectiveAt = (image: Float64Array, normalImage: Float64Array) =>
    dataTermFromNormal(image, normalImage, backProjection, halfDataNorm) +
    lambdaAbs * totalVariation(image, nx, ny);
  const loop = { nx, ny, sigma: TV_STEP, lambdaTv: lambdaAbs, iterations, tolerance, signal };
  return { x, backProjection, objectiveAt, loop };
}

/** The result both operator solvers return, with the final objective from one forward product. */
function operatorResult(
  operator: EncodingOperator<CoilSamples>,
  x: ComplexImage,
  y: CoilSamples,
  lambdaAbs: number,
  iterations: number,
  rule: StoppingRule,
  proxSteps: number,
): CsTvEncodingResult {
  return {
    ...finalObjective(operator, x, y, lambdaAbs),
    image: x,
    iterations,
    relativeChange: rule.relativeChange,
    objectiveChange: rule.objectiveChange,
    proxSteps,
  };
}

/** ½‖E x − y‖² + λ·TV_iso(x) and the TV alone, from one forward product. */
function finalObjective(
  operator: EncodingOperator<CoilSamples>,
  x: ComplexImage,
  y: CoilSamples,
  lambdaAbs: number,
): { objective: number; tv: number } {
  const { nx, ny } = operator.shapes;
  const ex = operator.forward(x);
  let residual = 0;
  for (let i = 0; i < ex.data.length; i++) residual += (ex.data[i] - y.data[i]) ** 2;
  const tv = totalVariation(x.data, nx, ny);
  return { objective: 0.5 * residual + lambdaAbs * tv, tv };
}

/**
 * The same problem, min_x ½‖E x − y‖² + λ·TV_iso(x), with the data term linearised: the primal–dual
 * iteration of Condat (2013) and Vũ (2013) (docs/references.md §5.7), K = ∇, a gradient step on the
 * smooth data term in place of its proximal step:
 *   p ← proj_{‖·‖≤λ}(p + σ∇x̄),   x⁺ = x − τ(EᴴE x − Eᴴy − div p),   x̄ = 2x⁺ − x,
 * convergent when 1/τ − σ‖∇‖² ≥ L/2, L ≥ ‖EᴴE‖ (Condat 2013, Theorem 3.1); here σ = 0.99/√8 as in the
 * other solvers, ‖∇‖² ≤ 8 and τ = 0.99/(L/2 + 8σ). One EᴴE product per iteration (through a
 * Toeplitz kernel: one FFT pair of the doubled grid per coil, no gridding) instead of the 1 + CG
 * steps of solveCsTvEncoding; the fixed point is the same minimiser. `normBound` is L: an upper
 * bound of ‖EᴴE‖ such as NonCartesianEncoding.normalBound() (a guess below ‖EᴴE‖ may diverge).
 * Start x⁰ = Eᴴy, p⁰ = 0; stops after `iterations` or by the StoppingRule (iterate and objective:
 * Φ(x_{k−1}) comes from the EᴴE x_{k−1} the step used, Φ(x_k) costs one more product, asked only
 * once the iterate test passes).
 */
export function solveCsTvLinearised(
  operator: EncodingOperator<CoilSamples>,
  y: CoilSamples,
  lambdaAbs: number,
  iterations: number,
  tolerance: number,
  normBound: number,
  signal?: AbortSignal,
): CsTvEncodingResult {
  if (!(normBound > 0) || !Number.isFinite(normBound)) throw new RangeError('normBound must be positive');
  const tau = 0.99 / (normBound / 2 + 8 * TV_STEP);
  const setup = operatorSetup(operator, y, lambdaAbs, iterations, tolerance, signal);
  const { x, backProjection, objectiveAt } = setup;
  const normal = operator.createImage();
  const probe = operator.createImage();
  const xd = x.data;
  const nd = normal.data;
  const { iterations: run, rule } = runPrimalDual(xd, {
    ...setup.loop,
    primalStep: (div) => {
      operator.normal(x, normal);
      for (let i = 0; i < xd.length; i++) xd[i] -= tau * (nd[i] - backProjection[i] - div[i]);
    },
    objectiveNow: () => {
      operator.normal(x, probe);
      return objectiveAt(xd, probe.data);
    },
    objectiveBefore: (xOld) => objectiveAt(xOld, nd),
  });
  return operatorResult(operator, x, y, lambdaAbs, run, rule, 0);
}

/** Power-iteration steps of normalNormEstimate, and the margin its estimate is raised by. */
export const NORM_ESTIMATE_STEPS = 30;
export const NORM_ESTIMATE_MARGIN = 1.1;

/**
 * L for solveCsTvLinearised: the largest eigenvalue of EᴴE by power iteration (NORM_ESTIMATE_STEPS
 * products from a fixed smooth-plus-oscillating start), raised by NORM_ESTIMATE_MARGIN since power
 * iteration approaches it from below, and never above `bound` (a proven upper bound, when known).
 * The proven Toeplitz bound alone is several times ‖EᴴE‖ on radial data and would shrink τ as much.
 */
export function normalNormEstimate(operator: EncodingOperator<CoilSamples>, bound?: number): number {
  let v = operator.createImage();
  let w = operator.createImage();
  for (let i = 0; i < v.data.length; i++) v.data[i] = 1 + Math.sin(0.37 * i);
  let estimate = 0;
  for (let k = 0; k < NORM_ESTIMATE_STEPS; k++) {
    let vv = 0;
    for (const value of v.data) vv += value * value;
    operator.normal(v, w);
    let ww = 0;
    for (const value of w.data) ww += value * value;
    estimate = Math.sqrt(ww / vv);
    if (!(estimate > 0)) return bound ?? 1;
    [v, w] = [w, v];
  }
  const margined = NORM_ESTIMATE_MARGIN * estimate;
  return bound === undefined ? margined : Math.min(bound, margined);
}

/**
 * ½‖Ex − y‖² = ½⟨x, EᴴEx⟩ − Re⟨x, Eᴴy⟩ + ½‖y‖² from x, EᴴEx, Eᴴy and ½‖y‖² (interleaved real
 * arrays: the real inner product of the re/im pairs is Re⟨·,·⟩); never below 0 (rounding).
 */
export function dataTermFromNormal(
  x: Float64Array,
  normal: Float64Array,
  backProjection: Float64Array,
  halfDataNorm: number,
): number {
  let quadratic = 0;
  let cross = 0;
  for (let i = 0; i < x.length; i++) {
    quadratic += x[i] * normal[i];
    cross += x[i] * backProjection[i];
  }
  return Math.max(0, 0.5 * quadratic - cross + halfDataNorm);
}

/** max |Eᴴy|: the scale the relative λ multiplies. */
export function backProjectionPeak(operator: EncodingOperator<CoilSamples>, y: CoilSamples): number {
  const data = operator.adjoint(y).data;
  let peak = 0;
  for (let i = 0; i < data.length; i += 2) peak = Math.max(peak, Math.hypot(data[i], data[i + 1]));
  return peak;
}
