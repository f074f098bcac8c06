import { describe, expect, it } from 'vitest';
import { buildTable, type TablePlan } from '../../src/plan/build-table.ts';
import type { CellResult } from '../../src/plan/cell-result.ts';
import { at, cellResult, handPlan, referencePosition } from './hand-made.ts';

// The recommendation rule is the project's own (issue requirements): shortest mean scan meeting the
// target, per method and overall; otherwise the closest row; deterministic tie-breaks. The tables
// below are made by hand so the expected pick can be read off them.

type Cells = Array<[string, number, number, number]>; // [key, lines, ssim, nrmse]

function table(cells: Cells, target: TablePlan['target']) {
  const results: CellResult[] = [
    cellResult(referencePosition, { lines: 256, ssim: 1, nrmse: 0, psnr: null }),
  ];
  for (const [key, lines, ssim, nrmse] of cells) {
    const [, p, j, m] = /^p(\d)-r(\d)-m(\d)$/.exec(key)!.map(Number);
    results.push(cellResult(at(p, j, m), { lines, ssim, nrmse }));
  }
  return buildTable(handPlan({ target }), results);
}

const cells: Cells = [
  ['p0-r0-m0', 128, 0.85, 0.2],
  ['p0-r0-m1', 128, 0.93, 0.08],
  ['p0-r1-m0', 64, 0.7, 0.3],
  ['p0-r1-m1', 64, 0.88, 0.12],
  ['p1-r0-m0', 128, 0.9, 0.1],
  ['p1-r0-m1', 128, 0.95, 0.06],
  ['p1-r1-m0', 64, 0.75, 0.25],
  ['p1-r1-m1', 64, 0.91, 0.09],
];

describe('recommendation', () => {
  it('met: shortest scan meeting SSIM ≥ 0.9 overall and per method (the bound itself counts)', () => {
    const { recommendation: rec, rows } = table(cells, { metric: 'ssim', atLeast: 0.9 });
    expect(rec.met).toBe(true);
    expect(rec.overall?.key).toBe('p1-r1-m1');
    expect(rec.overall?.scanSeconds).toBe(32);
    expect(rec.overall?.timeSavedPct).toBe(75);
    expect(rec.closest).toBeNull();
    expect(rec.perMethod.map((m) => [m.method, m.pick?.key])).toEqual([
      ['zero-filled', 'p1-r0-m0'], // SSIM exactly 0.9 meets "at least 0.9"
      ['cs-tv', 'p1-r1-m1'],
    ]);
    expect(rec.statement).toBe(
      'Shortest scan meeting SSIM ≥ 0.9: poisson-disc, R = 4, cs-tv: 0:32 (75.0 % shorter than fully sampled), SSIM 0.9100.',
    );
    expect(rows.filter((r) => r.meetsTarget).map((r) => r.key)).toEqual([
      'reference',
      'p0-r0-m1',
      'p1-r0-m0',
      'p1-r0-m1',
      'p1-r1-m1',
    ]);
  });

  it('met with a lower-is-better metric: NRMSE ≤ 0.1', () => {
    const rec = table(cells, { metric: 'nrmse', atMost: 0.1 }).recommendation;
    expect(rec.overall?.key).toBe('p1-r1-m1');
    expect(rec.perMethod[0].pick?.key).toBe('p1-r0-m0');
    expect(rec.statement).toMatch(/^Shortest scan meeting NRMSE ≤ 0\.1: /);
  });

  it('not met: a plain statement that nothing meets it, with the closest row overall and per method', () => {
    const rec = table(cells, { metric: 'ssim', atLeast: 0.99 }).recommendation;
    expect(rec.met).toBe(false);
    expect(rec.overall).toBeNull();
    expect(rec.closest?.key).toBe('p1-r0-m1');
    expect(rec.perMethod.map((m) => [m.pick, m.closest?.key])).toEqual([
      [null, 'p1-r0-m0'],
      [null, 'p1-r0-m1'],
    ]);
    expect(rec.statement).toBe(
      'Nothing in this plan meets SSIM ≥ 0.99. Closest: poisson-disc, R = 2, cs-tv: 1:04 (50.0 % shorter than fully sampled), SSIM 0.9500.',
    );
  });

  it('the fully sampled reference row is the baseline, never the pick', () => {
    const rec = table(cells, { metric: 'ssim', atLeast: 0.999 }).recommendation;
    expect(rec.overall).toBeNull();
    expect(rec.closest?.key).not.toBe('reference');
  });

  it('ties on scan time go to the better metric, then to plan order', () => {
    const betterLater: Cells = cells.map(([k, l, s, n]) => [
      k,
      l,
      k === 'p1-r1-m1' ? 0.92 : k === 'p0-r1-m1' ? 0.91 : s,
      n,
    ]);
    expect(table(betterLater, { metric: 'ssim', atLeast: 0.9 }).recommendation.overall?.key).toBe('p1-r1-m1');
    const equal: Cells = cells.map(([k, l, s, n]) => [k, l, k === 'p0-r1-m1' ? 0.91 : s, n]);
    expect(table(equal, { metric: 'ssim', atLeast: 0.9 }).recommendation.overall?.key).toBe('p0-r1-m1');
  });

  it('ties for the closest row go to the shorter scan, then plan order', () => {
    const tied: Cells = cells.map(([k, l, s, n]) => [k, l, k === 'p1-r1-m1' ? 0.95 : s, n]);
    expect(table(tied, { metric: 'ssim', atLeast: 0.99 }).recommendation.closest?.key).toBe('p1-r1-m1');
    const allSame: Cells = cells.map(([k, l, , n]) => [k, l, 0.5, n]);
    const rec = table(allSame, { metric: 'ssim', atLeast: 0.99 }).recommendation;
    expect(rec.closest?.key).toBe('p0-r1-m0');
  });

  it('PSNR target: +∞ (exact reconstruction) meets any bound', () => {
    const results = [
      cellResult(referencePosition, { lines: 256, ssim: 1, psnr: null }),
      cellResult(at(0, 0, 0), { lines: 128, ssim: 1, psnr: null }),
      cellResult(at(0, 1, 0), { lines: 64, ssim: 0.8, psnr: 28 }),
    ];
    const plan = handPlan({
      patterns: [{ pattern: 'cartesian-uniform' }],
      methods: [{ name: 'zero-filled' }],
    });
    const rec = buildTable({ ...plan, target: { metric: 'psnr', atLeast: 40 } }, results).recommendation;
    expect(rec.overall?.key).toBe('p0-r0-m0');
    expect(rec.statement).toMatch(/PSNR \(dB\) ∞\.$/);
  });
});
