import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { buildTable } from '../../src/plan/build-table.ts';
import type { CellResult } from '../../src/plan/cell-result.ts';
import { planTableSchema } from '../../src/plan/plan-table.ts';
import { runPlan } from '../../src/plan/run-plan.ts';
import { tableToCsv } from '../../src/plan/table-csv.ts';
import { validatePlan } from '../../src/plan/validate-plan.ts';
import { caughtValidationError } from '../core/caught-validation-error.ts';
import { at, cellResult, handPlan, referencePosition } from './hand-made.ts';
import { smallPlanBody } from './small-plan.ts';

// Task-score targets (the project's own rule, issue requirements): every target must be met; the
// shortest scan that meets them all is recommended, and the target that ruled out the shorter scans
// is named. Hand-made rows so the pick can be read off them.

function withFidelity(result: CellResult, contrastRecovery: number, falseLesions: number): CellResult {
  return {
    ...result,
    fidelity: { contrastRecovery, falseLesions, detectability: 10, resolvedFraction: 1 },
  };
}

// [key, lines, contrast recovery, false lesions]; scan seconds = 0.5 × lines.
const cells: Array<[string, number, number, number]> = [
  ['p0-r0-m0', 128, 0.95, 0], // meets both
  ['p0-r1-m0', 96, 0.85, 0], // fails contrast recovery only
  ['p1-r1-m1', 64, 0.93, 2], // fails false lesions only
  ['p1-r0-m1', 128, 0.97, 0], // meets both, same time as p0-r0-m0 with the better first target: the pick
];

function table(targets: unknown[]) {
  const results = [
    withFidelity(cellResult(referencePosition, { lines: 256, ssim: 1, nrmse: 0, psnr: null }), 1, 0),
  ];
  for (const [key, lines, cr, fl] of cells) {
    const [, p, j, m] = /^p(\d)-r(\d)-m(\d)$/.exec(key)!.map(Number);
    results.push(withFidelity(cellResult(at(p, j, m), { lines, ssim: 0.9 }), cr, fl));
  }
  return buildTable(handPlan({ targets } as never), results);
}

describe('task-score targets', () => {
  it('contrast recovery ≥ 0.9 and zero false lesions: both honoured, false lesions decided it', () => {
    const t = table([
      { metric: 'contrastRecovery', atLeast: 0.9 },
      { metric: 'falseLesions', atMost: 0 },
    ]);
    const rec = t.recommendation;
    expect(rec.met).toBe(true);
    expect(rec.overall?.key).toBe('p1-r0-m1');
    expect(rec.targets).toHaveLength(2);
    // Without the false-lesion target the 64-line row would win; without contrast recovery the 96-line one.
    expect(rec.decidedBy).toEqual({ metric: 'falseLesions', atMost: 0 });
    expect(rec.statement).toBe(
      'Shortest scan meeting contrast recovery ≥ 0.9 and false lesions ≤ 0: poisson-disc, R = 2, ' +
        'cs-tv: 1:04 (50.0 % shorter than fully sampled), contrast recovery 0.970. ' +
        'Decided by false lesions ≤ 0: without it, poisson-disc, R = 4, cs-tv: 0:32 ' +
        '(75.0 % shorter than fully sampled), false lesions 2.00 would be chosen.',
    );
    expect(t.rows.filter((r) => r.meetsTarget).map((r) => r.key)).toEqual([
      'reference',
      'p0-r0-m0',
      'p1-r0-m1',
    ]);
    expect(planTableSchema.safeParse(t).success).toBe(true);
  });

  it('a target on contrast recovery alone: the 64-line row wins and the statement names the deciding target', () => {
    const rec = table([{ metric: 'contrastRecovery', atLeast: 0.9 }]).recommendation;
    expect(rec.overall?.key).toBe('p1-r1-m1');
    expect(rec.decidedBy).toBeNull(); // nothing shorter than 64 lines
    expect(rec.statement).toMatch(/The shortest scan in the plan meets every target\.$/);
  });

  it('the fidelity column group: mean ± sd over seeds, and CSV columns', () => {
    const t = table([{ metric: 'falseLesions', atMost: 0 }]);
    const row = t.rows.find((r) => r.key === 'p1-r1-m1')!;
    expect(row.fidelity?.falseLesions).toEqual({ mean: 2, sd: 0 });
    expect(row.fidelity?.contrastRecovery.mean).toBe(0.93);
    const records = parse(tableToCsv(t), { columns: true }) as Record<string, string>[];
    expect(records[0].contrast_recovery_mean).toBe('1.00000');
    expect(records.find((r) => r.requested_r === '4.00' && r.method === 'cs-tv')?.false_lesions_mean).toBe(
      '2.0000',
    );
  });

  it('a task-score target without lesions is refused naming the field', async () => {
    const error = await caughtValidationError(() =>
      validatePlan(smallPlanBody({ targets: [{ metric: 'contrastRecovery', atLeast: 0.9 }] })),
    );
    expect(error.problems.map((p) => p.field)).toContain('targets[0].metric');
  });
});

describe('a plan with lesions through the real pipeline (64×64, noiseless)', () => {
  it('the reference row recovers 1, uniform R = 2 without ACS recovers 1/2, the targets pick R = 2', async () => {
    const table = await runPlan(
      smallPlanBody({
        matrix: { nx: 64, ny: 64 },
        patterns: [{ pattern: 'cartesian-uniform' }],
        accelerations: [2],
        seeds: 1,
        lesions: { count: 2, diameter: 3, contrast: 0.1, seed: 1 },
        targets: [
          { metric: 'contrastRecovery', atLeast: 0.4 },
          { metric: 'falseLesions', atMost: 100 },
        ],
      }),
    );
    const [reference, halved] = table.rows;
    // Full sampling: 1 up to the neighbour’s ringing; R = 2 without ACS: 1/2 (PSF ½(δ(0) + δ(N/2))).
    expect(Math.abs((reference.fidelity?.contrastRecovery.mean ?? 0) - 1)).toBeLessThan(1e-4);
    expect(Math.abs((halved.fidelity?.contrastRecovery.mean ?? 0) - 0.5)).toBeLessThan(1e-3);
    expect(table.recommendation.overall?.key).toBe(halved.key);
    expect(table.recommendation.targets).toHaveLength(2);
  });
});
