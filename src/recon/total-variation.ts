import { SeededRandom } from '../core/random.ts';

/**
 * Discrete gradient and divergence of Chambolle 2004 on interleaved complex ny×nx arrays:
 *   (∇x)₁[i,j] = x[i,j+1] − x[i,j]  (zero in the last column),
 *   (∇x)₂[i,j] = x[i+1,j] − x[i,j]  (zero in the last row),
 * i.e. forward differences with Neumann boundaries, and div = −∇ᴴ (docs/references.md §5.2).
 * Index 1 runs along columns (readout, x), index 2 along rows (phase encode, y).
 */
export function gradient(gx: Float64Array, gy: Float64Array, x: Float64Array, nx: number, ny: number): void {
  for (let i = 0; i < ny; i++) {
    const row = i * nx;
    for (let j = 0; j < nx; j++) {
      const k = 2 * (row + j);
      if (j < nx - 1) {
        gx[k] = x[k + 2] - x[k];
        gx[k + 1] = x[k + 3] - x[k + 1];
      } else {
        gx[k] = 0;
        gx[k + 1] = 0;
      }
      if (i < ny - 1) {
        const down = k + 2 * nx;
        gy[k] = x[down] - x[k];
        gy[k + 1] = x[down + 1] - x[k + 1];
      } else {
        gy[k] = 0;
        gy[k + 1] = 0;
      }
    }
  }
}

/**
 * div p = −∇ᴴp (Chambolle 2004, eq. for the discrete divergence):
 *   (div p)[i,j] = (p₁[i,j] − p₁[i,j−1]) + (p₂[i,j] − p₂[i−1,j]), with p₁[i,−1] = p₁[i,nx−1] = 0 in
 *   the difference (first column takes p₁[i,0], last column −p₁[i,nx−2]), likewise for p₂ over rows.
 */
export function divergence(
  out: Float64Array,
  px: Float64Array,
  py: Float64Array,
  nx: number,
  ny: number,
): void {
  for (let i = 0; i < ny; i++) {
    const row = i * nx;
    for (let j = 0; j < nx; j++) {
      const k = 2 * (row + j);
      let re = 0;
      let im = 0;
      if (j < nx - 1) {
        re += px[k];
        im += px[k + 1];
      }
      if (j > 0) {
        re -= px[k - 2];
        im -= px[k - 1];
      }
      if (i < ny - 1) {
        re += py[k];
        im += py[k + 1];
      }
      if (i > 0) {
        re -= py[k - 2 * nx];
        im -= py[k - 2 * nx + 1];
      }
      out[k] = re;
      out[k + 1] = im;
    }
  }
}

/** Isotropic TV of a complex image: Σ sqrt(|(∇x)₁|² + |(∇x)₂|²), complex moduli (docs/references.md §5.2). */
export function totalVariation(x: Float64Array, nx: number, ny: number): number {
  let tv = 0;
  for (let i = 0; i < ny; i++) {
    for (let j = 0; j < nx; j++) {
      const k = 2 * (i * nx + j);
      let s = 0;
      if (j < nx - 1) {
        const a = x[k + 2] - x[k];
        const b = x[k + 3] - x[k + 1];
        s += a * a + b * b;
      }
      if (i < ny - 1) {
        const a = x[k + 2 * nx] - x[k];
        const b = x[k + 2 * nx + 1] - x[k + 1];
        s += a * a + b * b;
      }
      tv += Math.sqrt(s);
    }
  }
  return tv;
}

/**
 * ‖∇‖² estimated by power iteration on ∇ᴴ∇ = −div ∇ (converges from below). Used to check the
 * bound ‖∇‖² ≤ 8 behind the Chambolle–Pock step rule; the exact n×n value is 8·cos²(π/(2n)).
 */
export function gradientNormSquared(nx: number, ny: number, iterations = 500, seed = 1): number {
  const n = nx * ny;
  const rng = new SeededRandom(seed);
  const x = new Float64Array(2 * n);
  for (let i = 0; i < 2 * n; i++) x[i] = rng.normal();
  const gx = new Float64Array(2 * n);
  const gy = new Float64Array(2 * n);
  const y = new Float64Array(2 * n);
  let estimate = 0;
  for (let it = 0; it < iterations; it++) {
    let norm = 0;
    for (let i = 0; i < 2 * n; i++) norm += x[i] * x[i];
    norm = Math.sqrt(norm);
    for (let i = 0; i < 2 * n; i++) x[i] /= norm;
    gradient(gx, gy, x, nx, ny);
    divergence(y, gx, gy, nx, ny);
    // Rayleigh quotient ⟨x, −div ∇x⟩ = ‖∇x‖² for unit x.
    estimate = 0;
    for (let i = 0; i < 2 * n; i++) {
      estimate -= x[i] * y[i];
      x[i] = -y[i];
    }
  }
  return estimate;
}

/**
 * One dual step of the TV term in Chambolle–Pock (K = ∇): p ← proj_{‖·‖≤λ}(p + σ∇x̄), then
 * div ← div p for the primal step x − τ∇ᴴp = x + τ div p. One pass over the arrays: at pixel
 * (i, j) the gradient of x̄ is formed on the fly and div p needs p at (i, j−1) and (i−1, j), which
 * the row-major sweep has already updated; the arithmetic is that of `gradient`, the per-pixel projection onto the λ-ball (|p|
 * over both directions and re/im, isotropic TV) and `divergence` in turn, so the results agree
 * with three separate passes bit for bit.
 */
export function tvDualAscent(
  div: Float64Array,
  px: Float64Array,
  py: Float64Array,
  xBar: Float64Array,
  nx: number,
  ny: number,
  sigma: number,
  lambda: number,
): void {
  const lambda2 = lambda * lambda;
  const rowStep = 2 * nx;
  for (let i = 0; i < ny; i++) {
    const lastRow = i === ny - 1;
    for (let j = 0; j < nx; j++) {
      const k = 2 * (i * nx + j);
      const re = xBar[k];
      const im = xBar[k + 1];
      const lastColumn = j === nx - 1;
      const g1 = lastColumn ? 0 : xBar[k + 2] - re;
      const g2 = lastColumn ? 0 : xBar[k + 3] - im;
      const g3 = lastRow ? 0 : xBar[k + rowStep] - re;
      const g4 = lastRow ? 0 : xBar[k + rowStep + 1] - im;
      const a = px[k] + sigma * g1;
      const b = px[k + 1] + sigma * g2;
      const c = py[k] + sigma * g3;
      const d = py[k + 1] + sigma * g4;
      const s = a * a + b * b + c * c + d * d;
      const scale = s > lambda2 ? lambda / Math.sqrt(s) : 1;
      const pa = a * scale;
      const pb = b * scale;
      const pc = c * scale;
      const pd = d * scale;
      px[k] = pa;
      px[k + 1] = pb;
      py[k] = pc;
      py[k + 1] = pd;
      let dr = 0;
      let di = 0;
      if (!lastColumn) {
        dr += pa;
        di += pb;
      }
      if (j > 0) {
        dr -= px[k - 2];
        di -= px[k - 1];
      }
      if (!lastRow) {
        dr += pc;
        di += pd;
      }
      if (i > 0) {
        dr -= py[k - rowStep];
        di -= py[k - rowStep + 1];
      }
      div[k] = dr;
      div[k + 1] = di;
    }
  }
}
