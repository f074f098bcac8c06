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
 * div ← div p for the primal step x − τ∇ᴴp = x + τ div p, in one pass (relaxedTvDualPass with
 * x̃ = x = x̄, where 2x̄ − x̄ = x̄ exactly, and ρ = 1, which leaves x̄ and the projected p as they are).
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
  relaxedTvDualPass(div, px, py, xBar, xBar, nx, ny, sigma, lambda, 1);
}

/**
 * The TV dual half of a relaxed Chambolle–Pock step in one pass, given x̃ (in `xt`) and x_k (in `x`):
 * x̄ = 2x̃ − x_k formed on the fly, p̃ = proj_{‖·‖≤λ}(p + σ∇x̄) (per pixel, |p| over both directions
 * and re/im: isotropic TV),
 * p ← ρp̃ + (1 − ρ)p, div p into `div`, and x_{k+1} = ρx̃ + (1 − ρ)x_k written over x̃ (each pixel
 * reads x̃ only at itself and ahead of it). Returns ‖x_{k+1} − x_k‖/‖x_{k+1}‖ (the numerator alone
 * when x_{k+1} = 0), summed in the same pass.
 */
export function relaxedTvDualPass(
  div: Float64Array,
  px: Float64Array,
  py: Float64Array,
  xt: Float64Array,
  x: Float64Array,
  nx: number,
  ny: number,
  sigma: number,
  lambda: number,
  rho: number,
): number {
  const keep = 1 - rho;
  const lambda2 = lambda * lambda;
  const rowStep = 2 * nx;
  let diff = 0;
  let norm = 0;
  for (let i = 0; i < ny; i++) {
    // Row boundaries as 0/1 weights and offsets rather than branches per pixel: on the last row the
    // vertical difference gets weight 0 (its offset 0 keeps the read in bounds), on the first row
    // the term of the row above does.
    const hasBelow = i < ny - 1 ? 1 : 0;
    const hasAbove = i > 0 ? 1 : 0;
    const below = hasBelow * rowStep;
    const above = hasAbove * rowStep;
    const sigmaBelow = sigma * hasBelow;
    let k = 2 * i * nx;
    const lastColumn = k + 2 * (nx - 1);
    let re = 2 * xt[k] - x[k];
    let im = 2 * xt[k + 1] - x[k + 1];
    // p of the pixel to the left, carried instead of read back.
    let leftA = 0;
    let leftB = 0;
    for (; k <= lastColumn; k += 2) {
      // The last column has no horizontal difference: weight 0, and its own x̄ as the neighbour.
      const inner = k < lastColumn ? 1 : 0;
      const right = k + 2 * inner;
      const nextRe = 2 * xt[right] - x[right];
      const nextIm = 2 * xt[right + 1] - x[right + 1];
      const oa = px[k];
      const ob = px[k + 1];
      const oc = py[k];
      const od = py[k + 1];
      const a = oa + sigma * (nextRe - re);
      const b = ob + sigma * (nextIm - im);
      const c = oc + sigmaBelow * (2 * xt[k + below] - x[k + below] - re);
      const d = od + sigmaBelow * (2 * xt[k + below + 1] - x[k + below + 1] - im);
      const s = a * a + b * b + c * c + d * d;
      const scale = (s > lambda2 ? lambda / Math.sqrt(s) : 1) * rho;
      const pa = a * scale + keep * oa;
      const pb = b * scale + keep * ob;
      const pc = c * scale + keep * oc;
      const pd = d * scale + keep * od;
      px[k] = pa;
      px[k + 1] = pb;
      py[k] = pc;
      py[k + 1] = pd;
      div[k] = inner * pa - leftA + hasBelow * pc - hasAbove * py[k - above];
      div[k + 1] = inner * pb - leftB + hasBelow * pd - hasAbove * py[k - above + 1];
      leftA = pa;
      leftB = pb;
      const xr = x[k];
      const xi = x[k + 1];
      const nr = rho * xt[k] + keep * xr;
      const ni = rho * xt[k + 1] + keep * xi;
      xt[k] = nr;
      xt[k + 1] = ni;
      const dr = nr - xr;
      const di = ni - xi;
      diff += dr * dr + di * di;
      norm += nr * nr + ni * ni;
      re = nextRe;
      im = nextIm;
    }
  }
  return norm > 0 ? Math.sqrt(diff / norm) : Math.sqrt(diff);
}
