/**
 * Products of small dense complex matrices stored interleaved (re, im), read through strided views
 * so that one loop serves A·B, Aᴴ·B, A·Bᴴ and transposes without copying. Element (i, j) of a view
 * sits at complex index offset + i·rowStride + j·colStride of `data`; a `conjugate` view reads
 * conj of every element. Written here because the well-kept npm linear-algebra packages are
 * real-valued; the matrices are small (coils, aliased pixels, harmonics).
 */
export interface ComplexMatrixView {
  readonly data: Float64Array;
  readonly rowStride: number;
  readonly colStride: number;
  /** Complex index of element (0, 0) (default 0). */
  readonly offset?: number;
  readonly conjugate?: boolean;
}

/** A row-major matrix with `cols` columns, element (0, 0) at complex index `offset`. */
export function rowMajor(data: Float64Array, cols: number, offset = 0): ComplexMatrixView {
  return { data, rowStride: cols, colStride: 1, offset };
}

/** Aᵀ as a view of the same numbers. */
export function transposed(view: ComplexMatrixView): ComplexMatrixView {
  return { ...view, rowStride: view.colStride, colStride: view.rowStride };
}

/** Aᴴ = conj(A)ᵀ as a view of the same numbers. */
export function adjoint(view: ComplexMatrixView): ComplexMatrixView {
  return { ...transposed(view), conjugate: !view.conjugate };
}

/**
 * out = A·B for A rows×inner and B inner×cols, each entry summed over k = 0 … inner − 1 in order.
 * `out` must not share numbers with A or B; a conjugate `out` view is refused.
 */
export function multiplyInto(
  out: ComplexMatrixView,
  a: ComplexMatrixView,
  b: ComplexMatrixView,
  rows: number,
  inner: number,
  cols: number,
): void {
  if (out.conjugate) throw new RangeError('out cannot be a conjugate view');
  const conjugate = a.conjugate ? (b.conjugate ? 'both' : 'a') : b.conjugate ? 'b' : 'none';
  const acc = new Float64Array(2);
  for (let i = 0; i < rows; i++) {
    const aRow = (a.offset ?? 0) + i * a.rowStride;
    for (let j = 0; j < cols; j++) {
      const bCol = (b.offset ?? 0) + j * b.colStride;
      acc.fill(0);
      addProducts(acc, 1, a.data, aRow, a.colStride, b.data, bCol, b.rowStride, inner, conjugate);
      const ot = 2 * ((out.offset ?? 0) + i * out.rowStride + j * out.colStride);
      out.data[ot] = acc[0];
      out.data[ot + 1] = acc[1];
    }
  }
}

/** A new rows×cols row-major A·B. */
export function multiply(
  a: ComplexMatrixView,
  b: ComplexMatrixView,
  rows: number,
  inner: number,
  cols: number,
): Float64Array {
  const out = new Float64Array(2 * rows * cols);
  multiplyInto(rowMajor(out, cols), a, b, rows, inner, cols);
  return out;
}

/** Which factors of each product `addProducts` reads as their conjugates. */
export type ConjugateFactors = 'none' | 'a' | 'b' | 'both';

/**
 * acc ← acc + sign·a_k·b_k term by term for k = 0 … count − 1, in order: with sign 1 a dot product,
 * with sign −1 the inner step of forward and back substitution (acc − a_0·b_0 − a_1·b_1 − …).
 * a_k is the complex number at complex index aAt + k·aStep of `a`, b_k likewise; `conjugate` names
 * the factors read as their conjugates. `acc` holds [re, im].
 */
export function addProducts(
  acc: Float64Array,
  sign: 1 | -1,
  a: Float64Array,
  aAt: number,
  aStep: number,
  b: Float64Array,
  bAt: number,
  bStep: number,
  count: number,
  conjugate: ConjugateFactors = 'none',
): void {
  const aSign = conjugate === 'a' || conjugate === 'both' ? -1 : 1;
  const bSign = conjugate === 'b' || conjugate === 'both' ? -1 : 1;
  let re = acc[0];
  let im = acc[1];
  for (let k = 0; k < count; k++) {
    const at = 2 * (aAt + k * aStep);
    const bt = 2 * (bAt + k * bStep);
    const ar = a[at];
    const ai = aSign * a[at + 1];
    const br = b[bt];
    const bi = bSign * b[bt + 1];
    // −(x) added is x subtracted, exactly: sign = −1 rounds as the textbook `re −= …` does.
    re += sign * (ar * br - ai * bi);
    im += sign * (ar * bi + ai * br);
  }
  acc[0] = re;
  acc[1] = im;
}
