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
 * Correlates every row of a row-major ny×nx image with each of several kernels of one odd length
 * 2r + 1, target m receiving kernel m:
 *   targets[m][row·nx + j] = Σ_{t=−r}^{r} kernels[m][t + r] · source[row·nx + reflect(j + t)]
 * 'reflect' boundary (see reflectIndex). Each row is extended once and shared by all kernels.
 * Targets must be distinct from source.
 */
export function correlateRowsReflect(
  targets: Float64Array[],
  source: Float64Array,
  nx: number,
  ny: number,
  kernels: Float64Array[],
): void {
  const taps = kernels[0].length;
  const r = (taps - 1) >> 1;
  const padded = scratch('reflect-row', nx + 2 * r);
  for (let row = 0; row < ny; row++) {
    const base = row * nx;
    for (let p = 0; p < nx + 2 * r; p++) padded[p] = source[base + reflectIndex(p - r, nx)];
    for (let m = 0; m < kernels.length; m++) {
      const kernel = kernels[m];
      const target = targets[m];
      for (let j = 0; j < nx; j++) {
        let sum = 0;
        for (let t = 0; t < taps; t++) sum += kernel[t] * padded[j + t];
        target[base + j] = sum;
      }
    }
  }
}

/**
 * Correlates the columns of several images, each with its own kernel (one odd length 2r + 1), and
 * sums the results into target:
 *   target[i·nx + col] = Σ_m Σ_{t=−r}^{r} kernels[m][t + r] · sources[m][reflect(i + t)·nx + col]
 * Swept a whole row at a time (contiguous reads) rather than column by column.
 * Target must be distinct from the sources.
 */
export function correlateColumnsReflect(
  target: Float64Array,
  sources: Float64Array[],
  nx: number,
  ny: number,
  kernels: Float64Array[],
): void {
  const taps = kernels[0].length;
  const r = (taps - 1) >> 1;
  for (let i = 0; i < ny; i++) {
    const out = i * nx;
    target.fill(0, out, out + nx);
    for (let t = 0; t < taps; t++) {
      const from = reflectIndex(i + t - r, ny) * nx;
      for (let m = 0; m < sources.length; m++) {
        const w = kernels[m][t];
        const source = sources[m];
        for (let j = 0; j < nx; j++) target[out + j] += w * source[from + j];
      }
    }
  }
}
