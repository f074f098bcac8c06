import { degreesCosSin, type Placement, type Shape } from './shape.ts';
import { checkFinite } from './validate.ts';

/**
 * What the primitives share: the validated placement (centre, rotation, intensity), the rotation's
 * cos and sin, the point test in the shape's own frame
 *   x′ = (x − x0)cosθ + (y − y0)sinθ,  y′ = −(x − x0)sinθ + (y − y0)cosθ
 * (docs/references.md §1.1), and the vertical extent from the half height a subclass computes.
 */
export abstract class PlacedShape implements Shape {
  abstract readonly kind: Shape['kind'];
  readonly x0: number;
  readonly y0: number;
  readonly thetaDeg: number;
  readonly intensity: number;
  protected readonly cos: number;
  protected readonly sin: number;

  /** `sizes`: the shape's own lengths in field order, each checked finite and positive. */
  protected constructor(kind: Shape['kind'], p: Placement, sizes: ReadonlyArray<[string, number]>) {
    checkFinite(p.x0, `${kind}.x0`);
    checkFinite(p.y0, `${kind}.y0`);
    for (const [name, value] of sizes) checkFinite(value, `${kind}.${name}`, true);
    checkFinite(p.thetaDeg ?? 0, `${kind}.thetaDeg`);
    checkFinite(p.intensity, `${kind}.intensity`);
    this.x0 = p.x0;
    this.y0 = p.y0;
    this.thetaDeg = p.thetaDeg ?? 0;
    this.intensity = p.intensity;
    [this.cos, this.sin] = degreesCosSin(this.thetaDeg);
  }

  /** Half the height of the shape's bounding box, y0 ± this. */
  protected abstract readonly halfHeight: number;

  /** Whether (x′, y′) in the shape's own frame lies inside. */
  protected abstract containsLocal(u: number, v: number): boolean;

  contains(x: number, y: number): boolean {
    const dx = x - this.x0;
    const dy = y - this.y0;
    return this.containsLocal(dx * this.cos + dy * this.sin, -dx * this.sin + dy * this.cos);
  }

  yRange(out: Float64Array): void {
    out[0] = this.y0 - this.halfHeight;
    out[1] = this.y0 + this.halfHeight;
  }

  /**
   * The primitives write their own point loops (`addTransform`) with the magnitude inlined: these
   * loops are the cost of the analytic k-space, and a shared loop calling back per point is slower.
   */
  abstract addTransform(kx: ArrayLike<number>, ky: ArrayLike<number>, out: Float64Array): void;
  abstract spanAtY(y: number, out: Float64Array): boolean;
  abstract addGridTransform(kx: Float64Array, ky: Float64Array, out: Float64Array): void;
}
