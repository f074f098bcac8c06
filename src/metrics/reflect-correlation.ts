import { scratch } from './scratch.ts';

/**
 * scipy.ndimage's mode='reflect' (half-sample symmetric extension … c b a | a b c … z | z y …):
 * the in-range index that out-of-range index i of a line of length n reads, repeating with
 * period 2n so lines shorter than the kernel radius are extended correctly too.
 */
export function reflectIndex(i: number, n: number): number {
  const period = 2 * n;
  let k = i % period;
  if (k < 0) k += period;
  return k >= n ? period - 1 - k : k;
}

/**
 * Correlates every row of a row-major ny×nx image with a kernel of odd length 2r + 1:
 *   target[row·nx + j] = Σ_{t=−r}^{r} kernel[t + r] · source[row·nx + reflect(j + t)]
 * 'reflect' boundary (see reflectIndex). target and source must be distinct arrays.
 */
export function correlateRowsReflect(
  target: Float64Array,
  source: Float64Array,
  nx: number,
  ny: number,
  kernel: Float64Array,
): void {
  const taps = kernel.length;
  const r = (taps - 1) >> 1;
  const padded = scratch('reflect-row', nx + 2 * r);
  for (let row = 0; row < ny; row++) {
    const base = row * nx;
    for (let p = 0; p < nx + 2 * r; p++) padded[p] = source[base + reflectIndex(p - r, nx)];
    for (let j = 0; j < nx; j++) {
      let sum = 0;
      for (let t = 0; t < taps; t++) sum += kernel[t] * padded[j + t];
      target[base + j] = sum;
    }
  }
}

/**
 * Correlates every column with the kernel, adding into target when `accumulate`:
 *   target[i·nx + col] (+)= Σ_{t=−r}^{r} kernel[t + r] · source[reflect(i + t)·nx + col]
 * Swept a whole row at a time (contiguous reads) rather than column by column.
 * target and source must be distinct arrays.
 */
export function correlateColumnsReflect(
  target: Float64Array,
  source: Float64Array,
  nx: number,
  ny: number,
  kernel: Float64Array,
  accumulate: boolean,
): void {
  const taps = kernel.length;
  const r = (taps - 1) >> 1;
  for (let i = 0; i < ny; i++) {
    const out = i * nx;
    if (!accumulate) target.fill(0, out, out + nx);
    for (let t = 0; t < taps; t++) {
      const w = kernel[t];
      const from = reflectIndex(i + t - r, ny) * nx;
      for (let j = 0; j < nx; j++) target[out + j] += w * source[from + j];
    }
  }
}
