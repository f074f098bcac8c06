import { fftPlan } from './fft-plan.ts';

/** Columns gathered per tile: four complex doubles fill one 64-byte cache line of a row. */
const TILE = 4;

const tiles = new Map<number, { input: Float64Array[]; output: Float64Array[] }>();
function columnTile(size: number): { input: Float64Array[]; output: Float64Array[] } {
  let t = tiles.get(size);
  if (!t) {
    const make = () => Array.from({ length: TILE }, () => new Float64Array(2 * size));
    t = { input: make(), output: make() };
    tiles.set(size, t);
  }
  return t;
}

/**
 * Un-centred, unnormalised forward 2D DFT of an ny×nx interleaved complex image (row-major),
 *   target[v, u] = s · Σ_{y,x} source[y, x] e^(−i2π(ux/nx + vy/ny)),
 * with the output multiplied by `scale` and conjugated when `conjugate` is set, so that
 * conj ∘ (1/N) ∘ forward ∘ conj is the inverse DFT (N = nx·ny). No fftshift/ifftshift: the caller
 * keeps its k-space in DC-first order. Rows go straight from `source` into `scratch` (no copies);
 * columns are gathered TILE at a time (one cache line per row) from `scratch`, transformed, and
 * scattered into `target` with the scale and conjugation applied in the scatter. `target` may be
 * `source`; `scratch` (2·nx·ny numbers) must differ from both.
 */
export function plainFft2d(
  target: Float64Array,
  source: Float64Array,
  scratch: Float64Array,
  nx: number,
  ny: number,
  scale: number,
  conjugate: boolean,
): void {
  if (scratch === source || scratch === target) throw new RangeError('scratch must differ from source and target');
  const rowPlan = fftPlan(nx);
  const rowLength = 2 * nx;
  for (let r = 0, o = 0; r < ny; r++, o += rowLength) {
    rowPlan.forward(scratch.subarray(o, o + rowLength), source.subarray(o, o + rowLength));
  }
  const columnPlan = fftPlan(ny);
  const { input, output } = columnTile(ny);
  const imagScale = conjugate ? -scale : scale;
  for (let c = 0; c < nx; c += TILE) {
    const width = Math.min(TILE, nx - c);
    for (let r = 0; r < ny; r++) {
      const base = r * rowLength + 2 * c;
      for (let w = 0; w < width; w++) {
        input[w][2 * r] = scratch[base + 2 * w];
        input[w][2 * r + 1] = scratch[base + 2 * w + 1];
      }
    }
    for (let w = 0; w < width; w++) columnPlan.forward(output[w], input[w]);
    for (let r = 0; r < ny; r++) {
      const base = r * rowLength + 2 * c;
      for (let w = 0; w < width; w++) {
        target[base + 2 * w] = output[w][2 * r] * scale;
        target[base + 2 * w + 1] = output[w][2 * r + 1] * imagScale;
      }
    }
  }
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
 * `weight` (centred order, e.g. a sampling mask) multiplies each sample when given.
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
      const t = 2 * (v * nx + u);
      out[t] = re * cr - im * ci;
      out[t + 1] = re * ci + im * cr;
    }
  }
  return out;
}

/** A centred-order per-sample map (e.g. a sampling mask) in DC-first order: a permutation only. */
export function dcFirstOrder(centred: Uint8Array, nx: number, ny: number): Uint8Array {
  const hx = Math.floor(nx / 2);
  const hy = Math.floor(ny / 2);
  const out = new Uint8Array(nx * ny);
  for (let v = 0; v < ny; v++) {
    const sourceRow = ((v + hy) % ny) * nx;
    for (let u = 0; u < nx; u++) out[v * nx + u] = centred[sourceRow + ((u + hx) % nx)];
  }
  return out;
}
