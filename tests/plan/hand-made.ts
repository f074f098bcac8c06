import type { TablePlan } from '../../src/plan/build-table.ts';
import type { CellResult } from '../../src/plan/cell-result.ts';
import type { GridPosition } from '../../src/plan/row-key.ts';

/**
 * Hand-made plans and cell results for the table logic: numbers chosen by hand so the expected
 * aggregates, fronts and picks can be worked out on paper.
 */
export const protocol500 = {
  dimensions: '2d',
  trMs: 500,
  averages: 1,
  echoTrainLength: 1,
  slices: 1,
  partialFourier: 1,
} as const;

export function handPlan(overrides: Partial<TablePlan> = {}): TablePlan {
  return {
    matrix: { nx: 256, ny: 256 },
    protocol: protocol500,
    patterns: [{ pattern: 'cartesian-uniform' }, { pattern: 'poisson-disc' }],
    accelerations: [2, 4],
    methods: [{ name: 'zero-filled' }, { name: 'cs-tv' }],
    seeds: 1,
    ...overrides,
  } as TablePlan;
}

export const referencePosition: GridPosition = {
  reference: true,
  patternIndex: null,
  accelerationIndex: null,
  methodIndex: null,
};

export function at(
  patternIndex: number,
  accelerationIndex: number | null,
  methodIndex: number,
): GridPosition {
  return { reference: false, patternIndex, accelerationIndex, methodIndex };
}

let nextIndex = 0;

/** One cell result; scan time = TR 500 ms × acquired lines (2D, 1 average, ETL 1). */
export function cellResult(
  position: GridPosition,
  values: { lines: number; ssim: number; nrmse?: number; psnr?: number | null; hfen?: number; seed?: number },
): CellResult {
  return {
    ...position,
    index: nextIndex++,
    seed: values.seed ?? 1,
    requestedR: position.reference ? 1 : 256 / values.lines,
    actualR: 256 / values.lines,
    acquired: values.lines,
    acquiredUnit: 'lines',
    scanSeconds: (500 * values.lines) / 1000,
    mask: { acquired: values.lines, unit: 'lines', fraction: values.lines / 256 },
    metrics: {
      nrmse: values.nrmse ?? 1 - values.ssim,
      psnr: values.psnr === undefined ? 20 + 10 * values.ssim : values.psnr,
      ssim: values.ssim,
      hfen: values.hfen ?? 1 - values.ssim,
    },
    reconMs: 10,
    notes: [],
  };
}
