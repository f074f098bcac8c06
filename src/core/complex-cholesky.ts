/**
 * Small dense complex linear algebra on interleaved row-major n×n matrices
 * (a[2(i·n + j)] = Re a_ij, a[2(i·n + j) + 1] = Im a_ij): the Cholesky factorisation A = L·Lᴴ of a
 * Hermitian positive definite matrix, triangular solves and inverses. Written here because the
 * well-kept npm linear-algebra packages are real-valued; n is small (coils, aliased pixels).
 * The algorithm is the textbook one (Golub & Van Loan, "Matrix Computations", §4.2 — from memory).
 */
import { addProducts, adjoint, multiplyInto, rowMajor } from './complex-matrix.ts';

/** Relative pivot below which a matrix counts as singular (not numerically positive definite). */
export const DEFAULT_PIVOT_TOLERANCE = 1e-12;

/**
 * Factorises the Hermitian matrix `a` (only its lower triangle is read) into `l`, lower triangular
 * with a real positive diagonal, zero above; `l` may be `a`. Returns the index of the first pivot
 * that is not above `tolerance × max diagonal` (the matrix is singular or indefinite there), or −1
 * when the factorisation succeeded.
 */
export function choleskyLower(
  a: Float64Array,
  n: number,
  l: Float64Array = a,
  tolerance = DEFAULT_PIVOT_TOLERANCE,
): number {
  checkSquare(a, n, 'a');
  checkSquare(l, n, 'l');
  let maxDiagonal = 0;
  for (let i = 0; i < n; i++) maxDiagonal = Math.max(maxDiagonal, Math.abs(a[2 * (i * n + i)]));
  const floor = tolerance * maxDiagonal;
  const acc = new Float64Array(2);
  for (let j = 0; j < n; j++) {
    let d = a[2 * (j * n + j)];
    for (let k = 0; k < j; k++) {
      const re = l[2 * (j * n + k)];
      const im = l[2 * (j * n + k) + 1];
      d -= re * re + im * im;
    }
    if (!(d > floor) || maxDiagonal === 0) return j;
    const ljj = Math.sqrt(d);
    l[2 * (j * n + j)] = ljj;
    l[2 * (j * n + j) + 1] = 0;
    for (let i = j + 1; i < n; i++) {
      // l_ij = (a_ij − Σ_k l_ik·conj(l_jk)) / l_jj
      acc[0] = a[2 * (i * n + j)];
      acc[1] = a[2 * (i * n + j) + 1];
      addProducts(acc, -1, l, i * n, 1, l, j * n, 1, j, 'b');
      l[2 * (i * n + j)] = acc[0] / ljj;
      l[2 * (i * n + j) + 1] = acc[1] / ljj;
    }
    for (let i = 0; i < j; i++) {
      l[2 * (i * n + j)] = 0;
      l[2 * (i * n + j) + 1] = 0;
    }
  }
  return -1;
}

/** Solves L·x = b in place for lower-triangular L; b is n complex numbers from `offset` (complex index). */
export function solveLower(l: Float64Array, n: number, b: Float64Array, offset = 0): void {
  const acc = new Float64Array(2);
  for (let i = 0; i < n; i++) {
    acc[0] = b[2 * (offset + i)];
    acc[1] = b[2 * (offset + i) + 1];
    addProducts(acc, -1, l, i * n, 1, b, offset, 1, i);
    storeQuotient(b, offset + i, acc, l[2 * (i * n + i)], l[2 * (i * n + i) + 1]);
  }
}

/** Solves Lᴴ·x = b in place for lower-triangular L (an upper-triangular solve with conj(L)ᵀ). */
export function solveLowerConjugateTranspose(l: Float64Array, n: number, b: Float64Array, offset = 0): void {
  const acc = new Float64Array(2);
  for (let i = n - 1; i >= 0; i--) {
    acc[0] = b[2 * (offset + i)];
    acc[1] = b[2 * (offset + i) + 1];
    // (Lᴴ)_ik = conj(l_ki), k > i: down column i of L.
    addProducts(acc, -1, l, (i + 1) * n + i, n, b, offset + i + 1, 1, n - 1 - i, 'a');
    storeQuotient(b, offset + i, acc, l[2 * (i * n + i)], -l[2 * (i * n + i) + 1]);
  }
}

/** Inverse of a lower-triangular L into `out` (lower triangular, zero above); `out` must differ from `l`. */
export function invertLower(l: Float64Array, n: number, out: Float64Array): void {
  checkSquare(l, n, 'l');
  checkSquare(out, n, 'out');
  if (out === l) throw new RangeError('out must differ from l');
  out.fill(0);
  const acc = new Float64Array(2);
  for (let j = 0; j < n; j++) {
    // Column j of L⁻¹ solves L·x = e_j; entries above j are zero.
    for (let i = j; i < n; i++) {
      acc[0] = i === j ? 1 : 0;
      acc[1] = 0;
      addProducts(acc, -1, l, i * n + j, 1, out, j * n + j, n, i - j);
      storeQuotient(out, i * n + j, acc, l[2 * (i * n + i)], l[2 * (i * n + i) + 1]);
    }
  }
}

/** target[at] = acc / (dr + i·di), complex numbers (at is a complex index). */
function storeQuotient(target: Float64Array, at: number, acc: Float64Array, dr: number, di: number): void {
  const den = dr * dr + di * di;
  target[2 * at] = (acc[0] * dr + acc[1] * di) / den;
  target[2 * at + 1] = (acc[1] * dr - acc[0] * di) / den;
}

/**
 * Inverse of a Hermitian positive definite A from its Cholesky factor: A⁻¹ = L⁻ᴴ·L⁻¹, written to
 * `out` (full matrix). `scratch` (2n² numbers) receives L⁻¹.
 */
export function hermitianInverseFromCholesky(
  l: Float64Array,
  n: number,
  out: Float64Array,
  scratch: Float64Array = new Float64Array(2 * n * n),
): void {
  invertLower(l, n, scratch);
  // (A⁻¹)_ij = Σ_k conj(M_ki)·M_kj with M = L⁻¹; the zeros above M's diagonal add exact zeros.
  multiplyInto(rowMajor(out, n), adjoint(rowMajor(scratch, n)), rowMajor(scratch, n), n, n, n);
}

function checkSquare(m: Float64Array, n: number, name: string): void {
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`n must be a positive integer, got ${n}`);
  if (m.length !== 2 * n * n)
    throw new RangeError(`${name} must hold 2·n² = ${2 * n * n} numbers, got ${m.length}`);
}
