import { describe, expect, it } from 'vitest';
import { planCells } from '../../src/plan/plan-cells.ts';
import { runPlan } from '../../src/plan/run-plan.ts';
import { validatePlan } from '../../src/plan/validate-plan.ts';
import { caughtValidationError } from '../core/caught-validation-error.ts';

// Plans sweep partial-Fourier fractions and lattices like any other sampling choice, through the
// real pipeline (modified Shepp–Logan, 32², zero-filled with homodyne); timing from the echo-train model.
const body = () => ({
  source: { phantom: 'shepp-logan-modified' },
  matrix: { nx: 32, ny: 32 },
  protocol: { dimensions: '2d', trMs: 3000, echoTrainLength: 4, echoSpacingMs: 10, slices: 20 },
  patterns: [
    { pattern: 'cartesian-uniform' },
    { pattern: 'cartesian-uniform', partialFourier: 0.625 },
    { pattern: 'cartesian-uniform', partialFourier: 0.75 },
    { pattern: 'lattice', rows: 2, shift: 1 },
  ],
  accelerations: [4],
  methods: [{ name: 'zero-filled', partialFourier: 'homodyne' }],
  seeds: 1,
});

describe('a plan sweeping partial Fourier and a lattice', () => {
  it('rows per fraction and lattice, with passes, slices per TR, effective TE and the partial-Fourier note', async () => {
    const table = await runPlan(body());
    expect(table.rows.map((r) => r.pattern)).toEqual([
      'fully sampled',
      'cartesian-uniform',
      'cartesian-uniform (partialFourier 0.625)',
      'cartesian-uniform (partialFourier 0.75)',
      'lattice',
    ]);
    // ⌊3000 / (4 × 10)⌋ = 75 slices per TR ≥ 20: one pass.
    expect(table.fullySampled).toMatchObject({ slicesPerTr: 75, passes: 1 });
    // Hand count, R = 4 on 32 rows: rows 0, 4, …, 28 (8 lines). p = 0.625 keeps rows 12…31 (⌈20⌉ = 20):
    // 12, 16, 20, 24, 28 = 5 lines; p = 0.75 keeps rows 8…31: 6 lines. The lattice (2 × 2) in a 2D
    // protocol occupies every second row: 16 lines.
    const lines = table.rows.map((r) => r.acquired);
    expect(lines).toEqual([32, 8, 5, 6, 16]);
    // Linear ordering, 4 echoes: shots = ⌈lines / 4⌉; the centre row 16 has `before` acquired lines ahead.
    // Full: before 16, shots 8 → echo ⌊16/8⌋ + 1 = 3 (30 ms). R = 4: before 4 (rows 0…12), shots 2 → echo 3.
    // p = 0.625: before 1 (row 12), shots 2 → echo 1 (10 ms). p = 0.75: before 2 (rows 8, 12), shots 2 → echo 2
    // (20 ms). Lattice: before 8, shots 4 → echo 3 (30 ms).
    expect(table.rows.map((r) => r.effectiveTeMs)).toEqual([30, 30, 10, 20, 30]);
    expect(table.notes.some((n) => n.startsWith('Partial Fourier (0.625, 0.75) in the sampling'))).toBe(true);
  });

  it('the protocol alias applies the same rows to every Cartesian pattern of the plan', () => {
    const plan = validatePlan({
      ...body(),
      protocol: { ...body().protocol, partialFourier: 0.75 },
      patterns: [{ pattern: 'cartesian-uniform' }],
    });
    const cells = planCells(plan);
    expect(cells[0].sampling).not.toHaveProperty('partialFourier'); // the reference stays fully sampled
    expect(cells[1].sampling).toMatchObject({ pattern: 'cartesian-uniform', partialFourier: 0.75 });
  });

  it('a lattice R that is not a multiple of rows is refused before the plan runs, naming the fields', () => {
    const error = caughtValidationError(() =>
      validatePlan({ ...body(), patterns: [{ pattern: 'lattice', rows: 2 }], accelerations: [3] }),
    );
    expect(error.problems.map((p) => p.field)).toEqual(['accelerations[0]', 'patterns[0].rows']);
  });
});
