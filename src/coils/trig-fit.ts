import { multiplyInto, rowMajor, transposed } from '../core/complex-matrix.ts';
import { ValidationError } from '../core/errors.ts';
import { type CoilMaps, createMultiCoilArray } from '../encoding/index.ts';
import { pixelX, pixelY } from '../phantoms/index.ts';
import { pseudoInverse } from './complex-pseudo-inverse.ts';

/**
 * Each coil's sensitivity as a low-order 2D trigonometric polynomial over the field of view,
 *   S_c(x, y) ≈ Σ_{p,q = −P..P} a_{c,q,p} · e^(i2π(p·x + q·y)/T),     T = 2L (phantom units),
 * so that the coil image S_c·f of an analytic phantom f has the exact transform
 * Σ a_{c,q,p} K(kx − p/T, ky − q/T): a finite sum of shifted analytic transforms
 * (Guerquin-Kern, Lejeune, Pruessmann & Unser 2012). The period T is L times the 2-unit FOV: with
 * L = 1 the polynomial would be periodic over the FOV and could not follow a map that differs from
 * one edge to the other; L ≥ 2 leaves room for a smooth periodic continuation. An integer L puts the
 * shifts p/T on a grid L times finer than the k-space grid (Δk = 1/2), which coil-kspace.ts exploits.
 */
export interface TrigPolynomialMaps {
  readonly coils: number;
  /** P: harmonics −P..P along each axis. */
  readonly order: number;
  /** L: the period is T = 2L phantom units. */
  readonly periodFactor: number;
  /**
   * Coefficients a_{c,q,p}, interleaved complex, coil-major, then q (y harmonic), then p (x harmonic):
   * a_{c,q,p} at 2·((c·(2P + 1) + q + P)·(2P + 1) + p + P).
   */
  readonly coefficients: Float64Array;
}

export interface TrigFitOptions {
  /** P (default 6). */
  order?: number;
  /** L, period 2L units (default 2). */
  periodFactor?: number;
}

export const TRIG_FIT_LIMITS = { order: [0, 16], periodFactor: [1, 8] } as const;

/** 1D basis B[i][k] = e^(i2π·(k − P)·t_i/T) at the coordinates t_i, interleaved row-major n×(2P+1). */
function fourierBasis(t: Float64Array, order: number, period: number): Float64Array {
  const m = 2 * order + 1;
  const b = new Float64Array(2 * t.length * m);
  for (let i = 0; i < t.length; i++) {
    for (let k = 0; k < m; k++) {
      const phase = (2 * Math.PI * (k - order) * t[i]) / period;
      b[2 * (i * m + k)] = Math.cos(phase);
      b[2 * (i * m + k) + 1] = Math.sin(phase);
    }
  }
  return b;
}

/** The 1D basis at the pixel coordinates of one axis (`pixelX` for columns, `pixelY` for rows). */
function axisBasis(
  size: number,
  coordinate: (index: number, size: number) => number,
  order: number,
  period: number,
): Float64Array {
  return fourierBasis(
    Float64Array.from({ length: size }, (_, i) => coordinate(i, size)),
    order,
    period,
  );
}

/**
 * Least-squares fit over every pixel of the grid. The basis is a tensor product and the grid is a
 * full Cartesian product, so the 2D problem S ≈ B_y·A·B_xᵀ separates: A = B_y⁺·S·(B_x⁺)ᵀ exactly
 * (the pseudo-inverse of a Kronecker product is the Kronecker product of the pseudo-inverses).
 */
export function fitTrigPolynomial(
  maps: CoilMaps,
  options: TrigFitOptions = {},
  field = 'coils.fit',
): TrigPolynomialMaps {
  const order = options.order ?? 6;
  const periodFactor = options.periodFactor ?? 2;
  const { nx, ny, coils } = maps;
  const m = 2 * order + 1;
  if (!Number.isInteger(order) || order < TRIG_FIT_LIMITS.order[0] || order > TRIG_FIT_LIMITS.order[1]) {
    throw new ValidationError({
      field: `${field}.order`,
      message: `must be an integer from 0 to 16, got ${order}`,
      allowed: '0 ≤ order ≤ 16',
    });
  }
  if (m > nx || m > ny) {
    throw new ValidationError({
      field: `${field}.order`,
      message: `2·order + 1 = ${m} harmonics exceed the ${ny}×${nx} grid`,
      allowed: `2·order + 1 ≤ min(nx, ny) = ${Math.min(nx, ny)}`,
    });
  }
  if (
    !Number.isInteger(periodFactor) ||
    periodFactor < TRIG_FIT_LIMITS.periodFactor[0] ||
    periodFactor > TRIG_FIT_LIMITS.periodFactor[1]
  ) {
    throw new ValidationError({
      field: `${field}.periodFactor`,
      message: `must be an integer from 1 to 8, got ${periodFactor}`,
      allowed: '1 ≤ periodFactor ≤ 8',
    });
  }
  const period = 2 * periodFactor;
  const px = pseudoInverse(axisBasis(nx, pixelX, order, period), nx, m);
  const py = pseudoInverse(axisBasis(ny, pixelY, order, period), ny, m);
  if (!px || !py) {
    throw new ValidationError({
      field: `${field}.order`,
      message: `the ${m} harmonics are numerically dependent on this grid`,
      allowed: 'a lower order or a shorter period',
    });
  }
  const n = nx * ny;
  const coefficients = new Float64Array(2 * coils * m * m);
  const rowsByP = new Float64Array(2 * ny * m); // S·(B_x⁺)ᵀ, ny×m
  for (let c = 0; c < coils; c++) {
    const map = rowMajor(maps.data, nx, c * n);
    multiplyInto(rowMajor(rowsByP, m), map, transposed(rowMajor(px, nx)), ny, nx, m);
    multiplyInto(rowMajor(coefficients, m, c * m * m), rowMajor(py, ny), rowMajor(rowsByP, m), m, ny, m);
  }
  return { coils, order, periodFactor, coefficients };
}

/** The fitted polynomials evaluated at the pixel centres of an ny×nx grid. */
export function evaluateTrigPolynomial(fit: TrigPolynomialMaps, nx: number, ny: number): CoilMaps {
  const { coils, order, periodFactor, coefficients } = fit;
  const m = 2 * order + 1;
  const period = 2 * periodFactor;
  const bx = axisBasis(nx, pixelX, order, period);
  const by = axisBasis(ny, pixelY, order, period);
  const maps = createMultiCoilArray(coils, nx, ny);
  const rowSums = new Float64Array(2 * ny * m); // B_y·A_c: Σ_q B_y[i][q]·a_{c,q,p}, ny×m
  const n = nx * ny;
  for (let c = 0; c < coils; c++) {
    multiplyInto(rowMajor(rowSums, m), rowMajor(by, m), rowMajor(coefficients, m, c * m * m), ny, m, m);
    const map = rowMajor(maps.data, nx, c * n);
    multiplyInto(map, rowMajor(rowSums, m), transposed(rowMajor(bx, m)), ny, m, nx);
  }
  return maps;
}

export interface TrigFitError {
  /** ‖S_c − S_fit,c‖₂ / ‖S_c‖₂ per coil over the counted pixels. */
  relative: Float64Array;
  /** max |S_c − S_fit,c| over coils and counted pixels (the maps are normalised, |S| ≤ 1). */
  maxAbsolute: number;
}

/** How far the fit is from the maps it was fitted to, over the whole grid or over `mask` (1 = counted). */
export function trigFitError(maps: CoilMaps, fitted: CoilMaps, mask?: Uint8Array): TrigFitError {
  const n = maps.nx * maps.ny;
  const relative = new Float64Array(maps.coils);
  let maxAbsolute = 0;
  for (let c = 0; c < maps.coils; c++) {
    let diff = 0;
    let norm = 0;
    for (let i = 0; i < n; i++) {
      if (mask && !mask[i]) continue;
      const k = 2 * (c * n + i);
      const dr = maps.data[k] - fitted.data[k];
      const di = maps.data[k + 1] - fitted.data[k + 1];
      const d2 = dr * dr + di * di;
      diff += d2;
      norm += maps.data[k] ** 2 + maps.data[k + 1] ** 2;
      maxAbsolute = Math.max(maxAbsolute, Math.sqrt(d2));
    }
    relative[c] = Math.sqrt(diff / norm);
  }
  return { relative, maxAbsolute };
}
