import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  acquiredHankelSpectrum,
  hardThresholdCoefficient,
  hardThresholdRank,
} from '../../scripts/tuning/rank-spectrum.ts';
import { maxAbsDifference } from '../error-measures.ts';

/**
 * The spectrum rank rule of lowrank-hankel against numpy and scipy (Debian python3-numpy,
 * python3-scipy): tests/reference/fixtures/hard-threshold.json, written by
 * tests/reference/generate_hard_threshold_fixture.py — the exact ω(β) = λ*(β)/√μ_β of Gavish &
 * Donoho 2014 (docs/references.md §5.3) and the singular values of explicit block-Hankel
 * matrices of the complete windows of masked k-space.
 */
interface SpectrumCase {
  nx: number;
  ny: number;
  kernel: [number, number];
  weighting: 'none' | 'gradient';
  z: number[];
  mask: number[];
  rows: number;
  singularValues: number[];
  omega: number;
  rank: number;
}

const fixture: { omega: { beta: number; omega: number }[]; spectrum: SpectrumCase[] } = JSON.parse(
  readFileSync(new URL('../reference/fixtures/hard-threshold.json', import.meta.url), 'utf8'),
);

describe('optimal hard threshold for unknown noise (Gavish & Donoho 2014)', () => {
  it('the cubic ω(β) stays within 0.012 of the exact λ*(β)/√μ_β (scipy) for β = 0.01 … 1; ω(1) ≈ 2.858', () => {
    for (const { beta, omega } of fixture.omega) {
      // measured: largest gap 0.011 at β = 0.01
      expect(Math.abs(hardThresholdCoefficient(beta) - omega)).toBeLessThan(0.012);
    }
    // The paper's square-matrix constant 2.858 (from memory), also the exact value of the fixture.
    expect(fixture.omega.at(-1)?.omega).toBeCloseTo(2.858, 3);
  });

  it('refuses β outside (0, 1] (a programming mistake, not a request error)', () => {
    expect(() => hardThresholdCoefficient(0)).toThrow(RangeError);
    expect(() => hardThresholdCoefficient(1.5)).toThrow(RangeError);
  });
});

describe('acquiredHankelSpectrum: the complete windows of masked k-space against numpy.linalg.svd', () => {
  for (const c of fixture.spectrum) {
    it(`${c.ny}×${c.nx}, window ${c.kernel.join('×')}, '${c.weighting}': rows, singular values (1e-9) and the rank`, () => {
      const spectrum = acquiredHankelSpectrum(
        Float64Array.from(c.z),
        Uint8Array.from(c.mask),
        c.nx,
        c.ny,
        c.kernel,
        c.weighting,
      );
      expect(spectrum.rows).toBe(c.rows);
      expect(spectrum.columns).toBe(c.kernel[0] * c.kernel[1]);
      const gap = maxAbsDifference(spectrum.singularValues, c.singularValues) / c.singularValues[0];
      expect(gap).toBeLessThan(1e-9);
      // The fixture's signal ranks (3 exponentials unweighted; gradient-weighted 2 → 6) sit far from
      // the threshold, so the cubic ω and the exact one agree on them.
      expect(hardThresholdRank(spectrum)).toBe(c.rank);
    });
  }

  it('no rank from fewer complete rows than columns (too little acquired to estimate the noise level)', () => {
    const nx = 12;
    const ny = 12;
    const mask = new Uint8Array(nx * ny);
    for (let i = 0; i < mask.length; i += 2) mask[i] = 1; // no 2×2 window complete
    const spectrum = acquiredHankelSpectrum(
      new Float64Array(2 * nx * ny).fill(1),
      mask,
      nx,
      ny,
      [3, 3],
      'none',
    );
    expect(spectrum.rows).toBe(0);
    expect(hardThresholdRank(spectrum)).toBeNull();
  });
});
