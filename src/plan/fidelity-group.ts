import type { CellResult } from './cell-result.ts';
import type { FidelityColumns } from './plan-table.ts';
import { summarize } from './statistics.ts';
import { taskMetricNames } from './task-metrics.ts';

type ContrastDetailPoint = NonNullable<FidelityColumns['contrastDetail']>['curve'][number];

/**
 * Per diameter, the largest of the seeds' smallest resolved contrasts (the curve every seed
 * reaches), null when any seed resolves none at that diameter.
 */
function worstCurve(curves: readonly ContrastDetailPoint[][]): ContrastDetailPoint[] {
  return curves[0].map((point, i) => {
    const values = curves.map((c) => c[i].smallestContrast);
    return {
      ...point,
      smallestContrast: values.some((v) => v === null) ? null : Math.max(...(values as number[])),
    };
  });
}

/**
 * The fidelity column group of one table row from its cells' lesion studies: each task score's
 * mean and sd over seeds. Nothing when the cells have no lesion study.
 */
export function fidelityGroup(results: readonly CellResult[]): { fidelity?: FidelityColumns } {
  const scored = results.map((r) => r.fidelity).filter((f) => f !== undefined);
  if (scored.length === 0 || scored.length !== results.length) return {};
  const columns = Object.fromEntries(
    taskMetricNames.map((m) => [m, summarize(scored.map((f) => f[m]))]),
  ) as Omit<FidelityColumns, 'contrastDetail'>;
  const curves = scored.map((f) => f.contrastDetail).filter((c) => c !== undefined);
  return {
    fidelity: {
      ...columns,
      ...(curves.length === scored.length && curves.length > 0
        ? {
            contrastDetail: {
              curve: worstCurve(curves.map((c) => c.curve)),
              fullySampled: worstCurve(curves.map((c) => c.fullySampled)),
            },
          }
        : {}),
    },
  };
}
