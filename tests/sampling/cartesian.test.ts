import { describe, expect, it } from 'vitest';
import { generateMask, lineDensityWeights, type SampledMask } from '../../sampling/index.ts';
import { inclusionProbabilities, systematicSample } from '../../sampling/unequal-probability-sampling.ts';
import { SeededRandom } from '../../src/core/random.ts';

/** Which rows of a ny×nx mask are sampled; also checks each row is all-or-nothing (a line is a row). */
function sampledRows(m: SampledMask): number[] {
  const rows: number[] = [];
  for (let r = 0; r < m.ny; r++) {
    let inRow = 0;
    for (let c = 0; c < m.nx; c++) inRow += m.mask[r * m.nx + c];
    expect(inRow === 0 || inRow === m.nx).toBe(true);
    if (inRow === m.nx) rows.push(r);
  }
  return rows;
}

describe('cartesian-uniform', () => {
  it('R = 2 without ACS samples every second row through the centre row ⌊ny/2⌋ (common practice)', () => {
    const m = generateMask({ nx: 16, ny: 256 }, { pattern: 'cartesian-uniform', acceleration: 2 });
    const rows = sampledRows(m);
    expect(rows).toEqual(Array.from({ length: 128 }, (_, i) => 2 * i));
    expect(m.acquired).toEqual({ count: 128, unit: 'lines' });
    expect(m.total).toBe(256);
    expect(m.acceleration).toEqual({ requested: 2, actual: 2 });
    expect(m.fraction).toBe(0.5);
    expect(m.acs).toBeNull();
    expect(m.representation).toBe('cartesian');
  });

  it('R = 1 samples every point (docs/design.md §3.4: R = total / acquired = 1)', () => {
    for (const [nx, ny] of [
      [32, 32],
      [17, 31],
    ]) {
      const m = generateMask({ nx, ny }, { pattern: 'cartesian-uniform', acceleration: 1 });
      expect(m.mask.every((v) => v === 1)).toBe(true);
      expect(m.acceleration.actual).toBe(1);
      expect(m.fraction).toBe(1);
    }
  });

  it('integer R = 4 on an odd matrix: rows ⌊ny/2⌋ ± 4j only', () => {
    const m = generateMask({ nx: 8, ny: 65 }, { pattern: 'cartesian-uniform', acceleration: 4 });
    const expected: number[] = [];
    for (let r = 0; r < 65; r++) if ((r - 32) % 4 === 0) expected.push(r);
    expect(sampledRows(m)).toEqual(expected);
  });

  it('fractional R = 2.5 gives a regular pattern with gaps of 2 and 3 rows, mean gap 2.5', () => {
    const m = generateMask({ nx: 4, ny: 200 }, { pattern: 'cartesian-uniform', acceleration: 2.5 });
    const rows = sampledRows(m);
    const gaps = rows.slice(1).map((r, i) => r - rows[i]);
    expect(new Set(gaps)).toEqual(new Set([2, 3]));
    // Offsets ⌊2.5·j + ½⌋ = 0, 3, 5, 8, 10, …: 2 and 3 alternate on each side of the centre row.
    expect(rows.filter((r) => r >= 100).slice(0, 5)).toEqual([100, 103, 105, 108, 110]);
    expect(rows.filter((r) => r <= 100).slice(-5)).toEqual([90, 92, 95, 97, 100]);
    expect(m.acquired.count).toBe(rows.length);
    expect(m.acceleration.actual).toBeCloseTo(200 / rows.length, 12);
    expect(Math.abs(m.acceleration.actual - 2.5)).toBeLessThan(0.05);
  });

  it('the ACS block is the acs central rows, counted in the total', () => {
    const m = generateMask({ nx: 8, ny: 256 }, { pattern: 'cartesian-uniform', acceleration: 4, acs: 24 });
    const rows = new Set(sampledRows(m));
    for (let r = 128 - 12; r < 128 + 12; r++) expect(rows.has(r)).toBe(true);
    // Every 4th row outside (64 rows) plus the 18 ACS rows not on the comb: 64 + 18 = 82.
    expect(m.acquired.count).toBe(82);
    expect(m.acceleration.actual).toBeCloseTo(256 / 82, 12);
    expect(m.acs).toEqual({ lines: 24 });
  });
});

describe('cartesian-random (Lustig, Donoho & Pauly 2007 polynomial variable density)', () => {
  it('exactly round(ny / R) whole rows in total, ACS included, for integer and fractional R', () => {
    for (const [ny, R, acs] of [
      [256, 4, 24],
      [256, 3.3, 0],
      [255, 6, 16],
      [320, 2.5, 32],
      [100, 1.5, 10],
    ]) {
      const m = generateMask({ nx: 12, ny }, { pattern: 'cartesian-random', acceleration: R, acs, seed: 5 });
      const rows = sampledRows(m);
      expect(rows.length).toBe(Math.round(ny / R));
      expect(m.acquired).toEqual({ count: Math.round(ny / R), unit: 'lines' });
      expect(m.acceleration.requested).toBe(R);
      expect(m.acceleration.actual).toBeCloseTo(ny / Math.round(ny / R), 12);
      const start = Math.floor(ny / 2) - Math.floor(acs / 2);
      for (let r = start; r < start + acs; r++) expect(rows).toContain(r);
    }
  });

  it('the same request gives the same bytes; other seeds give other masks with the same count', () => {
    const request = { pattern: 'cartesian-random', acceleration: 4, acs: 16, seed: 11 } as const;
    const a = generateMask({ nx: 64, ny: 256 }, request);
    const b = generateMask({ nx: 64, ny: 256 }, { ...request });
    expect(Buffer.from(a.mask).equals(Buffer.from(b.mask))).toBe(true);
    expect(Buffer.from(a.density!.buffer).equals(Buffer.from(b.density!.buffer))).toBe(true);
    for (const seed of [12, 13, 14]) {
      const c = generateMask({ nx: 64, ny: 256 }, { ...request, seed });
      expect(c.acquired.count).toBe(a.acquired.count);
      expect(Buffer.from(c.mask).equals(Buffer.from(a.mask))).toBe(false);
    }
  });

  it('density: 0 ≤ p ≤ 1, non-increasing away from the centre, 1 in the ACS, Σp = round(ny/R) (docs/references.md §3.3)', () => {
    const ny = 256;
    const m = generateMask({ nx: 1, ny }, { pattern: 'cartesian-random', acceleration: 4, acs: 20, seed: 3 });
    const p = m.density!;
    let sum = 0;
    for (let r = 0; r < ny; r++) {
      expect(p[r]).toBeGreaterThanOrEqual(0);
      expect(p[r]).toBeLessThanOrEqual(1);
      sum += p[r];
    }
    expect(Math.abs(sum - 64)).toBeLessThan(1e-6 * ny);
    for (let r = 118; r < 138; r++) expect(p[r]).toBe(1);
    for (let d = 1; d < 127; d++) {
      expect(p[128 + d + 1]).toBeLessThanOrEqual(p[128 + d] + 1e-15);
      expect(p[128 - d - 1]).toBeLessThanOrEqual(p[128 - d] + 1e-15);
    }
  });

  it('outside the ACS, p = min(1, s·(1 − r)^d) with one s (Lustig 2007 PDF; d = 2 default, d = 5 given)', () => {
    for (const power of [2, 5]) {
      const ny = 200;
      const m = generateMask(
        { nx: 1, ny },
        { pattern: 'cartesian-random', acceleration: 3, acs: 10, seed: 1, density: { power } },
      );
      const p = m.density!;
      // Independent re-statement of the law: r = |row − 100| / 100.
      const ratios: number[] = [];
      for (let row = 0; row < ny; row++) {
        const w = (1 - Math.abs(row - 100) / 100) ** power;
        if (Math.abs(row - 100) >= 5 && p[row] < 1 && w > 0) ratios.push(p[row] / w);
      }
      expect(ratios.length).toBeGreaterThan(100);
      for (const ratio of ratios) expect(ratio).toBeCloseTo(ratios[0], 12);
    }
  });

  it('each row is drawn with its stated probability (binomial check over 400 seeds, |z| < 5)', () => {
    const ny = 128;
    const draws = 400;
    const hits = new Float64Array(ny);
    let density: Float64Array = new Float64Array(0);
    for (let seed = 0; seed < draws; seed++) {
      const m = generateMask({ nx: 1, ny }, { pattern: 'cartesian-random', acceleration: 4, acs: 8, seed });
      for (let r = 0; r < ny; r++) hits[r] += m.mask[r];
      density = m.density!;
    }
    let worst = 0;
    for (let r = 0; r < ny; r++) {
      const p = density[r];
      const sd = Math.sqrt(draws * p * (1 - p) || 1e-300);
      if (p === 1 || p === 0) expect(hits[r]).toBe(draws * p);
      else worst = Math.max(worst, Math.abs(hits[r] - draws * p) / sd);
    }
    // 128 rows: P(max |z| ≥ 5) ≈ 128 · 5.7e-7 — a failure means the draw does not honour p.
    expect(worst).toBeLessThan(5);
  });

  it('inclusion probabilities saturate at 1 and still sum to m; systematic draws give exactly m', () => {
    const w = Float64Array.from([10, 9, 1, 1, 1, 1, 0, 0]);
    const pi = inclusionProbabilities(w, 4);
    // Two saturate (10 and 9), the rest share 2 over weight 4: s = 1/2.
    expect(Array.from(pi)).toEqual([1, 1, 0.5, 0.5, 0.5, 0.5, 0, 0]);
    const all = inclusionProbabilities(w, 7);
    expect(all.reduce((a, b) => a + b, 0)).toBeCloseTo(7, 12);
    expect(Array.from(all.subarray(0, 6))).toEqual([1, 1, 1, 1, 1, 1]);
    for (let seed = 0; seed < 50; seed++) {
      const chosen = systematicSample(pi, 4, new SeededRandom(seed));
      expect(chosen.reduce((a, b) => a + b, 0)).toBe(4);
      expect(chosen[0] + chosen[1]).toBe(2);
      expect(chosen[6] + chosen[7]).toBe(0);
    }
  });

  it('the weight is 1 on the centre row and 0 on the farthest (r = |ky| / max |ky|)', () => {
    const w = lineDensityWeights(256, 2);
    expect(w[128]).toBe(1);
    expect(w[0]).toBe(0);
    expect(w[64]).toBeCloseTo(0.25, 15);
  });
});
