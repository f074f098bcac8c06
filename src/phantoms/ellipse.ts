import { discTransform } from './disc-transform.ts';
import { PlacedShape } from './placed-shape.ts';
import { axisPhasors, type Placement } from './shape.ts';

/** Ellipse with semi-axes a (along x before rotation) and b, rotated by θ about its centre. */
export interface EllipseParams extends Placement {
  a: number;
  b: number;
}

/**
 * A filled ellipse (docs/references.md §1.1–1.2). A point is inside when (x′/a)² + (y′/b)² ≤ 1 with
 *   x′ =  (x − x0)cosθ + (y − y0)sinθ,   y′ = −(x − x0)sinθ + (y − y0)cosθ.
 * Its transform (shift and rotation theorems applied to the scaled unit disc):
 *   k′x = kx cosθ + ky sinθ,  k′y = −kx sinθ + ky cosθ,  q = √((a k′x)² + (b k′y)²)
 *   E(k) = ρ·a·b·J1(2πq)/q · e^(−i2π(kx x0 + ky y0)),   E(0) = ρπab.
 */
export class Ellipse extends PlacedShape {
  readonly kind = 'ellipse';
  readonly a: number;
  readonly b: number;
  // Quadratic A·dx² + B·dx + C ≤ 0 on a horizontal line: A fixed, B = dy·bPerDy, C = dy²·cPerDy2 − 1.
  private readonly quadA: number;
  private readonly bPerDy: number;
  private readonly cPerDy2: number;
  protected readonly halfHeight: number;

  constructor(p: EllipseParams) {
    super('ellipse', p, [
      ['a', p.a],
      ['b', p.b],
    ]);
    this.a = p.a;
    this.b = p.b;
    const ia2 = 1 / (p.a * p.a);
    const ib2 = 1 / (p.b * p.b);
    const c = this.cos;
    const s = this.sin;
    this.quadA = c * c * ia2 + s * s * ib2;
    this.bPerDy = 2 * c * s * (ia2 - ib2);
    this.cPerDy2 = s * s * ia2 + c * c * ib2;
    this.halfHeight = Math.sqrt(p.a * p.a * s * s + p.b * p.b * c * c);
  }

  protected containsLocal(u: number, v: number): boolean {
    const ua = u / this.a;
    const vb = v / this.b;
    return ua * ua + vb * vb <= 1;
  }

  spanAtY(y: number, out: Float64Array): boolean {
    const dy = y - this.y0;
    const b = dy * this.bPerDy;
    const c = dy * dy * this.cPerDy2 - 1;
    const disc = b * b - 4 * this.quadA * c;
    if (disc < 0) return false;
    const root = Math.sqrt(disc);
    out[0] = this.x0 + (-b - root) / (2 * this.quadA);
    out[1] = this.x0 + (-b + root) / (2 * this.quadA);
    return true;
  }

  addTransform(kx: ArrayLike<number>, ky: ArrayLike<number>, out: Float64Array): void {
    const { a, b, x0, y0, cos, sin } = this;
    const scale = this.intensity * a * b;
    const shifted = x0 !== 0 || y0 !== 0;
    const n = kx.length;
    for (let i = 0; i < n; i++) {
      const fx = kx[i];
      const fy = ky[i];
      const u = a * (fx * cos + fy * sin);
      const v = b * (-fx * sin + fy * cos);
      const mag = scale * discTransform(Math.sqrt(u * u + v * v));
      if (!shifted) {
        out[2 * i] += mag;
        continue;
      }
      // Shift phase reduced to one turn first, so large frequencies keep their accuracy.
      const turns = fx * x0 + fy * y0;
      const phase = -2 * Math.PI * (turns - Math.round(turns));
      out[2 * i] += mag * Math.cos(phase);
      out[2 * i + 1] += mag * Math.sin(phase);
    }
  }

  /** ρ·a·b·J1(2πq)/q at one frequency: the transform without its shift phase. */
  private magnitudeAt(fx: number, fy: number): number {
    const u = this.a * (fx * this.cos + fy * this.sin);
    const v = this.b * (-fx * this.sin + fy * this.cos);
    return this.intensity * this.a * this.b * discTransform(Math.sqrt(u * u + v * v));
  }

  addGridTransform(kx: Float64Array, ky: Float64Array, out: Float64Array): void {
    const nx = kx.length;
    const ny = ky.length;
    const colPhase = axisPhasors(kx, this.x0);
    const rowPhase = axisPhasors(ky, this.y0);
    // q is the same at k and −k, so on axes mirrored about their centres (as every k-space grid is)
    // J1 — the cost here — is evaluated once per pair of rows v and 2·cy − v.
    const cx = mirrorCentre(kx);
    const cy = mirrorCentre(ky);
    const mirrored = cx >= 0 && cy >= 0;
    const magnitudes = new Float64Array(nx);
    const partner = new Float64Array(nx);
    const lastRow = mirrored ? cy : ny - 1;
    for (let v = 0; v <= lastRow; v++) {
      for (let u = 0; u < nx; u++) magnitudes[u] = this.magnitudeAt(kx[u], ky[v]);
      addPhasedRow(out, v, magnitudes, colPhase, rowPhase);
      const pv = 2 * cy - v;
      if (!mirrored || pv === v || pv >= ny) continue;
      for (let u = 0; u < nx; u++) {
        const pu = 2 * cx - u;
        partner[u] = pu < nx ? magnitudes[pu] : this.magnitudeAt(kx[u], ky[pv]);
      }
      addPhasedRow(out, pv, partner, colPhase, rowPhase);
    }
  }
}

/** Index c with k[c] = 0 and k[c + d] = −k[c − d] wherever both exist (c = ⌊n/2⌋), or −1. */
function mirrorCentre(k: Float64Array): number {
  const c = Math.floor(k.length / 2);
  if (k.length === 0 || k[c] !== 0) return -1;
  for (let d = 1; c + d < k.length && c - d >= 0; d++) if (k[c + d] !== -k[c - d]) return -1;
  return c;
}

/** Adds magnitude[u]·colPhase[u]·rowPhase[v] to row v of the interleaved grid. */
function addPhasedRow(
  out: Float64Array,
  v: number,
  magnitude: Float64Array,
  colPhase: Float64Array,
  rowPhase: Float64Array,
): void {
  const nx = magnitude.length;
  const rr = rowPhase[2 * v];
  const ri = rowPhase[2 * v + 1];
  const base = 2 * v * nx;
  for (let u = 0; u < nx; u++) {
    const cr = colPhase[2 * u];
    const ci = colPhase[2 * u + 1];
    out[base + 2 * u] += magnitude[u] * (cr * rr - ci * ri);
    out[base + 2 * u + 1] += magnitude[u] * (cr * ri + ci * rr);
  }
}
