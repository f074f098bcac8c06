import { describe, expect, it } from 'vitest';
import { coilArrayMaps } from '../../src/coils/coil-array.ts';
import {
  evaluateTrigPolynomial,
  fitTrigPolynomial,
  type TrigPolynomialMaps,
  trigFitError,
} from '../../src/coils/trig-fit.ts';
import { ValidationError } from '../../src/core/errors.ts';
import { coilFixture, gaussianArrayMaps } from './fixture.ts';

describe('trigonometric-polynomial fit of coil maps', () => {
  const f = coilFixture.gaussian_array;
  const maps = gaussianArrayMaps();

  for (const reference of coilFixture.trig_fit) {
    const { order, periodFactor, coil } = reference;
    it(`coefficients equal numpy.linalg.lstsq on the full 2D design (order ${order}, period ${2 * periodFactor})`, () => {
      const fit = fitTrigPolynomial(maps, { order, periodFactor });
      const m = 2 * order + 1;
      let diff = 0;
      let norm = 0;
      reference.coefficients.forEach(([re, im], k) => {
        const at = 2 * (coil * m * m + k);
        diff += (fit.coefficients[at] - re) ** 2 + (fit.coefficients[at + 1] - im) ** 2;
        norm += re * re + im * im;
      });
      // Coefficients are as well determined as the basis is conditioned: measured 1.3e-13 (order 3,
      // period 4), 8.7e-16 (order 2, period 2), 4.1e-9 (order 4, period 6, condition ≈ 2.5e4 per axis).
      expect(Math.sqrt(diff / norm)).toBeLessThan(periodFactor === 3 ? 1e-7 : 1e-11);
      const error = trigFitError(maps, evaluateTrigPolynomial(fit, f.nx, f.ny));
      expect(error.relative[coil]).toBeCloseTo(reference.relativeResidual, 10);
    });
  }

  it('recovers a map that is itself a trigonometric polynomial of the fitted order (to 1e-11)', () => {
    const order = 3;
    const m = 2 * order + 1;
    const coefficients = new Float64Array(2 * 2 * m * m);
    for (let k = 0; k < coefficients.length; k++) coefficients[k] = Math.sin(1 + 7 * k) / (1 + (k % 13));
    const truth: TrigPolynomialMaps = { coils: 2, order, periodFactor: 2, coefficients };
    const fit = fitTrigPolynomial(evaluateTrigPolynomial(truth, 21, 18), { order, periodFactor: 2 });
    let worst = 0;
    for (let k = 0; k < coefficients.length; k++)
      worst = Math.max(worst, Math.abs(fit.coefficients[k] - coefficients[k]));
    expect(worst).toBeLessThan(1e-11);
  });

  it('fit error of an 8-loop array falls with the order (period 4, over the central disc r ≤ 0.9)', () => {
    const nx = 64;
    const loops = coilArrayMaps({ array: 'loops', count: 8, loopRadius: 0.35, ringRadius: 1.25 }, nx, nx);
    const disc = new Uint8Array(nx * nx);
    for (let i = 0; i < nx; i++) {
      for (let j = 0; j < nx; j++) {
        const x = ((j - nx / 2) * 2) / nx;
        const y = (-(i - nx / 2) * 2) / nx;
        disc[i * nx + j] = x * x + y * y <= 0.81 ? 1 : 0;
      }
    }
    const worstAt = (order: number): number => {
      const fit = fitTrigPolynomial(loops, { order, periodFactor: 2 });
      return Math.max(...trigFitError(loops, evaluateTrigPolynomial(fit, nx, nx), disc).relative);
    };
    const e4 = worstAt(4);
    const e8 = worstAt(8);
    expect(e8).toBeLessThan(e4);
    expect(e4).toBeLessThan(0.04); // measured 0.024
    expect(e8).toBeLessThan(0.005); // measured 0.0023
  });

  it('refuses a basis too ill-conditioned to fit (order 12, period 6 on 64 points)', () => {
    const maps64 = coilArrayMaps({ array: 'gaussian', count: 2, width: 0.8, ringRadius: 1 }, 64, 64);
    expect(() => fitTrigPolynomial(maps64, { order: 12, periodFactor: 3 })).toThrow(/numerically dependent/);
    expect(() => fitTrigPolynomial(maps64, { order: 12, periodFactor: 2 })).not.toThrow();
  });

  it('refuses an order the grid cannot carry or out of range', () => {
    const small = coilArrayMaps({ array: 'uniform' }, 6, 6);
    for (const [options, field] of [
      [{ order: 3 }, 'coils.fit.order'],
      [{ order: -1 }, 'coils.fit.order'],
      [{ order: 1, periodFactor: 0 }, 'coils.fit.periodFactor'],
      [{ order: 1, periodFactor: 1.5 }, 'coils.fit.periodFactor'],
    ] as const) {
      try {
        fitTrigPolynomial(small, options);
        expect.unreachable('accepted bad input');
      } catch (error) {
        expect(error).toBeInstanceOf(ValidationError);
        expect((error as ValidationError).problems[0].field).toBe(field);
      }
    }
  });
});
