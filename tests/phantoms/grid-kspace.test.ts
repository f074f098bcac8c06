import { describe, expect, it } from 'vitest';
import { ValidationError } from '../../src/core/errors.ts';
import { Ellipse } from '../../src/phantoms/ellipse.ts';
import { phantomGridKspace } from '../../src/phantoms/grid-kspace.ts';
import { type Phantom, ShapePhantom } from '../../src/phantoms/phantom.ts';
import { Rectangle } from '../../src/phantoms/rectangle.ts';
import { resolutionContrast } from '../../src/phantoms/resolution-contrast.ts';
import { sheppLogan, sheppLoganModified } from '../../src/phantoms/shepp-logan.ts';
import { maxAbsDifference } from '../error-measures.ts';

/** The grid by its definition (docs/design.md §3.3): K at kx = (u − ⌊nx/2⌋)/2, ky = −(v − ⌊ny/2⌋)/2, times √(nx·ny)/4. */
function gridByDefinition(phantom: Phantom, nx: number, ny: number): Float64Array {
  const kx = new Float64Array(nx * ny);
  const ky = new Float64Array(nx * ny);
  for (let v = 0; v < ny; v++) {
    for (let u = 0; u < nx; u++) {
      kx[v * nx + u] = (u - Math.floor(nx / 2)) / 2;
      ky[v * nx + u] = -(v - Math.floor(ny / 2)) / 2;
    }
  }
  const values = phantom.kspaceAt(kx, ky);
  const scale = Math.sqrt(nx * ny) / 4;
  return values.map((x) => x * scale);
}

const MIXED = new ShapePhantom('mixed', 'every shape kind and orientation', [
  new Ellipse({ x0: 0.1, y0: -0.2, a: 0.3, b: 0.2, thetaDeg: 25, intensity: 1 }),
  new Rectangle({ x0: -0.3, y0: 0.25, wx: 0.2, wy: 0.1, thetaDeg: 33, intensity: 0.7 }),
  new Rectangle({ x0: 0.4, y0: 0.3, wx: 0.25, wy: 0.05, thetaDeg: 90, intensity: 0.4 }),
  new Rectangle({ x0: -0.5, y0: -0.5, wx: 0.1, wy: 0.3, thetaDeg: 180, intensity: -0.2 }),
]);

describe('phantomGridKspace', () => {
  it('equals kspaceAt at every grid point of the docs/design.md §3.3 mapping, for every phantom and odd/even sizes (1e-12)', () => {
    for (const phantom of [sheppLogan(), sheppLoganModified(), resolutionContrast(), MIXED]) {
      for (const [nx, ny] of [
        [64, 48],
        [33, 31],
      ]) {
        const grid = phantomGridKspace(phantom, nx, ny);
        expect(grid.nx).toBe(nx);
        expect(grid.ny).toBe(ny);
        expect(maxAbsDifference(grid.data, gridByDefinition(phantom, nx, ny))).toBeLessThan(1e-12);
      }
    }
  });

  it('kspaceOnAxes equals kspaceAt on axes that are not mirrored about a centre as well', () => {
    const kx = Float64Array.from([-3.3, -1, 0, 0.25, 2.5, 7.75]);
    const ky = Float64Array.from([-2, 0, 0.5, 1.5, 4.2]);
    for (const phantom of [sheppLoganModified(), resolutionContrast(), MIXED]) {
      const grid = phantom.kspaceOnAxes(kx, ky);
      const px: number[] = [];
      const py: number[] = [];
      for (const y of ky) {
        for (const x of kx) {
          px.push(x);
          py.push(y);
        }
      }
      expect(maxAbsDifference(grid, phantom.kspaceAt(px, py))).toBeLessThan(1e-13);
    }
  });

  it('gives the same grid for a phantom seen only through the Phantom interface (generic path)', () => {
    const inner = resolutionContrast();
    const opaque: Phantom = {
      name: inner.name,
      description: inner.description,
      rasterize: (nx, ny, options) => inner.rasterize(nx, ny, options),
      kspaceAt: (kx, ky) => inner.kspaceAt(kx, ky),
    };
    expect(
      maxAbsDifference(phantomGridKspace(opaque, 40, 37).data, phantomGridKspace(inner, 40, 37).data),
    ).toBeLessThan(1e-12);
  });

  it('rejects bad matrix sizes with ValidationErrors naming matrix.nx / matrix.ny', () => {
    for (const [nx, ny, field] of [
      [0, 8, 'matrix.nx'],
      [8, 5000, 'matrix.ny'],
    ] as const) {
      let caught: unknown;
      try {
        phantomGridKspace(MIXED, nx, ny);
      } catch (error) {
        caught = error;
      }
      expect(caught).toBeInstanceOf(ValidationError);
      expect((caught as ValidationError).problems.map((p) => p.field)).toEqual([field]);
    }
  });
});
