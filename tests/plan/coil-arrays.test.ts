import { describe, expect, it } from 'vitest';
import { buildTable } from '../../src/plan/build-table.ts';
import type { CellResult } from '../../src/plan/cell-result.ts';
import { planCellCount, planCells } from '../../src/plan/plan-cells.ts';
import { tableToCsv } from '../../src/plan/table-csv.ts';
import { validatePlan } from '../../src/plan/validate-plan.ts';
import { caughtValidationError } from '../core/caught-validation-error.ts';
import { at, cellResult, handPlan, referencePosition } from './hand-made.ts';
import { smallPlanBody } from './small-plan.ts';

// Receive arrays as one more plan dimension and several targets (docs/design.md §4.4). The tables are
// made by hand, so the expected rows, columns and picks can be read off them.

const loops = { array: 'loops', count: 8, loopRadius: 0.35, ringRadius: 1.25 } as const;
const coilArrays = [{ array: 'uniform' as const }, loops];

/** A cell result of coil array `coilIndex`, with a g-factor where given. */
function coilCell(
  p: number,
  j: number,
  m: number,
  coilIndex: number,
  values: { lines: number; ssim: number; gMax?: number; seed?: number },
): CellResult {
  return {
    ...cellResult({ ...at(p, j, m), coilIndex }, values),
    coils: coilIndex === 0 ? 'uniform' : '8 loops',
    coilCount: coilIndex === 0 ? 1 : 8,
    ...(values.gMax === undefined
      ? {}
      : { gFactor: { mean: 1.1, p95: values.gMax - 0.05, max: values.gMax, method: 'analytic' as const } }),
  };
}

function reference(): CellResult {
  return { ...cellResult(referencePosition, { lines: 256, ssim: 1, nrmse: 0, psnr: null }), coilIndex: 0 };
}

describe('plan cells over coil arrays', () => {
  it('(1 reference + patterns × R × methods × arrays) × seeds cells; each cell carries its array', () => {
    const plan = validatePlan(smallPlanBody({ coilArrays }), { checkMasks: false });
    const cells = planCells(plan);
    // (1 + 2 patterns × 3 R × 1 method × 2 arrays) × 2 seeds = 26
    expect(cells.length).toBe(26);
    expect(planCellCount(plan)).toBe(26);
    expect(cells[0].coils).toEqual({ array: 'uniform' });
    expect(
      cells.filter((c) => c.coilIndex === 1).every((c) => 'array' in c.coils && c.coils.array === 'loops'),
    ).toBe(true);
    expect(cells.filter((c) => c.coilIndex === 1).length).toBe(12);
    // Without coilArrays the plan is today's: (1 + 6) × 2 = 14 cells, all uniform.
    const plain = planCells(validatePlan(smallPlanBody(), { checkMasks: false }));
    expect(plain.length).toBe(14);
    expect(plain.every((c) => 'array' in c.coils && c.coils.array === 'uniform')).toBe(true);
  });

  it('schema errors name the array and the target: coilArrays[1].count 33, a task score without lesions', () => {
    const bad = caughtValidationError(() =>
      validatePlan(smallPlanBody({ coilArrays: [{ array: 'uniform' }, { ...loops, count: 33 }] })),
    );
    expect(bad.problems.map((p) => p.field)).toEqual(['coilArrays[1].count']);
    const reserved = caughtValidationError(() =>
      validatePlan(smallPlanBody({ targets: [{ metric: 'contrastRecovery', atLeast: 0.9 }] })),
    );
    expect(reserved.problems[0]).toMatchObject({ field: 'targets[0].metric' });
    expect(reserved.problems[0].message).toMatch(/task score/);
    const g = caughtValidationError(() =>
      validatePlan(smallPlanBody({ targets: [{ metric: 'gFactorMax', atMost: 0.5 }] })),
    );
    expect(g.problems[0]).toMatchObject({ field: 'targets[0].atMost' });
  });
});

describe('table rows per coil array', () => {
  const plan = handPlan({
    patterns: [{ pattern: 'cartesian-uniform' }],
    accelerations: [2, 4],
    methods: [{ name: 'zero-filled' }],
    seeds: 2,
    coilArrays,
  });
  const results = [
    reference(),
    { ...reference(), seed: 2 },
    coilCell(0, 0, 0, 0, { lines: 128, ssim: 0.95 }),
    coilCell(0, 0, 0, 0, { lines: 128, ssim: 0.95, seed: 2 }),
    coilCell(0, 0, 0, 1, { lines: 128, ssim: 0.96, gMax: 1.2 }),
    coilCell(0, 0, 0, 1, { lines: 128, ssim: 0.96, gMax: 1.4, seed: 2 }),
    coilCell(0, 1, 0, 0, { lines: 64, ssim: 0.92 }),
    coilCell(0, 1, 0, 0, { lines: 64, ssim: 0.92, seed: 2 }),
    coilCell(0, 1, 0, 1, { lines: 64, ssim: 0.93, gMax: 2.0 }),
    coilCell(0, 1, 0, 1, { lines: 64, ssim: 0.93, gMax: 2.2, seed: 2 }),
  ];

  it('one row per pattern × R × method × array, labelled, with the g-factor means over seeds', () => {
    const table = buildTable(plan, results);
    expect(table.rows.map((r) => [r.key, r.coils, r.coilCount])).toEqual([
      ['reference', 'uniform', 1],
      ['p0-r0-m0', 'uniform', 1],
      ['p0-r0-m0-c1', '8 loops', 8],
      ['p0-r1-m0', 'uniform', 1],
      ['p0-r1-m0-c1', '8 loops', 8],
    ]);
    expect(table.cells).toEqual({ done: 10, total: 10 });
    const r2 = table.rows[2];
    expect(r2.gFactorMax).toBeCloseTo(1.3, 14); // mean of 1.2 and 1.4
    expect(r2.gFactorMean).toBeCloseTo(1.1, 14);
    expect(r2.gFactorMethod).toBe('analytic');
    expect([table.rows[1].gFactorMax, table.rows[1].gFactorMethod]).toEqual([null, null]);
    const csv = tableToCsv(table).split('\r\n');
    const header = csv[0].split(',');
    for (const name of ['coils', 'coil_count', 'g_factor_mean', 'g_factor_max', 'g_factor_method'])
      expect(header).toContain(name);
    const row = csv[3].split(',');
    expect(row[header.indexOf('coils')]).toBe('8 loops');
    expect(row[header.indexOf('g_factor_max')]).toBe('1.3000');
    expect(csv[2].split(',')[header.indexOf('g_factor_max')]).toBe('');
  });

  it('the recommendation meets every target: SSIM ≥ 0.9 alone picks R = 4, with gFactorMax ≤ 1.5 it is the loops at R = 2', () => {
    const ssimOnly = buildTable({ ...plan, target: { metric: 'ssim', atLeast: 0.9 } }, results);
    expect(ssimOnly.recommendation.overall?.key).toBe('p0-r1-m0-c1'); // shorter scan, better SSIM (0.93 > 0.92)
    const both = buildTable(
      {
        ...plan,
        target: { metric: 'ssim', atLeast: 0.9 },
        targets: [{ metric: 'gFactorMax', atMost: 1.5 }],
      },
      results,
    );
    expect(both.recommendation.overall?.key).toBe('p0-r0-m0-c1');
    expect(both.recommendation.targets).toEqual([
      { metric: 'ssim', atLeast: 0.9 },
      { metric: 'gFactorMax', atMost: 1.5 },
    ]);
    expect(both.recommendation.statement).toMatch(/SSIM ≥ 0\.9 and largest g-factor ≤ 1\.5/);
    // Rows without a g-factor cannot show they meet a g-factor target.
    expect(both.rows.filter((r) => r.meetsTarget).map((r) => r.key)).toEqual(['p0-r0-m0-c1']);
    const gOnly = buildTable({ ...plan, targets: [{ metric: 'gFactorMax', atMost: 1.1 }] }, results);
    expect(gOnly.recommendation.met).toBe(false);
    expect(gOnly.paretoMetric).toBe('nrmse');
  });
});
