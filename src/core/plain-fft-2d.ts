import { fftPlan } from './fft-plan.ts';

// Row views per buffer and row length, made once: fft.js indexes its buffers from 0, and a fresh
// subarray per row and call costs allocation on every transform.
const views = new WeakMap<Float64Array, Map<number, Float64Array[]>>();
function rowViews(buffer: Float64Array, rowLength: number): Float64Array[] {
  let byLength = views.get(buffer);
  if (!byLength) {
    byLength = new Map();
    views.set(buffer, byLength);
  }
  let rows = byLength.get(rowLength);
  if (!rows) {
    rows = Array.from({ length: buffer.length / rowLength }, (_, r) =>
      buffer.subarray(r * rowLength, (r + 1) * rowLength),
    );
    byLength.set(rowLength, rows);
  }
  return rows;
}

/** Transpose tile edge (complex samples): 32² of them is 16 KiB, a quarter of L1. */
const BLOCK = 32;

/**
 * Un-centred, unnormalised 2D DFT of an interleaved complex buffer of `rows` rows × `columns`
 * columns, returned TRANSPOSED (`columns` rows × `rows` columns) in `target`:
 *   target[u, v] = scale · Σ_{r,c} source[r, c] e^(−i2π(uc/columns + vr/rows)).
 * Row transforms straight from `source` into `target`, one cache-blocked transpose into `scratch`
 * (scale applied there), row transforms back into `target`: no fftshift/ifftshift, no column
 * gathers. Applied twice it returns the original layout, so an image (ny×nx) goes to a k-space
 * kept as nx×ny and back. With `reverse`, the transpose also mirrors both frequency indices
 * (u → −u mod n): since F⁻¹X = (1/N)·F(X[−u]) and the mirror commutes with the DFT, this with
 * scale 1/N is the inverse DFT done by forward plans only. The three buffers must differ.
 */
export function plainFft2d(
  target: Float64Array,
  source: Float64Array,
  scratch: Float64Array,
  rows: number,
  columns: number,
  scale: number,
  reverse: boolean,
): void {
  if (scratch === source || scratch === target || target === source) {
    throw new RangeError('plainFft2d needs three distinct buffers');
  }
  const first = fftPlan(columns);
  const into = rowViews(target, 2 * columns);
  const from = rowViews(source, 2 * columns);
  for (let r = 0; r < rows; r++) first.forward(into[r], from[r]);
  for (let r0 = 0; r0 < rows; r0 += BLOCK) {
    const r1 = Math.min(rows, r0 + BLOCK);
    for (let c0 = 0; c0 < columns; c0 += BLOCK) {
      const c1 = Math.min(columns, c0 + BLOCK);
      for (let r = r0; r < r1; r++) {
        const outColumn = reverse && r > 0 ? rows - r : r;
        let c = c0;
        let s = 2 * (r * columns + c);
        if (reverse && c === 0) {
          // Column 0 stays row 0; the mirror walks the rest backwards from the last row.
          scratch[2 * outColumn] = target[s] * scale;
          scratch[2 * outColumn + 1] = target[s + 1] * scale;
          c++;
          s += 2;
        }
        let d = 2 * ((reverse ? columns - c : c) * rows + outColumn);
        const step = reverse ? -2 * rows : 2 * rows;
        for (; c < c1; c++, s += 2, d += step) {
          scratch[d] = target[s] * scale;
          scratch[d + 1] = target[s + 1] * scale;
        }
      }
    }
  }
  const second = fftPlan(rows);
  const back = rowViews(target, 2 * rows);
  const transposed = rowViews(scratch, 2 * rows);
  for (let c = 0; c < columns; c++) second.forward(back[c], transposed[c]);
}

/**
 * e^(−i2π·h·u/n), h = ⌊n/2⌋, per DC-first index u: the phase between the centred and the
 * un-centred DFT along one axis. Exactly (−1)^u for even n (no rounding in the sines).
 */
function centringPhase(n: number): { cos: Float64Array; sin: Float64Array } {
  const h = Math.floor(n / 2);
  const cos = new Float64Array(n);
  const sin = new Float64Array(n);
  for (let u = 0; u < n; u++) {
    if (n % 2 === 0) {
      cos[u] = u % 2 === 0 ? 1 : -1;
    } else {
      const angle = (-2 * Math.PI * ((h * u) % n)) / n;
      cos[u] = Math.cos(angle);
      sin[u] = Math.sin(angle);
    }
  }
  return { cos, sin };
}

/**
 * A centred spectrum (fft2c's order and norm, DC at (⌊ny/2⌋, ⌊nx/2⌋)) as the un-centred DFT of the
 * same image, DC first, times `scale`: with h = ⌊n/2⌋ per axis, fft2c = fftshift ∘ F ∘ ifftshift
 * gives  F x [v, u] = e^(−i2π(h_x·u/nx + h_y·v/ny)) · fft2c(x)[(v + h_y) mod ny, (u + h_x) mod nx]
 * (the shift theorem), for odd and even sizes; for even sizes the phase is (−1)^(u+v). And
 * ifft2c(X) = Fᴴ of this DC-first spectrum, so an image kept in natural order never needs a shift.
 * Written in plainFft2d's transposed layout, [u, v] at u·ny + v. `weight` (centred order, e.g. a
 * sampling mask) multiplies each sample when given.
 */
export function dcFirstSpectrum(
  centred: Float64Array,
  nx: number,
  ny: number,
  scale: number,
  weight?: Uint8Array,
): Float64Array {
  const px = centringPhase(nx);
  const py = centringPhase(ny);
  const hx = Math.floor(nx / 2);
  const hy = Math.floor(ny / 2);
  const out = new Float64Array(2 * nx * ny);
  for (let v = 0; v < ny; v++) {
    const sourceRow = ((v + hy) % ny) * nx;
    for (let u = 0; u < nx; u++) {
      const s = sourceRow + ((u + hx) % nx);
      const w = (weight ? weight[s] : 1) * scale;
      const cr = px.cos[u] * py.cos[v] - px.sin[u] * py.sin[v];
      const ci = px.cos[u] * py.sin[v] + px.sin[u] * py.cos[v];
      const re = centred[2 * s] * w;
      const im = centred[2 * s + 1] * w;
      const t = 2 * (u * ny + v);
      out[t] = re * cr - im * ci;
      out[t + 1] = re * ci + im * cr;
    }
  }
  return out;
}

/**
 * A centred-order per-sample map (e.g. a sampling mask) in DC-first order and plainFft2d's
 * transposed layout ([u, v] at u·ny + v): a permutation only.
 */
export function dcFirstOrder(centred: Uint8Array, nx: number, ny: number): Uint8Array {
  const hx = Math.floor(nx / 2);
  const hy = Math.floor(ny / 2);
  const out = new Uint8Array(nx * ny);
  for (let v = 0; v < ny; v++) {
    const sourceRow = ((v + hy) % ny) * nx;
    for (let u = 0; u < nx; u++) out[u * ny + v] = centred[sourceRow + ((u + hx) % nx)];
  }
  return out;
}
