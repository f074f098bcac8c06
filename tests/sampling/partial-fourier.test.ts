import { describe, expect, it } from 'vitest';
import { generateMask, parseSampling } from '../../sampling/index.ts';
import { caughtValidationError } from '../core/caught-validation-error.ts';

describe('partial Fourier in the sampling: which rows are acquired (worked by hand)', () => {
  it('fully sampled 256 rows at p = 0.625: rows 96…255 kept (⌈0.625·256⌉ = 160), R = 256/160 = 1.6', () => {
    const m = generateMask(
      { nx: 8, ny: 256 },
      parseSampling({ pattern: 'cartesian-uniform', acceleration: 1, partialFourier: 0.625 }),
    );
    expect(m.acquired).toEqual({ count: 160, unit: 'lines' });
    expect(m.acceleration).toEqual({ requested: 1, actual: 1.6 });
    expect(m.partialFourier).toEqual({ fraction: 0.625, firstRow: 96 });
    expect(m.mask[95 * 8]).toBe(0);
    expect(m.mask[96 * 8]).toBe(1);
    expect(m.mask[128 * 8]).toBe(1); // the centre row ⌊256/2⌋
    expect(m.fraction).toBe(160 / 256);
  });

  it('R = 2 with 16 ACS rows on 64 rows at p = 0.75: 32 + 8 rows, 24 + 6 of them kept (rows 16…63)', () => {
    // Even rows (offsets from 32 by 2): 32 rows; ACS rows 24…39 add the 8 odd ones. Kept: rows ≥ 16,
    // i.e. 24 even rows and all 8 odd ACS rows → 32. Hand count: even rows 16…62 = 24, odd 25…39 = 8.
    const m = generateMask(
      { nx: 4, ny: 64 },
      parseSampling({ pattern: 'cartesian-uniform', acceleration: 2, acs: 16, partialFourier: 0.75 }),
    );
    expect(m.acquired.count).toBe(32);
    expect(m.acceleration.actual).toBe(2);
  });

  it('odd ny: 0.6 of 65 rows keeps ⌈39⌉ = 39 rows, 26…64, which hold the centre row 32', () => {
    const m = generateMask(
      { nx: 3, ny: 65 },
      parseSampling({ pattern: 'cartesian-uniform', acceleration: 1, partialFourier: 0.6 }),
    );
    expect(m.partialFourier?.firstRow).toBe(26);
    expect(m.acquired.count).toBe(39);
  });

  it('a lattice keeps its points in the kept rows (48×48, R = 4, p = 0.75: 18 lattice rows × 24 = 432)', () => {
    // Kept rows 12…47 (⌈0.75·48⌉ = 36); lattice rows are even ky = v − 24, i.e. even v: 18 rows × 48/2 points.
    const m = generateMask(
      { nx: 48, ny: 48 },
      parseSampling({ pattern: 'lattice', acceleration: 4, rows: 2, shift: 1, partialFourier: 0.75 }),
    );
    expect(m.acquired).toEqual({ count: 432, unit: 'points' });
    expect(m.acceleration.actual).toBeCloseTo(2304 / 432, 12);
  });

  it('radial sampling has no partial Fourier: the field is refused by name (422)', () => {
    const error = caughtValidationError(() =>
      parseSampling({ pattern: 'radial', acceleration: 2, partialFourier: 0.75 }),
    );
    expect(error.problems[0].field).toBe('sampling.partialFourier');
  });

  it('fractions outside 0.5…1 are refused naming sampling.partialFourier', () => {
    for (const p of [0.4, 1.2]) {
      const error = caughtValidationError(() =>
        parseSampling({ pattern: 'cartesian-uniform', acceleration: 1, partialFourier: p }),
      );
      expect(error.problems[0].field).toBe('sampling.partialFourier');
    }
  });
});
