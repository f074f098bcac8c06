import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { cellResultSchema } from '../../src/plan/cell-result.ts';
import { planCells } from '../../src/plan/plan-cells.ts';
import { type PlanTable, planTableSchema } from '../../src/plan/plan-table.ts';
import { runCell } from '../../src/plan/run-cell.ts';
import { runPlan } from '../../src/plan/run-plan.ts';
import { tableToCsv } from '../../src/plan/table-csv.ts';
import { validatePlan } from '../../src/plan/validate-plan.ts';
import { smallPlanBody } from './small-plan.ts';

// End to end through sampling/, the analytic phantom, the acquisition and the reconstruction
// pipeline, on a small 32×32 matrix: 2 patterns × 2 R × zero-filled × 2 seeds (+ the reference).
const body = smallPlanBody({ accelerations: [2, 4], target: { metric: 'nrmse', atMost: 0.5 } });

/** The table without the wall-clock times, the one part that may differ between runs. */
function withoutTimes(table: PlanTable) {
  return { ...table, rows: table.rows.map(({ reconMs: _, ...row }) => row) };
}

describe('plan through the real pipeline (32×32)', () => {
  it('R = 1 zero-filled reference: zero time saved and zero error without noise (docs/design.md §4.4 reference row)', async () => {
    const table = await runPlan(body);
    const reference = table.rows[0];
    expect(reference.reference).toBe(true);
    expect(reference.timeSavedPct).toBe(0);
    // docs/references.md §8 [C] formula: TR 500 ms × 32 lines × 1 average = 16 s.
    expect(reference.scanSeconds).toBe(16);
    expect(reference.metrics.nrmse.mean).toBeLessThan(1e-12);
    expect(reference.metrics.hfen.mean).toBeLessThan(1e-12);
    expect(reference.metrics.ssim.mean).toBeCloseTo(1, 12);
    expect(reference.actualR).toBe(1);
    expect(table.rows.length).toBe(5);
  });

  it('scan time strictly decreases with R at a fixed pattern; zero-filled error grows with R', async () => {
    const table = await runPlan(body);
    // Lines from the pattern rules of DEVELOPERS.md, × TR 0.5 s (docs/references.md §8 formula):
    // cartesian-uniform R 2 → rows 0, 2, …, 30 plus ACS rows 15, 17 = 18 lines; R 4 → 8 + 3 ACS = 11;
    // cartesian-random draws exactly round(32 / R) lines: 16 and 8.
    const expectedSeconds = [
      [9, 5.5],
      [8, 4],
    ];
    for (const patternIndex of [0, 1]) {
      const rows = table.rows.filter((r) => r.patternIndex === patternIndex);
      expect(rows.map((r) => r.requestedR)).toEqual([2, 4]);
      expect(rows.map((r) => r.scanSeconds)).toEqual(expectedSeconds[patternIndex]);
      // Zero-filled NRMSE grows with R (issue check; aliasing energy grows as lines are dropped).
      expect(rows[1].metrics.nrmse.mean).toBeGreaterThan(rows[0].metrics.nrmse.mean as number);
      expect(rows[0].metrics.nrmse.mean).toBeGreaterThan(0.1);
    }
  });

  it('standard deviation: 0 for the deterministic uniform pattern, positive for random draws over 2 seeds', async () => {
    const table = await runPlan(body);
    for (const row of table.rows.filter((r) => r.patternIndex === 0)) expect(row.metrics.nrmse.sd).toBe(0);
    for (const row of table.rows.filter((r) => r.patternIndex === 1)) {
      expect(row.metrics.nrmse.sd).toBeGreaterThan(0);
    }
    const single = await runPlan({ ...body, seeds: 1 });
    expect(single.rows.every((r) => r.metrics.nrmse.sd === 0)).toBe(true);
  });

  it('the seed also draws the noise: with noise even the reference row varies over seeds', async () => {
    const table = await runPlan({
      ...body,
      patterns: [body.patterns[0]],
      accelerations: [2],
      noise: { snr: 20 },
    });
    expect(table.rows[0].metrics.nrmse.mean).toBeGreaterThan(0);
    expect(table.rows[0].metrics.nrmse.sd).toBeGreaterThan(0);
  });

  it('the same plan gives the same table (apart from reconstruction wall times)', async () => {
    const first = await runPlan(body);
    const second = await runPlan(body);
    expect(withoutTimes(second)).toEqual(withoutTimes(first));
  });

  it('runCell returns plain JSON (for worker threads) and its CSV reads back', async () => {
    const plan = validatePlan(body);
    const cell = planCells(plan)[4];
    const result = await runCell(plan, cell);
    expect(JSON.parse(JSON.stringify(result))).toEqual(result);
    expect(cellResultSchema.parse(result)).toEqual(result);
    expect(result.seed).toBe(cell.seed);

    const table = await runPlan(body);
    expect(planTableSchema.parse(JSON.parse(JSON.stringify(table)))).toEqual(table);
    const records = parse(tableToCsv(table), { columns: true }) as Record<string, string>[];
    expect(records.length).toBe(table.rows.length);
    records.forEach((record, i) => {
      expect(Number(record.scan_s)).toBeCloseTo(table.rows[i].scanSeconds, 3);
      expect(Number(record.nrmse_mean)).toBeCloseTo(table.rows[i].metrics.nrmse.mean ?? Number.NaN, 6);
    });
  });
});

describe('iteration columns: iterations run, the cap, converged (table and CSV)', () => {
  it('zero-filled has none; a cap of 3 leaves cs-wavelet unconverged; cs-tv with tolerance 0.01 stops early', async () => {
    const table = await runPlan(
      smallPlanBody({
        patterns: [{ pattern: 'cartesian-random', acs: 4 }],
        accelerations: [2],
        seeds: 2,
        methods: [
          { name: 'zero-filled' },
          { name: 'cs-wavelet', iterations: 3 },
          { name: 'cs-tv', iterations: 300, tolerance: 0.01 },
        ],
      }),
    );
    const [reference, zeroFilled, wavelet, tv] = table.rows;
    for (const row of [reference, zeroFilled]) {
      expect([row.iterationsRun, row.iterationLimit, row.converged]).toEqual([null, null, null]);
    }
    // 3 iterations cannot meet the default 1e-5 on both the iterate and the objective.
    expect([wavelet.iterationsRun, wavelet.iterationLimit, wavelet.converged]).toEqual([3, 3, false]);
    expect(tv.converged).toBe(true);
    expect(tv.iterationLimit).toBe(300);
    expect(tv.iterationsRun as number).toBeLessThan(300);
    const records = parse(tableToCsv(table), { columns: true }) as Record<string, string>[];
    expect(records.map((r) => [r.iterations_run, r.iteration_limit, r.converged])).toEqual([
      ['', '', ''],
      ['', '', ''],
      ['3.0', '3', 'false'],
      [(tv.iterationsRun as number).toFixed(1), '300', 'true'],
    ]);
  });
});

describe('a custom mask in a plan (32×32 PNG made with sharp)', () => {
  it('gives one row per method with requested R null and times the rows it samples', async () => {
    const { default: sharp } = await import('sharp');
    const pixels = new Uint8Array(32 * 32);
    for (let row = 0; row < 32; row++)
      if (row % 2 === 0 || Math.abs(row - 16) < 3) pixels.fill(255, row * 32, (row + 1) * 32);
    const png = await sharp(Buffer.from(pixels), { raw: { width: 32, height: 32, channels: 1 } })
      .png()
      .toBuffer();
    const table = await runPlan({
      ...body,
      patterns: [{ pattern: 'custom', maskPng: png.toString('base64') }],
      accelerations: [2, 4],
      seeds: 1,
    });
    expect(table.rows.map((r) => r.key)).toEqual(['reference', 'p0-m0']);
    const row = table.rows[1];
    expect(row.requestedR).toBeNull();
    // Rows 0, 2, …, 30 (16) plus the odd rows 15 and 17 next to the centre: 18 lines × 0.5 s = 9 s.
    expect(row.acquired).toBe(18);
    expect(row.scanSeconds).toBe(9);
    expect(row.actualR).toBeCloseTo(32 / 18, 12);
  });
});
