import { describe, expect, it } from 'vitest';
import { coilArrayMaps } from '../../src/coils/coil-array.ts';
import { analyticCoilKspace } from '../../src/coils/coil-kspace.ts';
import {
  evaluateTrigPolynomial,
  fitTrigPolynomial,
  type TrigPolynomialMaps,
} from '../../src/coils/trig-fit.ts';
import { fft2c } from '../../src/core/centered-fft.ts';
import { createComplexImage } from '../../src/core/complex-image.ts';
import { phantomGridKspace } from '../../src/phantoms/grid-kspace.ts';
import type { Phantom } from '../../src/phantoms/phantom.ts';
import { resolutionContrast } from '../../src/phantoms/resolution-contrast.ts';
import { sheppLoganModified } from '../../src/phantoms/shepp-logan.ts';

/** One coil whose polynomial is the single harmonic e^(i2π(p·x + q·y)/T), coefficient 1. */
function harmonic(order: number, periodFactor: number, p: number, q: number): TrigPolynomialMaps {
  const m = 2 * order + 1;
  const coefficients = new Float64Array(2 * m * m);
  coefficients[2 * ((q + order) * m + p + order)] = 1;
  return { coils: 1, order, periodFactor, coefficients };
}

/** A phantom seen only through kspaceAt (the path for phantoms without a grid fast path). */
function pointwise(phantom: Phantom): Phantom {
  return {
    name: phantom.name,
    description: phantom.description,
    rasterize: (nx, ny, options) => phantom.rasterize(nx, ny, options),
    kspaceAt: (kx, ky) => phantom.kspaceAt(kx, ky),
  };
}

describe('analytic coil k-space as a sum of shifted analytic transforms (Guerquin-Kern et al. 2012)', () => {
  for (const phantom of [sheppLoganModified(), resolutionContrast(), pointwise(sheppLoganModified())]) {
    for (const [nx, ny] of [
      [32, 24],
      [17, 15],
    ]) {
      it(`polynomial 1 gives exactly phantomGridKspace (${phantom.name}${'shapes' in phantom ? '' : ', pointwise'}, ${ny}×${nx}, L = 1, 2, 3)`, () => {
        const expected = phantomGridKspace(phantom, nx, ny);
        for (const periodFactor of [1, 2, 3]) {
          for (const order of [0, 2]) {
            const coil = analyticCoilKspace(phantom, harmonic(order, periodFactor, 0, 0), nx, ny);
            let mismatches = 0;
            for (let i = 0; i < expected.data.length; i++)
              if (coil.data[i] !== expected.data[i]) mismatches++;
            expect(mismatches).toBe(0);
          }
        }
      });
    }
  }

  it('a single harmonic with period 2 shifts the grid k-space by whole samples (y[v][u] = G[v + q][u − p])', () => {
    const phantom = sheppLoganModified();
    const [nx, ny] = [20, 16];
    const grid = phantomGridKspace(phantom, nx, ny);
    for (const [p, q] of [
      [1, 0],
      [0, 1],
      [-2, 1],
    ]) {
      const coil = analyticCoilKspace(phantom, harmonic(2, 1, p, q), nx, ny);
      let compared = 0;
      for (let v = 0; v < ny; v++) {
        for (let u = 0; u < nx; u++) {
          const sv = v + q;
          const su = u - p;
          if (sv < 0 || sv >= ny || su < 0 || su >= nx) continue;
          expect(coil.data[2 * (v * nx + u)]).toBe(grid.data[2 * (sv * nx + su)]);
          expect(coil.data[2 * (v * nx + u) + 1]).toBe(grid.data[2 * (sv * nx + su) + 1]);
          compared++;
        }
      }
      expect(compared).toBeGreaterThan(200);
    }
  });

  it('matches fft2c(S_fit · raster) at low frequencies for an 8-loop array (central 33×33, 128², ss = 8)', () => {
    const phantom = sheppLoganModified();
    const n = 128;
    const maps = coilArrayMaps({ array: 'loops', count: 8, loopRadius: 0.35, ringRadius: 1.25 }, n, n);
    const fit = fitTrigPolynomial(maps, { order: 6, periodFactor: 2 });
    const fitted = evaluateTrigPolynomial(fit, n, n);
    const analytic = analyticCoilKspace(phantom, fit, n, n);
    const raster = phantom.rasterize(n, n, { supersample: 8 }).data;
    const px = n * n;
    const centre = n / 2;
    let worst = 0;
    for (let c = 0; c < 8; c++) {
      const image = createComplexImage(n, n);
      for (let i = 0; i < px; i++) {
        image.data[2 * i] = fitted.data[2 * (c * px + i)] * raster[i];
        image.data[2 * i + 1] = fitted.data[2 * (c * px + i) + 1] * raster[i];
      }
      const dft = fft2c(image);
      let error = 0;
      let norm = 0;
      for (let v = centre - 16; v <= centre + 16; v++) {
        for (let u = centre - 16; u <= centre + 16; u++) {
          const i = 2 * (v * n + u);
          const a = 2 * (c * px + v * n + u);
          error += (dft.data[i] - analytic.data[a]) ** 2 + (dft.data[i + 1] - analytic.data[a + 1]) ** 2;
          norm += analytic.data[a] ** 2 + analytic.data[a + 1] ** 2;
        }
      }
      worst = Math.max(worst, Math.sqrt(error / norm));
    }
    // Single coil at 128², ss = 8: 1.0 % (tests/phantoms/raster-dft.test.ts). Measured here: 1.17 % (worst coil).
    expect(worst).toBeLessThan(0.015);
  });
});
