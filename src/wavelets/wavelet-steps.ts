import type { SeededRandom } from '../core/random.ts';
import { circularShift, randomShift } from './cycle-spin.ts';
import type { WaveletFilters } from './daubechies-filters.ts';
import { forwardDwt2, inverseDwt2 } from './dwt2.ts';
import { detailL1, softThresholdDetails } from './soft-threshold.ts';

/**
 * The two wavelet steps the ℓ1-wavelet solvers take, on interleaved complex ny×nx images, with
 * their scratch arrays kept between calls (not re-entrant):
 * - `shrink`: the prox of t‖Ψ S ·‖₁, i.e. Sᴴ Wᴴ soft(W S v, t) (detail bands only), with S a fresh
 *   random circular shift per call when `rng` is given (cycle spinning), else S = I;
 * - `dualStep`: q ← proj_{|q| ≤ λ}(q + σ W x̄) per detail coefficient (q = 0 on the approximation,
 *   which is not penalised), then Wᴴq, for primal–dual schemes with K ∋ W.
 */
export class WaveletSteps {
  private readonly coefficients: Float64Array;
  private readonly shifted: Float64Array;

  constructor(
    readonly nx: number,
    readonly ny: number,
    readonly filters: WaveletFilters,
    readonly levels: number,
  ) {
    this.coefficients = new Float64Array(2 * nx * ny);
    this.shifted = new Float64Array(2 * nx * ny);
  }

  /** target ← prox; returns Σ|c| of the shrunk detail coefficients (the ℓ1 term at the result). */
  shrink(target: Float64Array, source: Float64Array, threshold: number, rng: SeededRandom | null): number {
    const { nx, ny, filters, levels, coefficients, shifted } = this;
    if (!rng) {
      forwardDwt2(coefficients, source, nx, ny, filters, levels);
      const l1 = softThresholdDetails(coefficients, nx, ny, levels, threshold);
      inverseDwt2(target, coefficients, nx, ny, filters, levels);
      return l1;
    }
    const { dy, dx } = randomShift(rng, levels);
    circularShift(shifted, source, nx, ny, dy, dx);
    forwardDwt2(coefficients, shifted, nx, ny, filters, levels);
    const l1 = softThresholdDetails(coefficients, nx, ny, levels, threshold);
    inverseDwt2(shifted, coefficients, nx, ny, filters, levels);
    circularShift(target, shifted, nx, ny, -dy, -dx);
    return l1;
  }

  /** ‖Ψx‖₁: Σ|c| over the detail bands of W x (unshifted). */
  detailL1(x: Float64Array): number {
    const { nx, ny, filters, levels, coefficients } = this;
    forwardDwt2(coefficients, x, nx, ny, filters, levels);
    return detailL1(coefficients, nx, ny, levels);
  }

  /** q ← proj(q + σ W x̄); `back` ← Wᴴ q. */
  dualStep(q: Float64Array, back: Float64Array, xBar: Float64Array, sigma: number, lambda: number): void {
    const { nx, ny, filters, levels, coefficients } = this;
    forwardDwt2(coefficients, xBar, nx, ny, filters, levels);
    const h0 = ny >> levels;
    const w0 = nx >> levels;
    const lambda2 = lambda * lambda;
    for (let row = 0; row < ny; row++) {
      for (let col = row < h0 ? w0 : 0; col < nx; col++) {
        const k = 2 * (row * nx + col);
        const a = q[k] + sigma * coefficients[k];
        const b = q[k + 1] + sigma * coefficients[k + 1];
        const s = a * a + b * b;
        const scale = s > lambda2 ? lambda / Math.sqrt(s) : 1;
        q[k] = a * scale;
        q[k + 1] = b * scale;
      }
    }
    inverseDwt2(back, q, nx, ny, filters, levels);
  }
}
