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
  const ad = a.data;
  const bd = b.data;
  const od = out.data;
  const aSign = a.conjugate ? -1 : 1;
  const bSign = b.conjugate ? -1 : 1;
  for (let i = 0; i < rows; i++) {
    const aRow = (a.offset ?? 0) + i * a.rowStride;
    for (let j = 0; j < cols; j++) {
      const bCol = (b.offset ?? 0) + j * b.colStride;
      let re = 0;
      let im = 0;
      for (let k = 0; k < inner; k++) {
        const at = 2 * (aRow + k * a.colStride);
        const bt = 2 * (bCol + k * b.rowStride);
        const ar = ad[at];
        const ai = aSign * ad[at + 1];
        const br = bd[bt];
        const bi = bSign * bd[bt + 1];
        re += ar * br - ai * bi;
        im += ar * bi + ai * br;
      }
      const ot = 2 * ((out.offset ?? 0) + i * out.rowStride + j * out.colStride);
      od[ot] = re;
      od[ot + 1] = im;
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
