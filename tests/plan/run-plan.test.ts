import { describe, expect, it } from 'vitest';
import { generateMask } from '../../sampling/index.ts';
import { CancelledError, LimitError, ValidationError } from '../../src/core/errors.ts';
import { defaultLimits } from '../../src/core/limits.ts';
import type { CellResult } from '../../src/plan/cell-result.ts';
import type { PlanCell } from '../../src/plan/plan-cells.ts';
import { planCells } from '../../src/plan/plan-cells.ts';
import { cellScanColumns } from '../../src/plan/run-cell.ts';
import { type RunCellFn, runPlan } from '../../src/plan/run-plan.ts';
import type { Plan } from '../../src/plan/schema.ts';
import { validatePlan } from '../../src/plan/validate-plan.ts';
import { smallPlanBody } from './small-plan.ts';

// The sweep engine with an injected cell runner: real masks from sampling/ and the real scan-time
// model, synthetic image scores (a smooth function of R and the seed, so tables are predictable).
// The end-to-end run through the reconstruction pipeline is in plan-pipeline.test.ts.

const body = smallPlanBody;

const syntheticCell: RunCellFn = async (plan: Plan, cell: PlanCell): Promise<CellResult> => {
  const sampled = generateMask(plan.matrix, { ...cell.sampling, seed: cell.seed });
  const r = sampled.acceleration.actual;
  const wobble = cell.sampling.pattern === 'cartesian-random' ? 0.01 * cell.seed : 0;
  return {
    ...cellScanColumns(plan, cell, sampled),
    metrics: {
      nrmse: 0.05 * (r - 1) + wobble,
      psnr: r === 1 ? null : 40 / r,
      ssim: 1 - 0.05 * (r - 1),
      hfen: 0.1 * (r - 1),
    },
    reconMs: 1,
    notes: [],
  };
};

describe('runPlan with an injected cell runner', () => {
  it('cells = (reference + patterns × R × methods) × seeds, seeds 1…seeds, reference first', () => {
    const cells = planCells(validatePlan(body()));
    expect(cells.length).toBe((1 + 2 * 3 * 1) * 2);
    expect(cells.slice(0, 2).map((c) => [c.reference, c.seed, c.acceleration, c.method.name])).toEqual([
      [true, 1, 1, 'zero-filled'],
      [true, 2, 1, 'zero-filled'],
    ]);
    expect(cells.map((c) => c.index)).toEqual(cells.map((_, i) => i));
    expect(new Set(cells.map((c) => c.seed))).toEqual(new Set([1, 2]));
    expect(cells[2].sampling).toMatchObject({ pattern: 'cartesian-uniform', acceleration: 2, acs: 4 });
  });

  it('reports progress (done, total, ETA) and streams every cell', async () => {
    const progress: Array<[number, number, number | null]> = [];
    const streamed: number[] = [];
    const table = await runPlan(body(), {
      runCellFn: syntheticCell,
      onProgress: (done, total, eta) => progress.push([done, total, eta]),
      onCell: (result) => streamed.push(result.index),
    });
    expect(progress[0]).toEqual([0, 14, null]);
    expect(progress.map((p) => p[0])).toEqual(Array.from({ length: 15 }, (_, i) => i));
    expect(progress.every(([, total]) => total === 14)).toBe(true);
    expect(progress.slice(1).every(([, , eta]) => eta !== null && eta >= 0)).toBe(true);
    expect(progress.at(-1)?.[2]).toBe(0);
    expect(streamed.sort((a, b) => a - b)).toEqual(Array.from({ length: 14 }, (_, i) => i));
    expect(table.cells).toEqual({ done: 14, total: 14 });
    expect(table.rows.length).toBe(7);
  });

  it('scan time strictly decreases with R at a fixed pattern (real masks, docs/references.md §8 formula)', async () => {
    const table = await runPlan(body({ accelerations: [1, 2, 3, 4, 6] }), { runCellFn: syntheticCell });
    for (const patternIndex of [0, 1]) {
      const rows = table.rows.filter((r) => r.patternIndex === patternIndex);
      expect(rows.map((r) => r.requestedR)).toEqual([1, 2, 3, 4, 6]);
      for (let i = 1; i < rows.length; i++) expect(rows[i].scanSeconds).toBeLessThan(rows[i - 1].scanSeconds);
    }
    // TR 500 ms × 32 lines = 16 s for the fully sampled reference; it saves nothing.
    expect(table.rows[0].scanSeconds).toBe(16);
    expect(table.rows[0].timeSavedPct).toBe(0);
  });

  it('standard deviation is 0 for one seed and positive for a random pattern over several seeds', async () => {
    const one = await runPlan(body({ seeds: 1 }), { runCellFn: syntheticCell });
    expect(one.rows.every((r) => r.metrics.nrmse.sd === 0)).toBe(true);
    const three = await runPlan(body({ seeds: 3 }), { runCellFn: syntheticCell });
    const random = three.rows.filter((r) => r.patternIndex === 1);
    expect(random.every((r) => (r.metrics.nrmse.sd ?? 0) > 0)).toBe(true);
  });

  it('the same plan gives the same table; concurrency and JSON round trips (worker threads) do not change it', async () => {
    const first = await runPlan(body(), { runCellFn: syntheticCell });
    const again = await runPlan(body(), { runCellFn: syntheticCell });
    expect(again).toEqual(first);
    let inFlight = 0;
    let peak = 0;
    const viaJson: RunCellFn = async (plan, cell) => {
      inFlight++;
      peak = Math.max(peak, inFlight);
      const shipped = JSON.parse(JSON.stringify({ plan, cell }));
      await new Promise((resolve) => setTimeout(resolve, (cell.index * 7) % 5));
      const result = JSON.parse(JSON.stringify(await syntheticCell(shipped.plan, shipped.cell)));
      inFlight--;
      return result;
    };
    const parallel = await runPlan(body(), { runCellFn: viaJson, concurrency: 3 });
    expect(peak).toBe(3);
    expect(parallel).toEqual(first);
  });

  it('cancellation between cells: CancelledError and no further cells start', async () => {
    const controller = new AbortController();
    let started = 0;
    const stopAfterThree: RunCellFn = async (plan, cell) => {
      started++;
      if (started === 3) controller.abort();
      return syntheticCell(plan, cell);
    };
    await expect(
      runPlan(body(), { runCellFn: stopAfterThree, signal: controller.signal }),
    ).rejects.toBeInstanceOf(CancelledError);
    expect(started).toBe(3);
  });

  it('an already aborted signal runs nothing', async () => {
    let started = 0;
    const counting: RunCellFn = async (plan, cell) => {
      started++;
      return syntheticCell(plan, cell);
    };
    await expect(
      runPlan(body(), { runCellFn: counting, signal: AbortSignal.abort() }),
    ).rejects.toBeInstanceOf(CancelledError);
    expect(started).toBe(0);
  });

  it('a failing cell fails the plan with its own error', async () => {
    const failing: RunCellFn = async (plan, cell) => {
      if (cell.index === 4) throw new ValidationError({ field: 'method.lambda', message: 'bad' });
      return syntheticCell(plan, cell);
    };
    await expect(runPlan(body(), { runCellFn: failing })).rejects.toBeInstanceOf(ValidationError);
  });
});

function problems(input: unknown, limits = defaultLimits) {
  try {
    validatePlan(input, { limits });
  } catch (error) {
    expect(error).toBeInstanceOf(ValidationError);
    return { error, problems: (error as ValidationError).problems };
  }
  throw new Error('expected a ValidationError');
}

describe('plan validation names the field and the allowed range', () => {
  it.each([
    [{ protocol: { trMs: 0 } }, 'protocol.trMs', '> 0'],
    [{ protocol: { trMs: 500, averages: 0 } }, 'protocol.averages', '≥ 1'],
    [{ protocol: { trMs: 500, partialFourier: 0.3 } }, 'protocol.partialFourier', '≥ 0.5'],
    [{ accelerations: [2, 3, 0.5] }, 'accelerations[2]', '≥ 1'],
    [{ accelerations: [2, 3, 2] }, 'accelerations[2]', 'distinct values'],
    [{ seeds: 0 }, 'seeds', '≥ 1'],
    [{ seeds: 1.5 }, 'seeds', 'an integer'],
    [
      { patterns: [{ pattern: 'cartesian-uniform', acceleration: 4 }] },
      'patterns[0].acceleration',
      'the documented fields only',
    ],
    [{ patterns: [{ pattern: 'cartesian-uniform', acs: -1 }] }, 'patterns[0].acs', '≥ 0'],
    [{ target: { metric: 'ssim', atMost: 0.9 } }, 'target.atMost', 'atLeast for ssim'],
    [{ matrix: { nx: 0, ny: 32 } }, 'matrix.nx', '≥ 11'],
    // SSIM needs one whole 11×11 window (Wang et al. 2004): smaller planes cannot be scored.
    [{ matrix: { nx: 32, ny: 10 } }, 'matrix.ny', '≥ 11'],
  ])('%j → %s', (override, field, allowed) => {
    const { problems: list } = problems(body(override));
    expect(list).toContainEqual(expect.objectContaining({ field, allowed }));
  });

  it('a method parameter out of range is named under methods[k]', () => {
    const { problems: list } = problems(
      body({ methods: [{ name: 'zero-filled' }, { name: 'no-such-method' }] }),
    );
    expect(list).toContainEqual(
      expect.objectContaining({
        field: 'methods[1].name',
        allowed: 'one of "zero-filled", "cs-tv", "cs-wavelet", "lowrank-hankel", "sense", "grappa"',
      }),
    );
  });

  it('mask problems the generator finds (R too high for the matrix) are reported per acceleration', () => {
    const { problems: list } = problems(body({ accelerations: [2, 64] }));
    // 32 lines on the matrix: R counts lines, so at most 32 (sampling rule, DEVELOPERS.md).
    expect(list).toContainEqual(
      expect.objectContaining({ field: 'accelerations[1]', allowed: '1 ≤ acceleration ≤ 32 (ny)' }),
    );
  });

  it('protocol and pattern that do not fit together are refused up front (radial with partial Fourier)', () => {
    const { problems: list } = problems(
      body({ patterns: [{ pattern: 'radial' }], protocol: { trMs: 5, partialFourier: 0.75 } }),
    );
    expect(list[0]).toMatchObject({
      field: 'protocol.partialFourier',
      allowed: '1 for radial and spiral sampling',
    });
  });

  it('too many cells is a LimitError before any work', async () => {
    const limits = { ...defaultLimits, maxPlanCells: 10 };
    const { error, problems: list } = problems(body(), limits);
    expect(error).toBeInstanceOf(LimitError);
    expect(list[0]).toMatchObject({ field: 'seeds', allowed: 'at most 10 cells' });
    let started = 0;
    await expect(
      runPlan(body(), {
        limits,
        runCellFn: async (plan, cell) => {
          started++;
          return syntheticCell(plan, cell);
        },
      }),
    ).rejects.toBeInstanceOf(LimitError);
    expect(started).toBe(0);
  });

  it('matrix sides above the configured limit are a LimitError naming matrix.nx', () => {
    const { error, problems: list } = problems(body({ matrix: { nx: 64, ny: 32 } }), {
      ...defaultLimits,
      maxMatrixSide: 48,
    });
    expect(error).toBeInstanceOf(LimitError);
    expect(list[0]).toMatchObject({ field: 'matrix.nx', allowed: '≤ 48' });
  });
});
