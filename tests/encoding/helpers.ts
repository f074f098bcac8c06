import { SeededRandom } from '../../src/core/random.ts';
import { createMultiCoilArray, type MultiCoilArray } from '../../src/encoding/multi-coil.ts';

export function randomStack(coils: number, nx: number, ny: number, seed: number): MultiCoilArray {
  const rng = new SeededRandom(seed);
  const stack = createMultiCoilArray(coils, nx, ny);
  for (let i = 0; i < stack.data.length; i++) stack.data[i] = rng.normal();
  return stack;
}

/** A mask with each point acquired with probability `fraction`. */
export function randomMask(nx: number, ny: number, fraction: number, seed: number): Uint8Array {
  const rng = new SeededRandom(seed);
  const mask = new Uint8Array(nx * ny);
  for (let i = 0; i < mask.length; i++) mask[i] = rng.uniform() < fraction ? 1 : 0;
  return mask;
}

/** ⟨a, b⟩ = Σ conj(a_i)·b_i over interleaved complex arrays, as [re, im]. */
export function inner(a: Float64Array, b: Float64Array): [number, number] {
  let re = 0;
  let im = 0;
  for (let i = 0; i < a.length; i += 2) {
    re += a[i] * b[i] + a[i + 1] * b[i + 1];
    im += a[i] * b[i + 1] - a[i + 1] * b[i];
  }
  return [re, im];
}

/** Same bytes (so +0 and −0 differ): the strictest equality of two Float64Arrays. */
export function sameBits(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false;
  return Buffer.from(a.buffer, a.byteOffset, a.byteLength).equals(
    Buffer.from(b.buffer, b.byteOffset, b.byteLength),
  );
}
