import { throwIfAborted } from '../core/errors.ts';
import { extrapolate } from './primal-extrapolation.ts';
import { StoppingRule } from './stopping-rule.ts';
import { tvDualAscent } from './total-variation.ts';

/** τ = σ with K = ∇: τσ‖∇‖² < 1 with ‖∇‖² ≤ 8 (Chambolle 2004; Chambolle & Pock 2011). */
export const TV_STEP = 0.99 / Math.sqrt(8);
/** τ = σ with K = (∇, W): ‖K‖² ≤ ‖∇‖² + ‖W‖² ≤ 8 + 1 for the orthonormal W (Chambolle & Pock 2011). */
export const TV_WAVELET_STEP = 0.99 / 3;

/**
 * What one Chambolle–Pock solver with a TV dual (K = ∇, or K = (∇, W) with the wavelet dual) adds to
 * the shared loop: the primal step, its extra dual step if any, and the objective for the stop.
 */
export interface PrimalDualSteps {
  nx: number;
  ny: number;
  /** Dual step size σ of the TV ascent. */
  sigma: number;
  /** Radius of the TV dual ball (the absolute TV weight). */
  lambdaTv: number;
  iterations: number;
  /** StoppingRule tolerance; 0 runs every iteration. */
  tolerance: number;
  signal?: AbortSignal;
  /** Further dual steps at x̄ after the TV ascent (the wavelet's q). */
  dualStep?: (xBar: Float64Array) => void;
  /** x ← prox_τG(x + τ div p − …) in place; `xOld` already holds x before the step. */
  primalStep: (div: Float64Array, xOld: Float64Array) => void;
  /** Φ at the new iterate; asked at most once an iteration, and only once the iterate test passes. */
  objectiveNow: () => number;
  /** Φ at the iterate before the step (held in xOld). */
  objectiveBefore: (xOld: Float64Array) => number;
  /** Called with Φ after every iteration (objective histories); forces the objective each time. */
  recordObjective?: (objective: number) => void;
}

/**
 * The first-order primal–dual iteration of Chambolle & Pock 2011 (θ = 1) shared by the cs-tv and
 * cs-wavelet solvers: TV dual ascent (and `dualStep`) at x̄, the solver's primal step, then
 * x̄ = 2x − x_old, stopping after `iterations` or by the StoppingRule. `x` is updated in place
 * (start value in, minimiser out); x̄ starts at x, the duals at 0.
 */
export function runPrimalDual(
  x: Float64Array,
  steps: PrimalDualSteps,
): { iterations: number; rule: StoppingRule } {
  const { nx, ny, sigma, lambdaTv, signal } = steps;
  const size = x.length;
  const xOld = new Float64Array(size);
  const xBar = x.slice();
  const px = new Float64Array(size);
  const py = new Float64Array(size);
  const div = new Float64Array(size);
  const rule = new StoppingRule(steps.tolerance);
  const before = () => steps.objectiveBefore(xOld);
  let run = 0;
  for (let it = 0; it < steps.iterations; it++) {
    throwIfAborted(signal);
    // Dual ascent and projection onto the λ-ball per pixel (isotropic over both directions and re/im).
    tvDualAscent(div, px, py, xBar, nx, ny, sigma, lambdaTv);
    steps.dualStep?.(xBar);
    xOld.set(x);
    steps.primalStep(div, xOld);
    const change = extrapolate(xBar, x, xOld);
    run = it + 1;
    let objective: number | undefined;
    const now = () => {
      objective ??= steps.objectiveNow();
      return objective;
    };
    if (steps.recordObjective) steps.recordObjective(now());
    if (rule.converged(change, now, before)) break;
  }
  return { iterations: run, rule };
}
