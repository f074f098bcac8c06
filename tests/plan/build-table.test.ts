import { describe, expect, it } from 'vitest';
import { ValidationError } from '../../src/core/errors.ts';
import { buildTable } from '../../src/plan/build-table.ts';
import type { CellResult } from '../../src/plan/cell-result.ts';
import { at, cellResult, handPlan, referencePosition } from './hand-made.ts';

// Source: the table rules of docs/design.md §4.4 and DEVELOPERS.md ("Scan time and plans": reference row,
// plan order, mean and sample SD (n − 1) over seeds, Pareto front, notes); inputs are hand-made
// (tests/plan/hand-made.ts) so each expected value can be worked out on paper.

/** A full hand-made grid: 2 patterns × R ∈ {2, 4} × {zero-filled, cs-tv}, one seed, SSIM by hand. */
function grid(ssim: Record<string, number>): CellResult[] {
  const results = [cellResult(referencePosition, { lines: 256, ssim: 1, nrmse: 0, psnr: null, hfen: 0 })];
  for (const p of [0, 1]) {
    for (const [j, lines] of [128, 64].entries()) {
      for (const m of [0, 1])
        results.push(cellResult(at(p, j, m), { lines, ssim: ssim[`p${p}-r${j}-m${m}`] }));
    }
  }
  return results;
}

const ssimByHand = {
  'p0-r0-m0': 0.85,
  'p0-r0-m1': 0.93,
  'p0-r1-m0': 0.7,
  'p0-r1-m1': 0.88,
  'p1-r0-m0': 0.9,
  'p1-r0-m1': 0.95,
  'p1-r1-m0': 0.75,
  'p1-r1-m1': 0.91,
};

describe('tradeoff table on hand-made cell results', () => {
  it('reference row first, then plan order (pattern, R, method); time saved vs the fully sampled scan', () => {
    const table = buildTable(handPlan(), grid(ssimByHand));
    expect(table.rows.map((r) => r.key)).toEqual([
      'reference',
      'p0-r0-m0',
      'p0-r0-m1',
      'p0-r1-m0',
      'p0-r1-m1',
      'p1-r0-m0',
      'p1-r0-m1',
      'p1-r1-m0',
      'p1-r1-m1',
    ]);
    const reference = table.rows[0];
    expect(reference.reference).toBe(true);
    expect(reference.pattern).toBe('fully sampled');
    expect(reference.method).toBe('zero-filled');
    expect(reference.requestedR).toBe(1);
    // docs/references.md §8 [C]: TR 500 ms × 256 lines = 128 s = 2:08.
    expect(table.fullySampled.seconds).toBe(128);
    expect(reference.scanSeconds).toBe(128);
    expect(reference.timeSavedPct).toBe(0);
    // 128 of 256 lines → 64 s, 50 % saved; 64 lines → 32 s = 0:32, 75 % saved.
    expect(table.rows[1].scanSeconds).toBe(64);
    expect(table.rows[1].timeSavedPct).toBe(50);
    expect(table.rows[3].scanFormatted).toBe('0:32');
    expect(table.rows[3].timeSavedPct).toBe(75);
    expect(table.rows[1].requestedR).toBe(2);
    expect(table.rows[3].requestedR).toBe(4);
    expect(table.cells).toEqual({ done: 9, total: 9 });
  });

  it('the same results in another finishing order give the same table', () => {
    const results = grid(ssimByHand);
    const shuffled = [...results].reverse();
    expect(buildTable(handPlan(), shuffled)).toEqual(buildTable(handPlan(), results));
  });

  it('flags the Pareto front of scan time vs the target metric (SSIM higher is better)', () => {
    const table = buildTable(handPlan({ target: { metric: 'ssim', atLeast: 0.9 } }), grid(ssimByHand));
    expect(table.paretoMetric).toBe('ssim');
    expect(table.rows.filter((r) => r.pareto).map((r) => r.key)).toEqual([
      'reference',
      'p1-r0-m1',
      'p1-r1-m1',
    ]);
  });

  it('without a target the front uses NRMSE (lower is better) and there is no pick', () => {
    const table = buildTable(handPlan(), grid(ssimByHand));
    expect(table.paretoMetric).toBe('nrmse');
    // nrmse = 1 − ssim here, so the same rows are non-dominated.
    expect(table.rows.filter((r) => r.pareto).map((r) => r.key)).toEqual([
      'reference',
      'p1-r0-m1',
      'p1-r1-m1',
    ]);
    expect(table.recommendation.overall).toBeNull();
    expect(table.recommendation.statement).toMatch(/^No target given/);
    expect(table.rows.every((r) => r.meetsTarget === null)).toBe(true);
  });

  it('standard deviation: 0 for one seed; sample SD over two seeds (0.90, 0.94 → 0.04/√2)', () => {
    const one = buildTable(handPlan(), grid(ssimByHand));
    expect(one.rows[1].metrics.ssim).toEqual({ mean: 0.85, sd: 0 });
    expect(one.rows[1].seeds).toBe(1);

    const plan = handPlan({
      seeds: 2,
      patterns: [{ pattern: 'cartesian-random' }],
      methods: [{ name: 'cs-tv' }],
    });
    const results = [
      cellResult(referencePosition, { lines: 256, ssim: 1, psnr: null, seed: 1 }),
      cellResult(referencePosition, { lines: 256, ssim: 1, psnr: null, seed: 2 }),
      cellResult(at(0, 0, 0), { lines: 126, ssim: 0.9, seed: 1 }),
      cellResult(at(0, 0, 0), { lines: 130, ssim: 0.94, seed: 2 }),
    ];
    const row = buildTable(plan, results).rows[1];
    expect(row.seeds).toBe(2);
    expect(row.metrics.ssim.mean).toBeCloseTo(0.92, 15);
    expect(row.metrics.ssim.sd).toBeCloseTo(0.04 / Math.SQRT2, 15);
    // Random draws acquire a different count per seed: the row shows the means.
    expect(row.acquired).toBe(128);
    expect(row.scanSeconds).toBe(64);
    expect(buildTable(plan, results).rows[0].metrics.psnr).toEqual({ mean: null, sd: null });
  });

  it('a partial result set gives the rows that have results and the count done', () => {
    const results = grid(ssimByHand).slice(0, 4);
    const table = buildTable(handPlan(), results);
    expect(table.rows.map((r) => r.key)).toEqual(['reference', 'p0-r0-m0', 'p0-r0-m1', 'p0-r1-m0']);
    expect(table.cells).toEqual({ done: 4, total: 9 });
  });

  it('custom masks give one row per method with requested R null', () => {
    const plan = handPlan({
      patterns: [{ pattern: 'custom', maskPng: 'AAAA' }],
      methods: [{ name: 'cs-tv' }],
    });
    const table = buildTable(plan, [
      cellResult(referencePosition, { lines: 256, ssim: 1 }),
      { ...cellResult(at(0, null, 0), { lines: 80, ssim: 0.9 }), requestedR: null },
    ]);
    expect(table.rows[1].key).toBe('p0-m0');
    expect(table.rows[1].requestedR).toBeNull();
    expect(table.cells.total).toBe(2);
  });

  it('notes state the statistics and, when used, partial Fourier and infinite PSNR', () => {
    const plan = handPlan({ protocol: { ...handPlan().protocol, partialFourier: 0.75 } });
    const notes = buildTable(plan, grid(ssimByHand)).notes.join('\n');
    expect(notes).toMatch(/sample standard deviation \(n − 1\)/);
    expect(notes).toMatch(/Partial Fourier 0\.75/);
    expect(notes).toMatch(/PSNR is \+∞/);
  });

  it('a cell reported twice is refused', () => {
    const results = grid(ssimByHand);
    expect(() => buildTable(handPlan(), [...results, results[2]])).toThrow(ValidationError);
  });
});

describe('notes on how the plan counts time', () => {
  it('a point mask in a 2D protocol is flagged: each occupied row costs a whole line', () => {
    const results = [
      cellResult(referencePosition, { lines: 256, ssim: 1 }),
      {
        ...cellResult(at(1, 0, 0), { lines: 256, ssim: 0.8 }),
        mask: { acquired: 32768, unit: 'points', fraction: 0.5 },
      },
    ] as CellResult[];
    expect(buildTable(handPlan(), results).notes.join('\n')).toMatch(/dimensions '3d'/);
    const protocol3d = { ...handPlan().protocol, dimensions: '3d' } as const;
    expect(buildTable(handPlan({ protocol: protocol3d }), results).notes.join('\n')).not.toMatch(
      /dimensions '3d'/,
    );
  });
});
