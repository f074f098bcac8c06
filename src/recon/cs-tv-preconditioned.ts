import type { ComplexImage } from '../core/complex-image.ts';
import { throwIfAborted } from '../core/errors.ts';
import { dcFirstOrder, dcFirstSpectrum, plainFft2d } from '../core/plain-fft-2d.ts';
import type { CsTvResult } from './cs-tv-encoding.ts';
import type { ReconInput } from './method.ts';
import { StoppingRule } from './stopping-rule.ts';
import { relaxedTvDualPass, totalVariation } from './total-variation.ts';

/**
 * σ = SIGMA_PER_LAMBDA · λ_rel: the dual step, which is also the weight of the primal metric (the
 * penalty of the ADMM this scheme approaches). Measured on the modified phantom (128², Poisson-disc
 * R = 4, λ_rel 0.0015 / 0.006 / 0.025): the fewest iterations to 1e-4 of the optimal objective came
 * at σ ≈ 0.1–0.3 / 0.6–1 / 1–2, i.e. σ ≈ 100·λ_rel.
 */
export const SIGMA_PER_LAMBDA = 100;
/** σ never below this (λ = 0 keeps the zero-filled start whatever σ; the floor keeps T⁻¹ sane). */
export const SIGMA_FLOOR = 0.01;
/** δ = DELTA_PER_SIGMA · σ: the identity share of the metric, so T⁻¹ is positive definite at DC. */
export const DELTA_PER_SIGMA = 1e-3;

/**
 * ρ of the relaxed iteration (x, p) ← ρ(x̃, p̃) + (1 − ρ)(x, p), convergent for ρ ∈ (0, 2) (a
 * relaxed proximal-point step in the metric of the primal–dual iteration; He & Yuan 2012,
 * Chambolle & Pock 2016). 1.8 measured at 256², Poisson-disc R 4, default λ: fewer iterations to
 * the default stop than 1.5 at a gap to the minimum no larger, on the modified phantom and a brain
 * slice (docs/design.md §3.13); near 1.9 the count turns erratic.
 */
export const RELAXATION = 1.8;

/** The dual step of a run with relative TV weight λ_rel. */
export function preconditionedSigma(lambdaRelative: number): number {
  return Math.max(SIGMA_FLOOR, SIGMA_PER_LAMBDA * lambdaRelative);
}

export interface PreconditionedOptions {
  /** Dual step σ (preconditionedSigma of the run's λ_rel). */
  sigma: number;
  signal?: AbortSignal;
  /** Relaxation ρ ∈ (0, 2) of both halves (RELAXATION when not given; 1 = none). */
  relaxation?: number;
  /** Called with Φ(x_k) after every iteration (objective histories; costs one TV pass each). */
  recordObjective?: (objective: number) => void;
}

/**
 * min_x ½‖M F_c x − y‖² + λ·TV_iso(x) (the objective of the plain solver, same ∇ with Neumann
 * boundaries) by the primal–dual method of Chambolle & Pock 2011 with a non-scalar primal step
 * T in place of τI — the preconditioned form whose convergence needs T, Σ symmetric positive
 * definite and ‖Σ^½ K T^½‖ < 1, i.e. T⁻¹ − KᴴΣK ≻ 0 (Pock & Chambolle 2011; docs/references.md §5.2b):
 *   Σ = σI,  T⁻¹ = σ∇ₚᴴ∇ₚ + δI,  ∇ₚ the periodic forward differences.
 * Our Neumann ∇ is ∇ₚ without its wrap-around rows, so ∇ᴴ∇ ⪯ ∇ₚᴴ∇ₚ and T⁻¹ − σ∇ᴴ∇ ⪰ δI ≻ 0. ∇ₚᴴ∇ₚ is
 * circulant, hence diagonal under F_c with eigenvalue 4sin²(πu/nx) + 4sin²(πv/ny) at frequency
 * (u, v), and the primal step (T⁻¹ + FᴴMF)x = T⁻¹x_k + div p + FᴴMy is one division per k-space
 * sample:  X = (F_c div p + t·X_k + M y) / (M + t),  t = σ(4sin²(πu/nx) + 4sin²(πv/ny)) + δ.
 * With δ → 0 this is ADMM on z = ∇x up to the wrap rows (Chambolle & Pock 2011, their section on
 * ADMM): low frequencies the mask misses take large steps, which a scalar τ ≤ 1/(σ‖∇‖²) cannot.
 * Both halves are relaxed by ρ (RELAXATION), primal half first:
 *   x̃ = (T⁻¹ + ∂G)⁻¹(T⁻¹x_k + div p_k),  p̃ = proj_{‖·‖≤λ}(p_k + σ∇(2x̃ − x_k)),
 *   (x_{k+1}, p_{k+1}) = ρ(x̃, p̃) + (1 − ρ)(x_k, p_k).
 * Per iteration: the DFT of div p_k; one k-space pass (x̃'s spectrum, mirrored and scaled so that
 * a forward DFT inverts it, the relaxed spectrum X kept, the data residual); that DFT to x̃; one image pass (relaxedTvDualPass: x̄ on the fly, dual ascent,
 * projection, relaxation of p and x, div p, the iterate change). No copies, no allocation. Start
 * x⁰ = F_cᴴ(M y), p⁰ = proj(σ∇x⁰); stops after `iterations` or by the StoppingRule, whose objective
 * takes the data term from the k-space pass and TV only when the iterate test passes (the returned
 * objective too: no transform after the loop).
 * The loop never centres: the image stays in natural order and k-space DC first,
 * on the un-centred plainFft2d; by the shift theorem this is the F_c iteration above exactly
 * (docs/design.md §3.13; tests/recon/cs-tv-preconditioned-layout.test.ts).
 */
export function solveCsTvPreconditioned(
  input: ReconInput,
  lambdaAbs: number,
  iterations: number,
  tolerance: number,
  options: PreconditionedOptions,
): CsTvResult {
  const { nx, ny } = input.kspace;
  const n = nx * ny;
  const { sigma, signal } = options;
  const rho = options.relaxation ?? RELAXATION;
  const delta = DELTA_PER_SIGMA * sigma;
  // The loop runs in DC-first k-space with the un-centred DFT (uncentredProblem): Y = √N·(M y),
  // X = √N·F x_k kept across iterations, x⁰ = Fᴴ(M y).
  const { mask, data } = uncentredProblem(input);
  const X = data.slice();
  // √N·F div p (DC first, ny rows of nx), and the primal step's spectrum X̃/N mirrored, whose
  // forward DFT is x̃ (F⁻¹X = (1/N)·F(X[−v, −u])): the inverse runs as a plain forward transform.
  const spectrum = new Float64Array(2 * n);
  const mirrored = new Float64Array(2 * n);
  let current: ComplexImage = { nx, ny, data: new Float64Array(2 * n) };
  inverseSpectrum(current.data, X, nx, ny);
  let next: ComplexImage = { nx, ny, data: new Float64Array(2 * n) };
  // div p.
  const work = new Float64Array(2 * n);
  const px = new Float64Array(2 * n);
  const py = new Float64Array(2 * n);
  const eigenX = laplacianEigenvalues(nx);
  const eigenY = laplacianEigenvalues(ny);
  const gain = metricGain(mask, eigenX, eigenY, sigma, delta);
  const metric: Metric = { eigenX, eigenY, sigma, delta, rho, gain, mirrorColumn: mirrorOffsets(nx) };
  // p⁰ = proj(σ∇x⁰), not 0: from p = 0 the first primal step would return x⁰ itself (x⁰ already
  // fits the data and div 0 = 0) and the stopping rule would see no change.
  next.data.set(current.data);
  relaxedTvDualPass(work, px, py, next.data, current.data, nx, ny, sigma, lambdaAbs, 1);
  const rule = new StoppingRule(tolerance);
  // ½‖M F x − y‖² of x_k and x_{k−1}: x⁰ fits the data exactly.
  let residual = 0;
  let residualBefore = 0;
  // TV of x_k when Φ(x_k) was measured at the last iteration run (NaN otherwise).
  let tvNow = Number.NaN;
  const now = () => {
    tvNow = totalVariation(current.data, nx, ny);
    return residual + lambdaAbs * tvNow;
  };
  const before = () => residualBefore + lambdaAbs * totalVariation(next.data, nx, ny);
  let run = 0;
  for (let it = 0; it < iterations; it++) {
    throwIfAborted(signal);
    plainFft2d(spectrum, work, ny, nx, 1, false);
    residualBefore = residual;
    residual = primalSpectrum(X, spectrum, mirrored, data, mask, metric) / n;
    plainFft2d(next.data, mirrored, ny, nx, 1, false);
    // `next` holds x̃; the pass turns it into x_{k+1} = ρx̃ + (1 − ρ)x_k, `current` keeps x_k.
    const change = relaxedTvDualPass(work, px, py, next.data, current.data, nx, ny, sigma, lambdaAbs, rho);
    [current, next] = [next, current];
    run = it + 1;
    tvNow = Number.NaN;
    let objective: number | undefined;
    const measured = () => {
      objective ??= now();
      return objective;
    };
    options.recordObjective?.(measured());
    if (rule.converged(change, measured, before)) break;
  }
  // X is the spectrum of the returned image and `residual` its data term (x⁰ fits the data when
  // no iteration ran); TV is reused when the stop just measured it.
  const tv = Number.isNaN(tvNow) ? totalVariation(current.data, nx, ny) : tvNow;
  return {
    image: current,
    iterations: run,
    objective: residual + lambdaAbs * tv,
    relativeChange: rule.relativeChange,
    objectiveChange: rule.objectiveChange,
    tv,
  };
}

/** x = Fᴴ X into `target` (ny×nx) from √N·X in DC-first order (ny×nx). */
function inverseSpectrum(target: Float64Array, spectrum: Float64Array, nx: number, ny: number): void {
  plainFft2d(target, spectrum, ny, nx, 1 / (nx * ny), true);
}

/** The metric's diagonal (eigenvalues per axis, σ, δ) and the relaxation ρ. */
interface Metric {
  eigenX: Float64Array;
  eigenY: Float64Array;
  sigma: number;
  delta: number;
  rho: number;
  /** 1/(M + t) per sample. */
  gain: Float64Array;
  /** 2·((nx − u) mod nx): the interleaved offset of column −u. */
  mirrorColumn: Int32Array;
}

function mirrorOffsets(n: number): Int32Array {
  return Int32Array.from({ length: n }, (_, u) => 2 * ((n - u) % n));
}

/** 4sin²(πu/n): the periodic second difference's eigenvalue at DC-first index u. */
function laplacianEigenvalues(n: number): Float64Array {
  return Float64Array.from({ length: n }, (_, u) => 4 * Math.sin((Math.PI * u) / n) ** 2);
}

/**
 * The problem in the loop's order and units: the mask in DC-first order and Y = √N·(M y) as the
 * un-centred DFT's spectrum (dcFirstSpectrum), so the loop runs on plainFft2d without centring
 * shifts or normalisation passes; ½‖M F x − y‖² = ½‖M(√N·F x) − Y‖²/N.
 */
function uncentredProblem(input: ReconInput): { mask: Uint8Array; data: Float64Array } {
  const { kspace, mask } = input;
  const { nx, ny } = kspace;
  return {
    mask: dcFirstOrder(mask, nx, ny),
    data: dcFirstSpectrum(kspace.data, nx, ny, Math.sqrt(nx * ny), mask),
  };
}

/**
 * The primal half in k-space (DC-first: row v, column u; all spectra √N·F of their
 * images): X̃ = (D + t·X + M y)·g from D = √N·F div p, with t = σ(λ_u + λ_v) + δ and
 * g = 1/(M + t) from `metric.gain`, written as X̃/N at (−v, −u) into `out` (whose forward DFT is
 * then x̃), and X ← ρX̃ + (1 − ρ)X, the spectrum of x_{k+1}; returns ½‖M X − y‖² of the new X
 * (N times the data term). Branch-free: y is zero off the mask.
 */
function primalSpectrum(
  X: Float64Array,
  D: Float64Array,
  out: Float64Array,
  y: Float64Array,
  mask: Uint8Array,
  metric: Metric,
): number {
  const { eigenX, eigenY, sigma, delta, rho, gain, mirrorColumn } = metric;
  const keep = 1 - rho;
  const inverseN = 1 / (eigenX.length * eigenY.length);
  // Row v (eigenY), column u (eigenX).
  const rows = eigenY.length;
  const columns = eigenX.length;
  let residual = 0;
  for (let r = 0; r < rows; r++) {
    const rowShare = sigma * eigenY[r] + delta;
    const mirroredRow = 2 * ((rows - r) % rows) * columns;
    for (let c = 0, i = r * columns, k = 2 * r * columns; c < columns; c++, i++, k += 2) {
      const t = rowShare + sigma * eigenX[c];
      const g = gain[i];
      const xr = X[k];
      const xi = X[k + 1];
      const yr = y[k];
      const yi = y[k + 1];
      const tr = (D[k] + t * xr + yr) * g;
      const ti = (D[k + 1] + t * xi + yi) * g;
      const m = mirroredRow + mirrorColumn[c];
      out[m] = tr * inverseN;
      out[m + 1] = ti * inverseN;
      const nr = rho * tr + keep * xr;
      const ni = rho * ti + keep * xi;
      X[k] = nr;
      X[k + 1] = ni;
      const a = nr - yr;
      const b = ni - yi;
      residual += mask[i] * (a * a + b * b);
    }
  }
  return 0.5 * residual;
}

/** g = 1/(M + t) per k-space sample (DC first: row v, column u), t = σ(λ_u + λ_v) + δ. */
function metricGain(
  mask: Uint8Array,
  eigenX: Float64Array,
  eigenY: Float64Array,
  sigma: number,
  delta: number,
): Float64Array {
  const columns = eigenX.length;
  const gain = new Float64Array(mask.length);
  for (let r = 0; r < eigenY.length; r++) {
    for (let c = 0; c < columns; c++) {
      const i = r * columns + c;
      gain[i] = 1 / (mask[i] + sigma * (eigenY[r] + eigenX[c]) + delta);
    }
  }
  return gain;
}
