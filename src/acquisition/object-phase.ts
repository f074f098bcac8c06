import { SeededRandom } from '../core/random.ts';
import { pixelX, pixelY } from '../phantoms/index.ts';

/**
 * A smooth object phase e^(iφ) on the ny×nx grid, φ(x, y) = Σ_{a+b ≤ order} c_ab·x^a·y^b in the
 * phantom frame (x, y ∈ [−1, 1]), coefficients drawn uniformly from [−π/2, π/2] by SeededRandom(seed)
 * in the order (a + b, then a). Real objects acquire such a phase from B0 inhomogeneity and coil
 * phase (common practice); keeping it low-order keeps it smooth, so a phantom's coil k-space stays
 * exact once the phase is folded into each coil's smooth factor. Interleaved complex, row-major.
 */
export function objectPhaseFactor(order: number, seed: number, nx: number, ny: number): Float64Array {
  const random = new SeededRandom(seed);
  const terms: Array<{ a: number; b: number; c: number }> = [];
  for (let degree = 0; degree <= order; degree++) {
    for (let a = degree; a >= 0; a--) {
      terms.push({ a, b: degree - a, c: (random.uniform() - 0.5) * Math.PI });
    }
  }
  const out = new Float64Array(2 * nx * ny);
  for (let i = 0; i < ny; i++) {
    const y = pixelY(i, ny);
    for (let j = 0; j < nx; j++) {
      const x = pixelX(j, nx);
      let phi = 0;
      for (const { a, b, c } of terms) phi += c * x ** a * y ** b;
      const at = 2 * (i * nx + j);
      out[at] = Math.cos(phi);
      out[at + 1] = Math.sin(phi);
    }
  }
  return out;
}
