import { type FftPlan, fftPlan } from './fft-plan.ts';

// Row views per buffer and row length, made once: fft.js indexes its buffers from 0, and a fresh
// subarray per row and call costs allocation on every transform.
const views = new WeakMap<Float64Array, Map<number, Float64Array[]>>();
/** Cached views of consecutive rows of `rowLength` numbers each (interleaved: 2 per sample). */
export function rowViews(buffer: Float64Array, rowLength: number): Float64Array[] {
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

const isPowerOfTwo = (n: number): boolean => (n & (n - 1)) === 0;

/** Per column length: where row r goes before the column pass, plain and mirrored, and twiddles. */
export interface ColumnPlan {
  /** Row r's place: its bit reversal for powers of two (the order radix-2 DIT reads), else r. */
  place: Int32Array;
  /** Row r's place when the rows are also mirrored (r → −r mod n first). */
  mirroredPlace: Int32Array;
  /** cos and −sin of 2πj/n, j < n/2 (powers of two only). */
  cos: Float64Array;
  sin: Float64Array;
  /** Column transform by gathering, for lengths that are not powers of two. */
  gather?: { plan: FftPlan; input: Float64Array; output: Float64Array };
}
const columnPlans = new Map<number, ColumnPlan>();
/** The cached column plan of length n (rows of a 2D array). */
export function columnPlan(n: number): ColumnPlan {
  let plan = columnPlans.get(n);
  if (plan) return plan;
  const bits = Math.round(Math.log2(n));
  const place = Int32Array.from({ length: n }, (_, r) => {
    if (!isPowerOfTwo(n)) return r;
    let reversed = 0;
    for (let b = 0, x = r; b < bits; b++, x >>= 1) reversed = (reversed << 1) | (x & 1);
    return reversed;
  });
  const half = isPowerOfTwo(n) ? n >> 1 : 0;
  plan = {
    place,
    mirroredPlace: Int32Array.from({ length: n }, (_, r) => place[(n - r) % n]),
    cos: Float64Array.from({ length: half }, (_, j) => Math.cos((2 * Math.PI * j) / n)),
    sin: Float64Array.from({ length: half }, (_, j) => -Math.sin((2 * Math.PI * j) / n)),
    ...(isPowerOfTwo(n)
      ? {}
      : { gather: { plan: fftPlan(n), input: new Float64Array(2 * n), output: new Float64Array(2 * n) } }),
  };
  columnPlans.set(n, plan);
  return plan;
}

/**
 * Un-centred, unnormalised 2D DFT of an interleaved complex buffer of `rows` rows × `columns`
 * columns, in natural layout (DC first, [v, u] at v·columns + u), into `target`:
 *   target[v, u] = scale · Σ_{r,c} source[r, c] e^(∓i2π(uc/columns + vr/rows)),
 * the upper sign forward, the lower with `inverse` (scale 1/N makes it the inverse DFT). No
 * fftshift, no transposes: rows go through fft.js (or fftPlan for other lengths) into their
 * bit-reversed places, then the columns are transformed for all columns at once, stage by stage
 * (radix-2 decimation in time, two stages fused per pass), so every inner loop runs along
 * contiguous rows with its twiddle held fixed — batched column passes, measured faster than
 * transposing (docs/design.md §3.13). Column lengths that are not powers of two are gathered.
 * The inverse uses forward transforms only: F⁻¹X = (1/N)·F(X[−v, −u]) (the mirror commutes with
 * the DFT), the mirror of v folded into the rows' places, that of u into the row pass.
 * `source` is left unchanged; the two buffers must differ.
 */
export function plainFft2d(
  target: Float64Array,
  source: Float64Array,
  rows: number,
  columns: number,
  scale: number,
  inverse: boolean,
): void {
  if (target === source) throw new RangeError('plainFft2d needs two distinct buffers');
  const column = columnPlan(rows);
  rowPass(target, source, rows, columns, inverse ? column.mirroredPlace : column.place, scale, inverse);
  transformColumns(target, rows, columns, column);
}

/**
 * In-place forward DFTs of the columns of `a` (`rows` × `columns`, interleaved), whose row r must
 * already sit at `plan.place[r]` (`plan` = columnPlan(rows)): batched radix-2 stages for powers of
 * two, gathered columns otherwise. Row transforms written to those places first make a 2D DFT.
 */
export function transformColumns(a: Float64Array, rows: number, columns: number, plan: ColumnPlan): void {
  if (plan.gather) gatheredColumns(a, rows, columns, plan.gather);
  else batchedColumns(a, rows, columns, plan.cos, plan.sin);
}

const rowScratch = new Map<number, Float64Array>();

/** Row transforms of `source` into `target`'s rows `place[r]`, scaled and, with `mirror`, u → −u. */
function rowPass(
  target: Float64Array,
  source: Float64Array,
  rows: number,
  columns: number,
  place: Int32Array,
  scale: number,
  mirror: boolean,
): void {
  const plan = fftPlan(columns);
  const into = rowViews(target, 2 * columns);
  const from = rowViews(source, 2 * columns);
  if (scale === 1 && !mirror) {
    for (let r = 0; r < rows; r++) plan.forward(into[place[r]], from[r]);
    return;
  }
  let temp = rowScratch.get(columns);
  if (!temp) {
    temp = new Float64Array(2 * columns);
    rowScratch.set(columns, temp);
  }
  for (let r = 0; r < rows; r++) {
    plan.forward(temp, from[r]);
    const out = into[place[r]];
    out[0] = temp[0] * scale;
    out[1] = temp[1] * scale;
    for (let u = 1; u < columns; u++) {
      const s = 2 * (mirror ? columns - u : u);
      out[2 * u] = temp[s] * scale;
      out[2 * u + 1] = temp[s + 1] * scale;
    }
  }
}

/**
 * In-place column DFTs of `a` (`rows` a power of two, rows already in bit-reversed order): the
 * radix-2 DIT butterflies of stage `size` pair rows j and j + size/2 of each block with twiddle
 * e^(−i2πj/size); two consecutive stages are fused into one pass over four rows, one stage alone
 * first when the count is odd. Every butterfly runs along a whole row.
 */
function batchedColumns(
  a: Float64Array,
  rows: number,
  columns: number,
  cos: Float64Array,
  sin: Float64Array,
): void {
  const width = 2 * columns;
  let size = 2;
  if (Math.round(Math.log2(rows)) % 2 === 1) {
    for (let start = 0; start < rows; start += 2) {
      for (let p = start * width, q = p + width, end = p + width; p < end; p++, q++) {
        const x = a[p];
        const y = a[q];
        a[p] = x + y;
        a[q] = x - y;
      }
    }
    size = 4;
  }
  // Stages `size` (pairs h apart) and `2·size` (pairs size apart) in one pass.
  for (; 2 * size <= rows; size *= 4) {
    const h = size >> 1;
    const block = 2 * size;
    const step1 = rows / size;
    const step2 = rows / block;
    for (let start = 0; start < rows; start += block) {
      for (let j = 0; j < h; j++) {
        const w1r = cos[j * step1];
        const w1i = sin[j * step1];
        const w2r = cos[j * step2];
        const w2i = sin[j * step2];
        const w3r = cos[(j + h) * step2];
        const w3i = sin[(j + h) * step2];
        let p0 = (start + j) * width;
        let p1 = p0 + h * width;
        let p2 = p0 + size * width;
        let p3 = p2 + h * width;
        for (const end = p0 + width; p0 < end; p0 += 2, p1 += 2, p2 += 2, p3 += 2) {
          let tr = a[p1] * w1r - a[p1 + 1] * w1i;
          let ti = a[p1] * w1i + a[p1 + 1] * w1r;
          const a0r = a[p0] + tr;
          const a0i = a[p0 + 1] + ti;
          const a1r = a[p0] - tr;
          const a1i = a[p0 + 1] - ti;
          tr = a[p3] * w1r - a[p3 + 1] * w1i;
          ti = a[p3] * w1i + a[p3 + 1] * w1r;
          const a2r = a[p2] + tr;
          const a2i = a[p2 + 1] + ti;
          const a3r = a[p2] - tr;
          const a3i = a[p2 + 1] - ti;
          tr = a2r * w2r - a2i * w2i;
          ti = a2r * w2i + a2i * w2r;
          a[p0] = a0r + tr;
          a[p0 + 1] = a0i + ti;
          a[p2] = a0r - tr;
          a[p2 + 1] = a0i - ti;
          tr = a3r * w3r - a3i * w3i;
          ti = a3r * w3i + a3i * w3r;
          a[p1] = a1r + tr;
          a[p1 + 1] = a1i + ti;
          a[p3] = a1r - tr;
          a[p3 + 1] = a1i - ti;
        }
      }
    }
  }
}

/** In-place column DFTs by gathering each column (lengths that are not powers of two). */
function gatheredColumns(
  a: Float64Array,
  rows: number,
  columns: number,
  gather: NonNullable<ColumnPlan['gather']>,
): void {
  const { plan, input, output } = gather;
  for (let c = 0; c < columns; c++) {
    for (let r = 0, k = 2 * c; r < rows; r++, k += 2 * columns) {
      input[2 * r] = a[k];
      input[2 * r + 1] = a[k + 1];
    }
    plan.forward(output, input);
    for (let v = 0, k = 2 * c; v < rows; v++, k += 2 * columns) {
      a[k] = output[2 * v];
      a[k + 1] = output[2 * v + 1];
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
 * Written in plainFft2d's natural layout, [v, u] at v·nx + u. `weight` (centred order, e.g. a
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
      const t = 2 * (v * nx + u);
      out[t] = re * cr - im * ci;
      out[t + 1] = re * ci + im * cr;
    }
  }
  return out;
}

/**
 * A centred-order per-sample map (e.g. a sampling mask) in DC-first order and plainFft2d's
 * natural layout ([v, u] at v·nx + u): a permutation only.
 */
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
