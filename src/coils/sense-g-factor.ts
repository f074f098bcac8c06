import { choleskyLower, hermitianInverseFromCholesky, solveLower } from '../core/complex-cholesky.ts';
import { adjoint, multiplyInto, rowMajor } from '../core/complex-matrix.ts';
import { ValidationError } from '../core/errors.ts';
import type { CoilMaps } from '../encoding/index.ts';

/**
 * SENSE g-factor (Pruessmann, Weiger, Scheidegger & Boesiger 1999): for the R pixels folded onto one
 * another, with S the C×R matrix of their sensitivities (rows = coils, columns = pixels) and Ψ the
 * receiver noise covariance,
 *   g_ρ = √( [(Sᴴ Ψ⁻¹ S)⁻¹]_ρρ · [Sᴴ Ψ⁻¹ S]_ρρ ) ≥ 1.
 * Ψ enters through its Cholesky factor L (Ψ = L·Lᴴ): with S′ = L⁻¹S, SᴴΨ⁻¹S = S′ᴴS′.
 */
export class SenseFoldSolver {
  readonly coils: number;
  readonly pixels: number;
  private readonly whitened: Float64Array;
  private readonly column: Float64Array;
  private readonly gram: Float64Array;
  private readonly factor: Float64Array;
  private readonly inverse: Float64Array;
  private readonly scratch: Float64Array;

  /** `noiseLower`: the Cholesky factor of Ψ (C×C interleaved), or undefined for Ψ = I. */
  constructor(
    coils: number,
    pixels: number,
    private readonly noiseLower?: Float64Array,
  ) {
    if (noiseLower && noiseLower.length !== 2 * coils * coils) {
      throw new RangeError(`noiseLower must be ${coils}×${coils} complex`);
    }
    this.coils = coils;
    this.pixels = pixels;
    this.whitened = new Float64Array(2 * coils * pixels);
    this.column = new Float64Array(2 * coils);
    this.gram = new Float64Array(2 * pixels * pixels);
    this.factor = new Float64Array(2 * pixels * pixels);
    this.inverse = new Float64Array(2 * pixels * pixels);
    this.scratch = new Float64Array(2 * pixels * pixels);
  }

  /**
   * g of each of the `pixels` columns of S (interleaved row-major C×R) into `out`. Returns false when
   * SᴴΨ⁻¹S is singular (relative Cholesky pivot ≤ 1e-12): the pixels cannot be unfolded, g = ∞.
   */
  gFactors(s: Float64Array, out: Float64Array): boolean {
    const { coils: C, pixels: R, whitened, column, gram, factor, inverse } = this;
    for (let r = 0; r < R; r++) {
      for (let c = 0; c < C; c++) {
        column[2 * c] = s[2 * (c * R + r)];
        column[2 * c + 1] = s[2 * (c * R + r) + 1];
      }
      if (this.noiseLower) solveLower(this.noiseLower, C, column);
      for (let c = 0; c < C; c++) {
        whitened[2 * (c * R + r)] = column[2 * c];
        whitened[2 * (c * R + r) + 1] = column[2 * c + 1];
      }
    }
    // SᴴΨ⁻¹S = S′ᴴ·S′
    multiplyInto(rowMajor(gram, R), adjoint(rowMajor(whitened, R)), rowMajor(whitened, R), R, C, R);
    if (R === 1) {
      // One pixel per fold: (SᴴΨ⁻¹S)⁻¹·(SᴴΨ⁻¹S) = 1 identically, so g = 1 exactly unless S′ = 0.
      if (!(gram[0] > 0)) return false;
      out[0] = 1;
      return true;
    }
    if (choleskyLower(gram, R, factor) >= 0) return false;
    hermitianInverseFromCholesky(factor, R, inverse, this.scratch);
    for (let r = 0; r < R; r++) {
      out[r] = Math.sqrt(inverse[2 * (r * R + r)] * gram[2 * (r * R + r)]);
    }
    return true;
  }
}

export interface GFactorMapOptions {
  /** Cholesky factor of the noise covariance Ψ (CoilNoise.lower); Ψ = I when absent. */
  noiseLower?: Float64Array;
  /** Pixels that enter the unfolding (1 = inside); others are left out of each fold and get g = 0. */
  support?: Uint8Array;
  /** Field named in errors about the maps (default "coils"). */
  field?: string;
  /** Field named in errors about R (default "sampling.acceleration"). */
  accelerationField?: string;
}

/**
 * The analytic SENSE g-factor map for uniform Cartesian undersampling: every R-th phase-encode row
 * (rows of the k-space grid, along ky) is acquired, so image row i folds onto rows i + k·ny/R
 * (mod ny), k = 0…R−1, in every column. Which R-th rows are kept only changes the fold's phases,
 * not g. Needs an integer R that divides ny and is at most the coil count. Pixels outside `support`
 * are left out of their folds (SENSE's reduced unfolding) and get g = 0.
 */
export function senseGFactorMap(
  maps: CoilMaps,
  acceleration: number,
  options: GFactorMapOptions = {},
): Float64Array {
  const { coils, nx, ny } = maps;
  const field = options.field ?? 'coils';
  const rField = options.accelerationField ?? 'sampling.acceleration';
  const R = acceleration;
  if (!Number.isInteger(R) || R < 1 || ny % R !== 0 || R > coils) {
    throw new ValidationError({
      field: rField,
      message: `the analytic g-factor needs an integer R that divides ny = ${ny} and is at most the ${coils} coils, got ${R}`,
      allowed: `integer divisors of ${ny} from 1 to ${Math.min(coils, ny)}`,
    });
  }
  const { support } = options;
  if (support && support.length !== nx * ny)
    throw new RangeError(`support must hold ny·nx = ${nx * ny} entries`);
  const n = nx * ny;
  const step = ny / R;
  const g = new Float64Array(n);
  const solvers: SenseFoldSolver[] = [];
  for (let r = 1; r <= R; r++) solvers.push(new SenseFoldSolver(coils, r, options.noiseLower));
  const s = new Float64Array(2 * coils * R);
  const rows = new Int32Array(R);
  const values = new Float64Array(R);
  for (let i0 = 0; i0 < step; i0++) {
    for (let j = 0; j < nx; j++) {
      let count = 0;
      for (let k = 0; k < R; k++) {
        const i = i0 + k * step;
        if (!support || support[i * nx + j]) rows[count++] = i;
      }
      if (count === 0) continue;
      for (let c = 0; c < coils; c++) {
        for (let k = 0; k < count; k++) {
          const at = 2 * (c * n + rows[k] * nx + j);
          s[2 * (c * count + k)] = maps.data[at];
          s[2 * (c * count + k) + 1] = maps.data[at + 1];
        }
      }
      if (!solvers[count - 1].gFactors(s, values)) {
        const folded = Array.from(rows.subarray(0, count)).join(', ');
        throw new ValidationError({
          field,
          message: `the sensitivities of the pixels folded together in column ${j}, rows ${folded}, are linearly dependent (SᴴΨ⁻¹S is singular), so SENSE cannot unfold them at R = ${R}: g is unbounded`,
          allowed: 'coil maps that differ across each fold (distinct, not identical or proportional)',
        });
      }
      for (let k = 0; k < count; k++) g[rows[k] * nx + j] = values[k];
    }
  }
  return g;
}

export interface GFactorSummary {
  mean: number;
  /** 95th percentile, linear interpolation between order statistics (numpy's default). */
  p95: number;
  max: number;
}

/** mean, p95 and max of g over the pixels of `mask` (1 = object). */
export function summariseGFactor(g: Float64Array, mask: Uint8Array, field = 'objectMask'): GFactorSummary {
  if (mask.length !== g.length)
    throw new RangeError(`mask must hold ${g.length} entries, got ${mask.length}`);
  let count = 0;
  for (let i = 0; i < g.length; i++) if (mask[i]) count++;
  if (count === 0) {
    throw new ValidationError({ field, message: 'the object mask is empty', allowed: 'at least one pixel' });
  }
  const sorted = new Float64Array(count);
  for (let i = 0, k = 0; i < g.length; i++) if (mask[i]) sorted[k++] = g[i];
  sorted.sort();
  let sum = 0;
  for (const v of sorted) sum += v;
  const rank = 0.95 * (sorted.length - 1);
  const lo = Math.floor(rank);
  const hi = Math.min(lo + 1, sorted.length - 1);
  const p95 = sorted[lo] + (rank - lo) * (sorted[hi] - sorted[lo]);
  return { mean: sum / sorted.length, p95, max: sorted[sorted.length - 1] };
}
