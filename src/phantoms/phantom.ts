import { ValidationError } from '../core/errors.ts';
import type { RealImage } from '../core/real-image.ts';
import { rasterizeShapes } from './rasterize.ts';
import type { Shape } from './shape.ts';
import { checkMatrix, checkSupersample } from './validate.ts';

export interface PhantomInfo {
  name: string;
  description: string;
}

export interface Phantom extends PhantomInfo {
  /** Raster on ny×nx (row 0 = top = largest y), optional supersample ss (ss×ss box average per pixel). */
  rasterize(nx: number, ny: number, options?: { supersample?: number }): RealImage;
  /** Exact continuous FT at points (kx[i], ky[i]) in cycles/unit, published y-up frame; interleaved re/im out. */
  kspaceAt(kx: ArrayLike<number>, ky: ArrayLike<number>): Float64Array;
}

/**
 * A phantom that is a sum of ellipses and rectangles with constant intensities, so that its raster
 * at any size and its exact Fourier transform at any frequency come from the same shape list.
 */
export class ShapePhantom implements Phantom {
  readonly name: string;
  readonly description: string;
  readonly shapes: readonly Shape[];

  constructor(name: string, description: string, shapes: readonly Shape[]) {
    this.name = name;
    this.description = description;
    this.shapes = shapes;
  }

  rasterize(nx: number, ny: number, options?: { supersample?: number }): RealImage {
    checkMatrix(nx, ny);
    const ss = options?.supersample ?? 1;
    checkSupersample(ss);
    return rasterizeShapes(this.shapes, nx, ny, ss);
  }

  kspaceAt(kx: ArrayLike<number>, ky: ArrayLike<number>): Float64Array {
    checkPoints(kx, ky);
    const out = new Float64Array(2 * kx.length);
    // Shape by shape over all points: each shape's constants stay in registers for the whole loop.
    for (const shape of this.shapes) shape.addTransform(kx, ky, out);
    return out;
  }

  /**
   * The exact transform on the Cartesian product of two frequency axes (cycles per unit): adds
   * K(kx[u], ky[v]) to element (v, u) of the ny×nx interleaved `out` (a new zeroed array when absent)
   * and returns it. Same values as kspaceAt at those points, with the separable parts factored out.
   */
  kspaceOnAxes(kx: Float64Array, ky: Float64Array, out?: Float64Array): Float64Array {
    checkFiniteAll(kx, 'kx');
    checkFiniteAll(ky, 'ky');
    const size = 2 * kx.length * ky.length;
    if (out && out.length !== size) {
      throw new RangeError(`out must hold 2·nx·ny = ${size} numbers, got ${out.length}`);
    }
    const target = out ?? new Float64Array(size);
    for (const shape of this.shapes) shape.addGridTransform(kx, ky, target);
    return target;
  }
}

function checkPoints(kx: ArrayLike<number>, ky: ArrayLike<number>): void {
  if (kx.length !== ky.length) {
    throw new ValidationError({
      field: 'points',
      message: `kx and ky must have the same length, got ${kx.length} and ${ky.length}`,
      allowed: 'pairs [kx, ky]',
    });
  }
  for (let i = 0; i < kx.length; i++) {
    if (!Number.isFinite(kx[i]) || !Number.isFinite(ky[i])) {
      throw new ValidationError({
        field: `points.${i}`,
        message: `frequencies must be finite numbers, got [${kx[i]}, ${ky[i]}]`,
        allowed: 'finite numbers (cycles per unit)',
      });
    }
  }
}

function checkFiniteAll(values: ArrayLike<number>, field: string): void {
  for (let i = 0; i < values.length; i++) {
    if (!Number.isFinite(values[i])) {
      throw new ValidationError({
        field: `${field}.${i}`,
        message: `must be a finite number, got ${values[i]}`,
        allowed: 'finite numbers (cycles per unit)',
      });
    }
  }
}
