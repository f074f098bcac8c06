/**
 * Quasi-static magnetic field of a circular current loop by numerical Biot–Savart integration,
 *   B(r) ∝ ∮ dl × (r − r′) / |r − r′|³        (μ0·I/4π dropped: sensitivities are normalised later),
 * with the loop r′(t) = centre + a·(cos t·u + sin t·v), t ∈ [0, 2π), u and v orthonormal and normal to
 * the loop axis. The integrand is smooth and periodic in t, so the midpoint rule on equal steps
 * converges geometrically (Trefethen & Weideman 2014, "The exponentially convergent trapezoidal rule"
 * — from memory): the error falls like e^(−N·d/a) at distance d from the wire, N the segment count.
 */
export interface CircularLoop {
  /** Centre (x, y, z), phantom units. */
  readonly centre: readonly [number, number, number];
  /** Two orthonormal vectors spanning the loop plane; u × v is the loop axis (current runs u → v). */
  readonly u: readonly [number, number, number];
  readonly v: readonly [number, number, number];
  readonly radius: number;
}

/**
 * Adds B(r) at the points (x[i], y[i], z[i]) to bx[i], by[i], bz[i] using `segments` equal steps.
 * Points on the wire itself give non-finite values; keep them a few segment lengths away.
 */
export function addLoopField(
  loop: CircularLoop,
  segments: number,
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  z: ArrayLike<number>,
  bx: Float64Array,
  by: Float64Array,
  bz: Float64Array,
): void {
  if (!Number.isInteger(segments) || segments < 4) {
    throw new RangeError(`segments must be an integer ≥ 4, got ${segments}`);
  }
  const { centre, u, v, radius: a } = loop;
  const dt = (2 * Math.PI) / segments;
  // Wire points and their dl, once per call (segments × 6 numbers).
  const px = new Float64Array(segments);
  const py = new Float64Array(segments);
  const pz = new Float64Array(segments);
  const lx = new Float64Array(segments);
  const ly = new Float64Array(segments);
  const lz = new Float64Array(segments);
  for (let k = 0; k < segments; k++) {
    const t = (k + 0.5) * dt;
    const c = Math.cos(t);
    const s = Math.sin(t);
    px[k] = centre[0] + a * (c * u[0] + s * v[0]);
    py[k] = centre[1] + a * (c * u[1] + s * v[1]);
    pz[k] = centre[2] + a * (c * u[2] + s * v[2]);
    lx[k] = a * dt * (-s * u[0] + c * v[0]);
    ly[k] = a * dt * (-s * u[1] + c * v[1]);
    lz[k] = a * dt * (-s * u[2] + c * v[2]);
  }
  for (let i = 0; i < x.length; i++) {
    const xi = x[i];
    const yi = y[i];
    const zi = z[i];
    let sx = 0;
    let sy = 0;
    let sz = 0;
    for (let k = 0; k < segments; k++) {
      const rx = xi - px[k];
      const ry = yi - py[k];
      const rz = zi - pz[k];
      const r2 = rx * rx + ry * ry + rz * rz;
      const inv = 1 / (r2 * Math.sqrt(r2));
      sx += (ly[k] * rz - lz[k] * ry) * inv;
      sy += (lz[k] * rx - lx[k] * rz) * inv;
      sz += (lx[k] * ry - ly[k] * rx) * inv;
    }
    bx[i] += sx;
    by[i] += sy;
    bz[i] += sz;
  }
}
