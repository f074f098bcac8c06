import { scratch } from './scratch.ts';

/**
 * Correlates one line of a flat array with a symmetric-or-not kernel of odd length 2r + 1:
 *   target[start + j·step] (+)= Σ_{t=−r}^{r} kernel[t + r] · source[start + reflect(j + t)·step],  j = 0…size−1
 * with the 'reflect' boundary (half-sample symmetric extension … c b a | a b c … x y z | z y x …,
 * repeated with period 2·size for lines shorter than r) — scipy.ndimage's mode='reflect'.
 * `accumulate` adds to target instead of overwriting it. Rows use step 1, columns step = width.
 */
export function correlateLineReflect(
  target: Float64Array,
  source: Float64Array,
  start: number,
  size: number,
  step: number,
  kernel: Float64Array,
  accumulate: boolean,
): void {
  const r = (kernel.length - 1) >> 1;
  const padded = scratch('reflect-line', size + 2 * r);
  const period = 2 * size;
  for (let p = 0; p < size + 2 * r; p++) {
    let i = (p - r) % period;
    if (i < 0) i += period;
    if (i >= size) i = period - 1 - i;
    padded[p] = source[start + i * step];
  }
  const taps = kernel.length;
  for (let j = 0; j < size; j++) {
    let sum = 0;
    for (let t = 0; t < taps; t++) sum += kernel[t] * padded[j + t];
    const at = start + j * step;
    target[at] = accumulate ? target[at] + sum : sum;
  }
}

/**
 * Separable 2D correlation of a row-major ny×nx image with rowKernel ⊗ colKernel (rowKernel along
 * each row, then colKernel down each column), 'reflect' boundary on both axes. `temp` holds the
 * row pass (length nx·ny, distinct from source and target); `accumulate` adds into target.
 */
export function correlateSeparableReflect(
  target: Float64Array,
  source: Float64Array,
  nx: number,
  ny: number,
  rowKernel: Float64Array,
  colKernel: Float64Array,
  temp: Float64Array,
  accumulate: boolean,
): void {
  for (let row = 0; row < ny; row++) correlateLineReflect(temp, source, row * nx, nx, 1, rowKernel, false);
  for (let col = 0; col < nx; col++) correlateLineReflect(target, temp, col, ny, nx, colKernel, accumulate);
}
