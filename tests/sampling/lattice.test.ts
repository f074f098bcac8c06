import { describe, expect, it } from 'vitest';
import { generateMask, latticeAliasOffsets, maskDiagnostics, parseSampling } from '../../sampling/index.ts';
import { coilArrayMaps } from '../../src/coils/coil-array.ts';
import { SenseFoldSolver, senseGFactorMap } from '../../src/coils/sense-g-factor.ts';
import type { CoilMaps } from '../../src/encoding/multi-coil.ts';
import { caughtValidationError } from '../core/caught-validation-error.ts';

const lattice = (acceleration: number, rows: number, shift: number, acs = 0) =>
  parseSampling({ pattern: 'lattice', acceleration, rows, shift, acs });

describe('lattice sampling of the ky–kz plane: counts and exact R (lattice determinant, worked by hand)', () => {
  it('48×48, R = 4, rows 2, shift 1: 48·48/4 = 576 points, R exactly 4', () => {
    const m = generateMask({ nx: 48, ny: 48 }, lattice(4, 2, 1));
    expect(m.acquired).toEqual({ count: 576, unit: 'points' });
    expect(m.acceleration.actual).toBe(4);
    // Every second ky row (even ky = v − 24), and in it every second kz, alternating start column.
    expect(m.mask[24 * 48 + 24]).toBe(1); // the centre
    expect(m.mask[24 * 48 + 25]).toBe(0);
    expect(m.mask[25 * 48 + 24]).toBe(0); // odd ky: empty row
    expect(m.mask[26 * 48 + 24]).toBe(0); // ky = 2: lattice row 1, shifted by 1
    expect(m.mask[26 * 48 + 25]).toBe(1);
  });

  it('with a 16×16 ACS square: 576 + (256 − 64 lattice points already inside) = 768 points, R = 3', () => {
    // Inside the square ky = −8…7 (8 even rows) × kz = −8…7 (8 of 16 columns per row) = 64 lattice points.
    const m = generateMask({ nx: 48, ny: 48 }, lattice(4, 2, 1, 16));
    expect(m.acquired.count).toBe(768);
    expect(m.acceleration.actual).toBe(3);
    expect(m.acs).toEqual({ size: [16, 16] });
  });

  it('R = 6, rows 3 on 36×30: 36·30/6 = 180 points for every shift', () => {
    for (const shift of [0, 1]) {
      const m = generateMask({ nx: 30, ny: 36 }, lattice(6, 3, shift));
      expect(m.acquired.count).toBe(180);
      expect(m.acceleration.actual).toBe(6);
    }
  });

  it('R not a multiple of rows, or a shift of a whole kz step, is refused naming the fields', () => {
    const notMultiple = caughtValidationError(() => generateMask({ nx: 48, ny: 48 }, lattice(3, 2, 0)));
    expect(notMultiple.problems.map((p) => p.field)).toEqual(['sampling.acceleration', 'sampling.rows']);
    const wholeStep = caughtValidationError(() => generateMask({ nx: 48, ny: 48 }, lattice(4, 2, 2)));
    expect(wholeStep.problems[0].field).toBe('sampling.shift');
    expect(wholeStep.problems[0].allowed).toBe('0 ≤ shift ≤ 1');
    expect(
      caughtValidationError(() => parseSampling({ pattern: 'lattice', acceleration: 2.5, rows: 1 }))
        .problems[0].field,
    ).toBe('sampling.acceleration');
  });
});

/** Pixels (row, column) where |PSF| is its peak value 1, as "row,col" strings. */
function peakPositions(psf: Float64Array, nx: number): string[] {
  const out: string[] = [];
  for (let i = 0; i < psf.length; i++) if (psf[i] > 1 - 1e-9) out.push(`${Math.floor(i / nx)},${i % nx}`);
  return out.sort();
}

describe('lattice PSF: the aliases sit on the reciprocal lattice, sheared by the shift (Fourier shift theorem)', () => {
  it('48×48, R = 6, rows 2: shift 0 folds to Δz = 0, 16, 32 with Δy = 0, 24; shift 1 moves Δy by −48·j/6', () => {
    const n = 48;
    for (const shift of [0, 1]) {
      const d = maskDiagnostics(generateMask({ nx: n, ny: n }, lattice(6, 2, shift)));
      const offsets = latticeAliasOffsets(n, n, { acceleration: 6, rows: 2, shift });
      const predicted = [];
      for (let k = 0; k < 6; k++) {
        predicted.push(`${(24 + offsets[2 * k]) % n},${(24 + offsets[2 * k + 1]) % n}`);
      }
      // A lattice's PSF is exactly R peaks of height 1 (the sum of R unit phasors is zero elsewhere).
      expect(peakPositions(d.psf.data, n)).toEqual(predicted.sort());
      let elsewhere = 0;
      for (let i = 0; i < d.psf.data.length; i++)
        if (d.psf.data[i] < 1 - 1e-9) elsewhere = Math.max(elsewhere, d.psf.data[i]);
      expect(elsewhere).toBeLessThan(1e-12);
    }
    // Hand-worked: shift 1, j = 1 (Δz = 16): Δy = 24·i − 8 ≡ 16 or 40; j = 2 (Δz = 32): Δy ≡ 8 or 32.
    expect(Array.from(latticeAliasOffsets(n, n, { acceleration: 6, rows: 2, shift: 1 }))).toEqual([
      0, 0, 24, 0, 40, 16, 16, 16, 32, 32, 8, 32,
    ]);
  });
});

/**
 * SENSE g-factor of a lattice (Pruessmann et al. 1999; the lattice idea from Breuer et al. 2006): every
 * pixel folds with the pixels at the lattice's alias offsets, so each pixel's g comes from the C×R matrix
 * of the sensitivities at its alias set (SenseFoldSolver, src/coils/sense-g-factor.ts).
 */
function latticeGFactorMap(maps: CoilMaps, offsets: Int32Array): Float64Array {
  const { coils, nx, ny } = maps;
  const R = offsets.length / 2;
  const n = nx * ny;
  const solver = new SenseFoldSolver(coils, R);
  const s = new Float64Array(2 * coils * R);
  const values = new Float64Array(R);
  const g = new Float64Array(n);
  for (let y = 0; y < ny; y++) {
    for (let z = 0; z < nx; z++) {
      for (let k = 0; k < R; k++) {
        const pixel = ((y + offsets[2 * k]) % ny) * nx + ((z + offsets[2 * k + 1]) % nx);
        for (let c = 0; c < coils; c++) {
          s[2 * (c * R + k)] = maps.data[2 * (c * n + pixel)];
          s[2 * (c * R + k) + 1] = maps.data[2 * (c * n + pixel) + 1];
        }
      }
      if (!solver.gFactors(s, values)) throw new Error(`singular fold at ${y}, ${z}`);
      g[y * nx + z] = values[0]; // the zero offset is first: this pixel's own g
    }
  }
  return g;
}

function maxOf(values: Float64Array): number {
  let m = 0;
  for (const v of values) m = Math.max(m, v);
  return m;
}

describe('lattice g-factor with a loop array varying along both axes', () => {
  const n = 48;
  const maps = coilArrayMaps({ array: 'loops', count: 8, loopRadius: 0.35, ringRadius: 1.25 }, n, n);

  it('rows = R (one kz step) is plain row folding: the per-pixel alias sets give the analytic map', () => {
    const fromLattice = latticeGFactorMap(maps, latticeAliasOffsets(n, n, { acceleration: 4, rows: 4 }));
    const analytic = senseGFactorMap(maps, 4);
    let worst = 0;
    for (let i = 0; i < analytic.length; i++) worst = Math.max(worst, Math.abs(fromLattice[i] - analytic[i]));
    expect(worst).toBeLessThan(1e-10);
  });

  it('R = 4 as 2 × 2: the sheared lattice (shift 1) lowers max g (measured 1.2949 → 1.2406; rows alone 23.6)', () => {
    const plain = maxOf(
      latticeGFactorMap(maps, latticeAliasOffsets(n, n, { acceleration: 4, rows: 2, shift: 0 })),
    );
    const sheared = maxOf(
      latticeGFactorMap(maps, latticeAliasOffsets(n, n, { acceleration: 4, rows: 2, shift: 1 })),
    );
    const rowsOnly = maxOf(senseGFactorMap(maps, 4));
    // Measured values, slack ±0.001 (the Biot–Savart maps are deterministic).
    expect(Math.abs(plain - 1.2949)).toBeLessThan(1e-3);
    expect(Math.abs(sheared - 1.2406)).toBeLessThan(1e-3);
    expect(sheared).toBeLessThan(plain - 0.05);
    // Four-fold along ky alone folds pixels whose loops see them alike: far worse than either lattice.
    expect(Math.abs(rowsOnly - 23.62)).toBeLessThan(0.01);
  });
});
