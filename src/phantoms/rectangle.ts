import { PlacedShape } from './placed-shape.ts';
import { addRowTimesColumn, axisPhasors, type Placement } from './shape.ts';

/** Rectangle of full widths wx (along x before rotation) and wy, rotated by θ about its centre. */
export interface RectangleParams extends Placement {
  wx: number;
  wy: number;
}

/** sin(πt)/(πt), with sin(πt) taken after reducing t to [−½, ½] so zeros at integers are exact. */
export function sinc(t: number): number {
  if (t === 0) return 1;
  const n = Math.round(t);
  const s = Math.sin(Math.PI * (t - n));
  return (n % 2 === 0 ? s : -s) / (Math.PI * t);
}

/**
 * A filled rectangle (docs/references.md §1.5). Inside when |x′| ≤ wx/2 and |y′| ≤ wy/2 with x′, y′ the
 * rotated offsets of an ellipse (docs/references.md §1.1). Transform (standard pair, shift and rotation theorems):
 *   R(k) = ρ·wx·wy·sinc(wx k′x)·sinc(wy k′y)·e^(−i2π(kx x0 + ky y0)),  sinc(t) = sin(πt)/(πt).
 */
export class Rectangle extends PlacedShape {
  readonly kind = 'rectangle';
  readonly wx: number;
  readonly wy: number;
  protected readonly halfHeight: number;

  constructor(p: RectangleParams) {
    super('rectangle', p, [
      ['wx', p.wx],
      ['wy', p.wy],
    ]);
    this.wx = p.wx;
    this.wy = p.wy;
    this.halfHeight = 0.5 * (p.wx * Math.abs(this.sin) + p.wy * Math.abs(this.cos));
  }

  protected containsLocal(u: number, v: number): boolean {
    return Math.abs(u) <= 0.5 * this.wx && Math.abs(v) <= 0.5 * this.wy;
  }

  spanAtY(y: number, out: Float64Array): boolean {
    const dy = y - this.y0;
    out[0] = Number.NEGATIVE_INFINITY;
    out[1] = Number.POSITIVE_INFINITY;
    // |dx·cos + dy·sin| ≤ wx/2 and |−dx·sin + dy·cos| ≤ wy/2: two slabs in dx.
    if (!clipSlab(this.cos, dy * this.sin, 0.5 * this.wx, out)) return false;
    if (!clipSlab(-this.sin, dy * this.cos, 0.5 * this.wy, out)) return false;
    out[0] += this.x0;
    out[1] += this.x0;
    return true;
  }

  addTransform(kx: ArrayLike<number>, ky: ArrayLike<number>, out: Float64Array): void {
    const { wx, wy, x0, y0, cos, sin } = this;
    const scale = this.intensity * wx * wy;
    const n = kx.length;
    for (let i = 0; i < n; i++) {
      const fx = kx[i];
      const fy = ky[i];
      // sinc and the shift phase written out here: this loop is the cost of the bar phantoms.
      const tx = wx * (fx * cos + fy * sin);
      const ty = wy * (-fx * sin + fy * cos);
      const mag = scale * sinc(tx) * sinc(ty);
      const turns = fx * x0 + fy * y0;
      const phase = -2 * Math.PI * (turns - Math.round(turns));
      out[2 * i] += mag * Math.cos(phase);
      out[2 * i + 1] += mag * Math.sin(phase);
    }
  }

  addGridTransform(kx: Float64Array, ky: Float64Array, out: Float64Array): void {
    const { wx, wy, cos, sin } = this;
    const nx = kx.length;
    if (cos !== 0 && sin !== 0) {
      // A tilted rectangle does not factor into a column and a row term: evaluate row by row.
      const rowKy = new Float64Array(nx);
      for (let v = 0; v < ky.length; v++) {
        rowKy.fill(ky[v]);
        this.addTransform(kx, rowKy, out.subarray(2 * v * nx, 2 * (v + 1) * nx));
      }
      return;
    }
    // Axis-aligned (θ a multiple of 90°, one of cos, sin zero): R = ρ·[wx·wy·X(kx)]·Y(ky) with
    // X(kx) = sinc(wx·cos·kx)·sinc(wy·sin·kx)·e^(−i2πkx·x0), Y(ky) = sinc(wx·sin·ky)·sinc(wy·cos·ky)·e^(−i2πky·y0).
    const col = axisPhasors(kx, this.x0);
    const row = axisPhasors(ky, this.y0);
    const scale = this.intensity * wx * wy;
    for (let u = 0; u < nx; u++) {
      const f = scale * sinc(wx * cos * kx[u]) * sinc(wy * sin * kx[u]);
      col[2 * u] *= f;
      col[2 * u + 1] *= f;
    }
    for (let v = 0; v < ky.length; v++) {
      const f = sinc(wx * sin * ky[v]) * sinc(wy * cos * ky[v]);
      const rr = row[2 * v] * f;
      const ri = row[2 * v + 1] * f;
      if (rr === 0 && ri === 0) continue;
      addRowTimesColumn(out, 2 * v * nx, col, rr, ri);
    }
  }
}

/** Narrows [out[0], out[1]] to the dx with |slope·dx + offset| ≤ half; false when nothing is left. */
function clipSlab(slope: number, offset: number, half: number, out: Float64Array): boolean {
  if (slope === 0) return Math.abs(offset) <= half;
  const t1 = (-half - offset) / slope;
  const t2 = (half - offset) / slope;
  out[0] = Math.max(out[0], Math.min(t1, t2));
  out[1] = Math.min(out[1], Math.max(t1, t2));
  return out[0] <= out[1];
}
