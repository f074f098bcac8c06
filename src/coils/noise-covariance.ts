import { choleskyLower, solveLower } from '../core/complex-cholesky.ts';
import { addProducts } from '../core/complex-matrix.ts';
import { ValidationError } from '../core/errors.ts';
import type { SeededRandom } from '../core/random.ts';
import type { MultiCoilArray } from '../encoding/index.ts';

/**
 * Ψ for coils on a ring whose noise correlates only with the two neighbours: Ψ_cc = 1,
 * Ψ_c,c±1 (mod C) = ρ, zero otherwise (C = 2: the one pair; C = 1: [1]). Interleaved complex C×C.
 */
export function ringNoiseCovariance(coils: number, correlation: number): Float64Array {
  const psi = new Float64Array(2 * coils * coils);
  for (let c = 0; c < coils; c++) {
    psi[2 * (c * coils + c)] = 1;
    if (coils === 1) continue;
    for (const d of [coils - 1, 1]) {
      const k = (c + d) % coils;
      if (k !== c) psi[2 * (c * coils + k)] = correlation;
    }
  }
  return psi;
}

/** The open range of ρ for which the ring covariance is positive definite (its eigenvalues 1 + 2ρ·cos(2πk/C)). */
export function ringCorrelationRange(coils: number): [number, number] {
  if (coils === 1) return [Number.NEGATIVE_INFINITY, Number.POSITIVE_INFINITY];
  if (coils === 2) return [-1, 1];
  let minCos = 1;
  for (let k = 0; k < coils; k++) minCos = Math.min(minCos, Math.cos((2 * Math.PI * k) / coils));
  return [-0.5, -1 / (2 * minCos)];
}

/**
 * Receiver noise correlated across coils with covariance 2σ²·Ψ per complex sample (σ per real
 * channel, as the single-coil acquisition defines it; Ψ Hermitian positive definite, unit diagonal
 * for equal coil noise). Ψ = L·Lᴴ (Cholesky): noise is drawn as n = σ·L·z with z standard complex
 * normal (independent N(0, 1) real and imaginary parts), so E[n·nᴴ] = 2σ²·L·Lᴴ; prewhitening
 * multiplies data and maps by L⁻¹ so the noise becomes white and SENSE with Ψ = I applies
 * (Pruessmann, Weiger, Scheidegger & Boesiger 1999; Roemer et al. 1990 for the covariance).
 */
export class CoilNoise {
  readonly coils: number;
  readonly covariance: Float64Array;
  /** Cholesky factor of Ψ, interleaved complex, lower triangular. */
  readonly lower: Float64Array;
  private readonly vector: Float64Array;

  constructor(covariance: Float64Array, coils: number, field = 'coils.noiseCovariance') {
    if (!Number.isInteger(coils) || coils < 1 || covariance.length !== 2 * coils * coils) {
      throw new ValidationError({
        field,
        message: `must be a ${coils}×${coils} complex matrix`,
        allowed: 'coils × coils',
      });
    }
    for (let i = 0; i < coils; i++) {
      for (let j = 0; j < coils; j++) {
        const a = 2 * (i * coils + j);
        const b = 2 * (j * coils + i);
        const scale = Math.abs(covariance[a]) + Math.abs(covariance[a + 1]) + 1e-300;
        const asymmetry =
          Math.abs(covariance[a] - covariance[b]) + Math.abs(covariance[a + 1] + covariance[b + 1]);
        if (
          !Number.isFinite(covariance[a]) ||
          !Number.isFinite(covariance[a + 1]) ||
          asymmetry > 1e-12 * scale
        ) {
          throw new ValidationError({
            field: `${field}.${i}.${j}`,
            message: 'the covariance must be a finite Hermitian matrix (Ψ_ij = conj Ψ_ji)',
            allowed: 'Hermitian positive definite',
          });
        }
      }
    }
    this.coils = coils;
    this.covariance = covariance;
    this.lower = new Float64Array(covariance.length);
    const failed = choleskyLower(covariance, coils, this.lower);
    if (failed >= 0) {
      throw new ValidationError({
        field,
        message: `the covariance is not positive definite (Cholesky pivot ${failed} not positive)`,
        allowed: 'Hermitian positive definite',
      });
    }
    this.vector = new Float64Array(2 * coils);
  }

  /** Ψ of coils on a ring with neighbour correlation ρ; refuses ρ outside the positive-definite range. */
  static ring(coils: number, correlation: number, field = 'coils.correlation'): CoilNoise {
    const [low, high] = ringCorrelationRange(coils);
    if (!Number.isFinite(correlation) || !(correlation > low && correlation < high)) {
      throw new ValidationError({
        field,
        message: `${correlation} makes the ${coils}-coil noise covariance not positive definite`,
        allowed: `${low} < correlation < ${Number(high.toPrecision(6))}`,
      });
    }
    return new CoilNoise(ringNoiseCovariance(coils, correlation), coils, field);
  }

  /** Adds σ·L·z to every sample of `target` (coil-major); draws coil by coil at each sample, in sample order. */
  addNoise(target: MultiCoilArray, sigma: number, random: SeededRandom): void {
    const { coils, lower, vector } = this;
    this.checkCoils(target);
    const n = target.nx * target.ny;
    const d = target.data;
    const lz = new Float64Array(2);
    for (let i = 0; i < n; i++) {
      for (let k = 0; k < 2 * coils; k++) vector[k] = random.normal();
      for (let c = 0; c < coils; c++) {
        // (L·z)_c = Σ_{k ≤ c} l_ck·z_k
        lz.fill(0);
        addProducts(lz, 1, lower, c * coils, 1, vector, 0, 1, c + 1);
        d[2 * (c * n + i)] += sigma * lz[0];
        d[2 * (c * n + i) + 1] += sigma * lz[1];
      }
    }
  }

  /** target ← L⁻¹·target at every sample (k-space data or sensitivity maps alike), in place. */
  prewhiten(target: MultiCoilArray): void {
    const { coils, lower, vector } = this;
    this.checkCoils(target);
    const n = target.nx * target.ny;
    const samples = strided(target.data, n);
    for (let i = 0; i < n; i++) {
      samples.gather(vector, i, coils);
      solveLower(lower, coils, vector);
      samples.scatter(vector, i, coils);
    }
  }

  private checkCoils(target: MultiCoilArray): void {
    if (target.coils !== this.coils) {
      throw new RangeError(`data has ${target.coils} coils, the noise model ${this.coils}`);
    }
  }
}

/** The coil vector of sample i in coil-major data (n samples per coil): copied out, or back in. */
function strided(data: Float64Array, n: number) {
  return {
    gather(vector: Float64Array, i: number, coils: number): void {
      for (let c = 0; c < coils; c++) {
        vector[2 * c] = data[2 * (c * n + i)];
        vector[2 * c + 1] = data[2 * (c * n + i) + 1];
      }
    },
    scatter(vector: Float64Array, i: number, coils: number): void {
      for (let c = 0; c < coils; c++) {
        data[2 * (c * n + i)] = vector[2 * c];
        data[2 * (c * n + i) + 1] = vector[2 * c + 1];
      }
    },
  };
}
