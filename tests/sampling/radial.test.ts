import { describe, expect, it } from 'vitest';
import { GOLDEN_ANGLE, generateMask, nyquistSpokes, spokeAngles } from '../../sampling/index.ts';

const DEG = 180 / Math.PI;
const PHI = (1 + Math.sqrt(5)) / 2;

/** Distinct gap lengths (to 1e-9 rad) between sorted angles on the circle of circumference π. */
function distinctGaps(theta: Float64Array): number[] {
  const sorted = Array.from(theta).sort((a, b) => a - b);
  const gaps = sorted.map((t, i) => (i + 1 < sorted.length ? sorted[i + 1] : sorted[0] + Math.PI) - t);
  const distinct: number[] = [];
  for (const g of gaps.sort((a, b) => a - b)) {
    if (distinct.length === 0 || g - distinct[distinct.length - 1] > 1e-9) distinct.push(g);
  }
  return distinct;
}

describe('radial sampling, rasterised onto the grid', () => {
  it('Nyquist spoke count ⌈π/2·N⌉: 128 → 202, 256 → 403, 320 → 503 (docs/references.md §3.5 [C])', () => {
    expect(nyquistSpokes({ nx: 128, ny: 128 })).toBe(202);
    expect(nyquistSpokes({ nx: 256, ny: 256 })).toBe(403);
    expect(nyquistSpokes({ nx: 320, ny: 320 })).toBe(503);
    // N = max(nx, ny) for non-square matrices.
    expect(nyquistSpokes({ nx: 320, ny: 128 })).toBe(503);
  });

  it('spokes = ⌈Nyquist / R⌉, R counted in spokes (docs/design.md §3.4)', () => {
    for (const [n, R, spokes] of [
      [256, 1, 403],
      [256, 4, 101], // 403/4 = 100.75
      [128, 3, 68], // 202/3 = 67.33
      [320, 10, 51], // 503/10 = 50.3
    ]) {
      const m = generateMask(
        { nx: n, ny: n },
        { pattern: 'radial', acceleration: R, trajectory: 'rasterised' },
      );
      expect(m.acquired).toEqual({ count: spokes, unit: 'spokes' });
      expect(m.total).toBe(nyquistSpokes({ nx: n, ny: n }));
      expect(m.acceleration).toEqual({ requested: R, actual: m.total / spokes });
      expect(m.representation).toBe('radial-rasterised');
      expect(m.spokeAngles!.length).toBe(spokes);
    }
  });

  it('golden-angle increment ψ = 180°/φ = 111.2461° (Winkelmann et al. 2007; docs/references.md §3.5)', () => {
    expect(GOLDEN_ANGLE * DEG).toBeCloseTo(111.2461, 4);
    const m = generateMask(
      { nx: 128, ny: 128 },
      { pattern: 'radial', acceleration: 2, angles: 'golden', trajectory: 'rasterised' },
    );
    const theta = m.spokeAngles!;
    expect(theta[0]).toBe(0);
    for (let j = 1; j < theta.length; j++) {
      const step = (((theta[j] - theta[j - 1]) % Math.PI) + Math.PI) % Math.PI;
      expect(step * DEG).toBeCloseTo(111.24611797, 7);
      expect(theta[j]).toBeGreaterThanOrEqual(0);
      expect(theta[j]).toBeLessThan(Math.PI);
    }
  });

  it('three-gap theorem (Steinhaus conjecture; Sós 1958): golden spokes leave at most 3 distinct gaps, the largest the sum of the others', () => {
    for (let n = 2; n <= 700; n++) {
      const gaps = distinctGaps(spokeAngles(n, 'golden'));
      expect(gaps.length).toBeLessThanOrEqual(3);
      expect(gaps.length).toBeGreaterThanOrEqual(2);
      // The theorem also says the largest of three gaps is the sum of the other two.
      if (gaps.length === 3) expect(Math.abs(gaps[2] - gaps[0] - gaps[1])).toBeLessThan(1e-9);
    }
  });

  it('a Fibonacci number of golden spokes leaves exactly two gaps, in the ratio φ (three-gap theorem)', () => {
    for (const n of [2, 3, 5, 8, 13, 21, 34, 55, 89, 144, 233, 377, 610]) {
      const gaps = distinctGaps(spokeAngles(n, 'golden'));
      expect(gaps.length).toBe(2);
      expect(gaps[1] / gaps[0]).toBeCloseTo(PHI, 9);
    }
    // A non-Fibonacci count has three: 4 spokes → gaps of 0.236π, 0.146π and 0.382π (from 0, 0.618, 0.236, 0.854).
    expect(distinctGaps(spokeAngles(4, 'golden')).length).toBe(3);
  });

  it('uniform angles are j·180°/n: one gap of 180°/n', () => {
    const theta = spokeAngles(101, 'uniform');
    const gaps = distinctGaps(theta);
    expect(gaps.length).toBe(1);
    expect(gaps[0]).toBeCloseTo(Math.PI / 101, 12);
  });

  it('rasterisation: two uniform spokes (0° and 90°) give the centre row and the centre column', () => {
    // 403 Nyquist spokes at 256²: R = 201.5 → ⌈2⌉ = 2 spokes, at 0 and π/2. Samples t = −128 … 127:
    // the 0° spoke covers columns 0…255 of row 128; the 90° spoke (ky up = rows up) rows 128 − t = 1…256,
    // so row 0 (ky = +N/2, the far edge) is not on it and row 256 is off the grid.
    const n = 256;
    const m = generateMask(
      { nx: n, ny: n },
      { pattern: 'radial', acceleration: 201.5, trajectory: 'rasterised' },
    );
    expect(Array.from(m.spokeAngles!)).toEqual([0, Math.PI / 2]);
    let mismatches = 0;
    for (let v = 0; v < n; v++)
      for (let u = 0; u < n; u++)
        if (m.mask[v * n + u] !== (v === 128 || (u === 128 && v >= 1) ? 1 : 0)) mismatches++;
    expect(mismatches).toBe(0);
    expect(m.fraction).toBe((2 * n - 2) / (n * n));
  });

  it('rasterisation: a 45° spoke marks the main diagonal through the centre; non-square grids clip', () => {
    const m = generateMask(
      { nx: 64, ny: 64 },
      { pattern: 'radial', acceleration: 101 / 4, trajectory: 'rasterised' },
    );
    // Spokes at 0, 45, 90, 135 degrees. The 45° spoke (ky up = row down) visits (row, col) = (32 − t', 32 + t')
    // where t' = round(t·cos45°), t = −32…31, so the anti-diagonal cells of the picture are set.
    for (let t = -32; t < 32; t++) {
      const d = Math.round(t * Math.SQRT1_2);
      expect(m.mask[(32 - d) * 64 + 32 + d]).toBe(1);
      expect(m.mask[(32 - d) * 64 + 32 - d]).toBe(1);
    }
    const wide = generateMask(
      { nx: 64, ny: 32 },
      { pattern: 'radial', acceleration: 101 / 2, trajectory: 'rasterised' },
    );
    let column = 0;
    for (let v = 0; v < 32; v++) column += wide.mask[v * 64 + 32];
    expect(column).toBe(32);
  });

  it('every spoke passes through the k-space centre, which is sampled', () => {
    const m = generateMask(
      { nx: 96, ny: 80 },
      { pattern: 'radial', acceleration: 7, angles: 'golden', trajectory: 'rasterised' },
    );
    expect(m.mask[40 * 96 + 48]).toBe(1);
    expect(m.fraction).toBe(m.mask.reduce((a, b) => a + b, 0) / (96 * 80));
  });
});
