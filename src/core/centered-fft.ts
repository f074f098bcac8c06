import { type ComplexImage, createComplexImage } from './complex-image.ts';
import { fftPlan } from './fft-plan.ts';

/**
 * Centred orthonormal 1D DFT along one line of an interleaved complex buffer:
 * the N elements at `start`, `start + step`, … (complex indices) of `source` are transformed as
 *   fftshift ∘ fft(norm 1/√N) ∘ ifftshift           (sign = −1, forward)
 *   fftshift ∘ ifft(norm 1/√N) ∘ ifftshift          (sign = +1, inverse)
 * and written to the same positions of `target` (which may be `source`). The shifts are fused into
 * the gather and scatter; the inverse is conj ∘ forward ∘ conj. DC sits at index ⌊N/2⌋.
 */
export function centeredLineTransform(
  target: Float64Array,
  source: Float64Array,
  start: number,
  size: number,
  step: number,
  sign: -1 | 1,
): void {
  const plan = fftPlan(size);
  const scratch = lineScratch(size);
  const half = Math.floor(size / 2);
  const scale = 1 / Math.sqrt(size);
  const conj = sign === 1 ? -1 : 1;
  const { input, output } = scratch;
  for (let j = 0; j < size; j++) {
    const src = 2 * (start + ((j + half) % size) * step);
    input[2 * j] = source[src];
    input[2 * j + 1] = conj * source[src + 1];
  }
  plan.forward(output, input);
  const conjScale = conj * scale;
  for (let k = 0; k < size; k++) {
    const dst = 2 * (start + ((k + half) % size) * step);
    target[dst] = output[2 * k] * scale;
    target[dst + 1] = output[2 * k + 1] * conjScale;
  }
}

const scratches = new Map<number, { input: Float64Array; output: Float64Array }>();
function lineScratch(size: number): { input: Float64Array; output: Float64Array } {
  let s = scratches.get(size);
  if (!s) {
    s = { input: new Float64Array(2 * size), output: new Float64Array(2 * size) };
    scratches.set(size, s);
  }
  return s;
}

function transform2d(target: ComplexImage, source: ComplexImage, sign: -1 | 1): ComplexImage {
  const { nx, ny } = source;
  if (target.nx !== nx || target.ny !== ny) {
    throw new RangeError(`target is ${target.ny}×${target.nx} but source is ${ny}×${nx}`);
  }
  for (let row = 0; row < ny; row++) centeredLineTransform(target.data, source.data, row * nx, nx, 1, sign);
  for (let col = 0; col < nx; col++) centeredLineTransform(target.data, target.data, col, ny, nx, sign);
  return target;
}

/**
 * Centred orthonormal 2D DFT, F = fftshift ∘ fft2(norm 1/√(nx·ny)) ∘ ifftshift, for any ny×nx
 * (odd and non-power-of-two included). Image centre (⌊ny/2⌋, ⌊nx/2⌋) maps to the k-space DC.
 * Writes into `target` when given (may equal `source`), else into a new image.
 */
export function fft2c(source: ComplexImage, target?: ComplexImage): ComplexImage {
  return transform2d(target ?? createComplexImage(source.nx, source.ny), source, -1);
}

/** Inverse of fft2c (its adjoint, since it is unitary). */
export function ifft2c(source: ComplexImage, target?: ComplexImage): ComplexImage {
  return transform2d(target ?? createComplexImage(source.nx, source.ny), source, 1);
}
