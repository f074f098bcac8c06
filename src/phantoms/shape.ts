/**
 * What a phantom needs from each of its primitives. A shape is a closed convex set with a constant
 * intensity; intensities of overlapping shapes add. Everything works on flat arrays so that a
 * phantom can be rasterised and transformed without per-pixel or per-point objects.
 */
export interface Shape {
  readonly kind: 'ellipse' | 'rectangle';
  /** Intensity added inside the shape. */
  readonly intensity: number;
  /** Whether the point (x, y) lies in the closed shape (published y-up frame). */
  contains(x: number, y: number): boolean;
  /** Lowest and highest y the shape reaches, written to out[0], out[1]. */
  yRange(out: Float64Array): void;
  /**
   * The closed x interval [out[0], out[1]] where the horizontal line at y crosses the shape
   * (one interval, since the shape is convex); returns false when the line misses it.
   */
  spanAtY(y: number, out: Float64Array): boolean;
  /**
   * Adds intensity × the exact continuous Fourier transform ∫ e^(−i2π(kx·x + ky·y)) dx dy over the
   * shape at the points (kx[i], ky[i]), cycles per unit, to out[2i] (re) and out[2i + 1] (im).
   */
  addTransform(kx: ArrayLike<number>, ky: ArrayLike<number>, out: Float64Array): void;
  /**
   * The same transform on the Cartesian product of two frequency axes: adds T(kx[u], ky[v]) to
   * out[2(v·nx + u)], out[2(v·nx + u) + 1] with nx = kx.length. Lets a shape factor out what is
   * separable (the shift phase, an axis-aligned rectangle's sincs) instead of working per point.
   */
  addGridTransform(kx: Float64Array, ky: Float64Array, out: Float64Array): void;
}

/** Parameters shared by the primitives: centre, counter-clockwise rotation from +x in degrees, intensity. */
export interface Placement {
  x0: number;
  y0: number;
  /** Counter-clockwise from +x, degrees (0 when absent). */
  thetaDeg?: number;
  intensity: number;
}

/** cos and sin of an angle in degrees, exact at multiples of 90° so axis-aligned shapes stay exact. */
export function degreesCosSin(deg: number): [number, number] {
  const quarter = deg / 90;
  if (Number.isInteger(quarter)) {
    const k = ((quarter % 4) + 4) % 4;
    return [
      [1, 0],
      [0, 1],
      [-1, 0],
      [0, -1],
    ][k] as [number, number];
  }
  const rad = (deg * Math.PI) / 180;
  return [Math.cos(rad), Math.sin(rad)];
}

/** e^(−i2π·k·x0) for each k of an axis, interleaved re/im: the shift phase, factored per axis on a grid. */
export function axisPhasors(k: Float64Array, x0: number): Float64Array {
  const out = new Float64Array(2 * k.length);
  for (let i = 0; i < k.length; i++) {
    const turns = k[i] * x0;
    const phase = -2 * Math.PI * (turns - Math.round(turns));
    out[2 * i] = Math.cos(phase);
    out[2 * i + 1] = Math.sin(phase);
  }
  return out;
}

/**
 * Adds one grid row of a separable transform: out[base + 2u…] += col[u] · (rr + i·ri) for every u of
 * the interleaved column factor `col` (a row factor of zero is skipped by the callers).
 */
export function addRowTimesColumn(
  out: Float64Array,
  base: number,
  col: Float64Array,
  rr: number,
  ri: number,
): void {
  for (let u = 0; 2 * u < col.length; u++) {
    const cr = col[2 * u];
    const ci = col[2 * u + 1];
    out[base + 2 * u] += cr * rr - ci * ri;
    out[base + 2 * u + 1] += cr * ri + ci * rr;
  }
}
