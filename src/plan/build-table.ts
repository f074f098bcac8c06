import { ValidationError } from '../core/errors.ts';
import { acquisitionScanTime, formatDuration } from '../protocol/index.ts';
import type { CellResult } from './cell-result.ts';
import { fidelityGroup } from './fidelity-group.ts';
import { specLabels } from './labels.ts';
import { type MetricName, metricNames } from './metric-direction.ts';
import { paretoFront } from './pareto.ts';
import { patternSpecs } from './pattern-specs.ts';
import { planAcquisitions, planCoilArrays } from './plan-cells.ts';
import type { PlanRow, PlanTable } from './plan-table.ts';
import { meetsTargets, recommend } from './recommend.ts';
import { type GridPosition, rowKey } from './row-key.ts';
import type { Plan } from './schema.ts';
import { mean, summarize } from './statistics.ts';
import { G_FACTOR_MAX, type Target } from './target-schema.ts';
import { isTaskMetric } from './task-metrics.ts';
import { coilsLabel } from './upstream.ts';

export const referencePatternLabel = 'fully sampled';
export const referenceMethodLabel = 'zero-filled';

/** The parts of a validated plan the table reads. */
export type TablePlan = Pick<
  Plan,
  'matrix' | 'protocol' | 'patterns' | 'accelerations' | 'methods' | 'seeds'
> & {
  acquisitions?: Plan['acquisitions'];
  target?: Plan['target'];
  targets?: Plan['targets'];
  coilArrays?: Plan['coilArrays'];
};

/**
 * Aggregates cell results into the tradeoff table: one row per pattern × R × method that has results
 * (so a partial table can be shown while a plan runs), the reference row first, Pareto flags, the
 * recommendation. Rows follow plan order whatever order the cells finished in, so the same results
 * give the same table.
 */
export function buildTable(plan: TablePlan, cellResults: readonly CellResult[]): PlanTable {
  const groups = groupResults(cellResults);
  const acquisitions = planAcquisitions(plan);
  const full = acquisitionScanTime(plan.matrix, plan.protocol, undefined, acquisitions[0]);
  const patternLabels = specLabels(plan.patterns, 'pattern');
  const methodLabels = specLabels(plan.methods as Record<string, unknown>[], 'name');
  const arrays = planCoilArrays(plan);
  const coilLabels = arrays.map(coilsLabel);

  const positions: GridPosition[] = [
    { reference: true, patternIndex: null, accelerationIndex: null, methodIndex: null },
  ];
  plan.patterns.forEach((pattern, patternIndex) => {
    for (const [accelerationIndex] of patternSpecs(pattern, plan.accelerations)) {
      plan.methods.forEach((_, methodIndex) => {
        arrays.forEach((_, coilIndex) => {
          acquisitions.forEach((_, acquisitionIndex) => {
            positions.push({
              reference: false,
              patternIndex,
              accelerationIndex,
              methodIndex,
              ...(arrays.length > 1 || plan.coilArrays ? { coilIndex } : {}),
              ...(acquisitions.length > 1 ? { acquisitionIndex } : {}),
            });
          });
        });
      });
    }
  });

  const targets = planTargets(plan);
  // The Pareto front is drawn on an image-quality metric: the first target's, else NRMSE.
  const paretoMetric = (targets.find((t) => !isTaskMetric(t.metric) && t.metric !== G_FACTOR_MAX)?.metric ??
    'nrmse') as MetricName;
  const rows: PlanRow[] = [];
  for (const position of positions) {
    const results = groups.get(rowKey(position));
    if (!results) continue;
    const scanSeconds = mean(results.map((r) => r.scanSeconds));
    const metrics = Object.fromEntries(
      metricNames.map((m) => [m, summarize(results.map((r) => r.metrics[m]))]),
    ) as PlanRow['metrics'];
    const requestedR = position.reference
      ? 1
      : position.accelerationIndex === null
        ? null
        : plan.accelerations[position.accelerationIndex];
    rows.push({
      ...position,
      key: rowKey(position),
      pattern: position.reference ? referencePatternLabel : patternLabels[position.patternIndex as number],
      method: position.reference ? referenceMethodLabel : methodLabels[position.methodIndex as number],
      coils: results[0].coils ?? coilLabels[position.coilIndex ?? 0],
      coilCount: results[0].coilCount ?? 1,
      ...(acquisitions[0] ? { acquisition: acquisitions[position.acquisitionIndex ?? 0] } : {}),
      ...gFactorColumns(results),
      requestedR,
      actualR: mean(results.map((r) => r.actualR)),
      acquired: mean(results.map((r) => r.acquired)),
      acquiredUnit: results[0].acquiredUnit,
      scanSeconds,
      scanFormatted: formatDuration(scanSeconds),
      timeSavedPct: full.seconds > 0 ? 100 * (1 - scanSeconds / full.seconds) : 0,
      effectiveTeMs: meanOrNull(results.map((r) => r.effectiveTeMs ?? null)),
      metrics,
      ...fidelityGroup(results),
      ...solverStopColumns(results),
      reconMs: mean(results.map((r) => r.reconMs)),
      seeds: results.length,
      pareto: false,
      meetsTarget: null,
      ...representative(results),
    });
    const row = rows[rows.length - 1];
    row.meetsTarget = targets.length === 0 ? null : meetsTargets(row, targets);
  }

  const front = paretoFront(
    rows.map((row) => ({ scanSeconds: row.scanSeconds, value: row.metrics[paretoMetric].mean })),
    paretoMetric,
  );
  rows.forEach((row, i) => {
    row.pareto = front[i];
  });

  return {
    rows,
    fullySampled: full,
    paretoMetric,
    recommendation: recommend(rows, targets, methodLabels, paretoMetric),
    cells: { done: cellResults.length, total: positions.length * plan.seeds },
    notes: tableNotes(plan, rows, cellResults),
  };
}

/** The iteration columns of a row: mean iterations run, the cap, and whether every seed converged. */
function solverStopColumns(results: readonly CellResult[]) {
  return columnsFromEverySeed(
    results,
    (r) => r.solverStop,
    ['iterationsRun', 'iterationLimit', 'converged'],
    (stops) => ({
      iterationsRun: mean(stops.map((s) => s.iterations)),
      iterationLimit: Math.max(...stops.map((s) => s.iterationLimit)),
      converged: stops.every((s) => s.converged),
    }),
  );
}

/** The row's representative result: that of its seed-1 cell, when one was stored. */
function representative(results: readonly CellResult[]): { resultId?: string } {
  const resultId = results.find((r) => r.seed === 1)?.resultId;
  return resultId === undefined ? {} : { resultId };
}

/**
 * The g-factor columns of a row: means over seeds of the mean and largest g, when every seed has one
 * (a g-factor is a property of the maps and the mask, so seeds differ only through a drawn mask).
 */
function gFactorColumns(results: readonly CellResult[]) {
  return columnsFromEverySeed(
    results,
    (r) => r.gFactor,
    ['gFactorMean', 'gFactorMax', 'gFactorMethod'],
    (known) => ({
      gFactorMean: mean(known.map((g) => g.mean)),
      gFactorMax: mean(known.map((g) => g.max)),
      gFactorMethod: known[0].method,
    }),
  );
}

/**
 * Row columns summarised from one value per seed, or every column null unless every seed has a
 * value (a row never averages over some seeds only).
 */
function columnsFromEverySeed<T, K extends keyof PlanRow>(
  results: readonly CellResult[],
  pick: (r: CellResult) => T | undefined,
  columns: readonly K[],
  summarise: (perSeed: T[]) => Pick<PlanRow, K>,
): Pick<PlanRow, K> | Record<K, null> {
  const known = results.map(pick).filter((v): v is T => v !== undefined);
  if (known.length === 0 || known.length !== results.length) {
    return Object.fromEntries(columns.map((column) => [column, null])) as Record<K, null>;
  }
  return summarise(known);
}

/** Every target of a plan: `target` first, then `targets` (all must be met). */
export function planTargets(plan: Pick<TablePlan, 'target' | 'targets'>): Target[] {
  return [...(plan.target ? [plan.target] : []), ...(plan.targets ?? [])];
}

function groupResults(cellResults: readonly CellResult[]): Map<string, CellResult[]> {
  const seen = new Set<number>();
  const groups = new Map<string, CellResult[]>();
  for (const result of [...cellResults].sort((a, b) => a.index - b.index)) {
    if (seen.has(result.index)) {
      throw new ValidationError({
        field: 'cellResults',
        message: `cell ${result.index} appears twice`,
        allowed: 'one result per cell',
      });
    }
    seen.add(result.index);
    const key = rowKey(result);
    const list = groups.get(key);
    if (list) list.push(result);
    else groups.set(key, [result]);
  }
  return groups;
}

function tableNotes(plan: TablePlan, rows: readonly PlanRow[], cellResults: readonly CellResult[]): string[] {
  const notes = [
    "Each row aggregates the plan's seeds (seed s draws the mask and the noise of repetition s): " +
      'means over seeds, sd = sample standard deviation (n − 1), 0 for a single seed.',
    'Time saved is against the fully sampled Cartesian scan of the same protocol (the reference row).',
    'The recommendation uses the mean target metric over seeds; ties go to the shorter scan, then the ' +
      'better metric, then plan order.',
  ];
  const { partialFourier, dimensions } = plan.protocol;
  // A volume's acquisition, not protocol.dimensions, decides how a mask is timed (design §2.5).
  const volume = (plan.matrix.nz ?? 1) > 1;
  if (!volume && dimensions === '2d' && cellResults.some((r) => r.mask?.unit === 'points')) {
    notes.push(
      'A point mask (e.g. poisson-disc) in a 2D protocol: every phase-encode row holding a sampled point ' +
        "costs a whole line, so it saves little time; plan it with dimensions '3d' as a ky–kz mask.",
    );
  }
  if (partialFourier < 1) {
    notes.push(
      `Partial Fourier ${partialFourier}: scan times count only the kept phase-encode rows, and the simulated ` +
        'acquisitions of Cartesian patterns leave the other rows out too (protocol.partialFourier is the ' +
        'deprecated alias of sampling.partialFourier).',
    );
  }
  const partialFourierPatterns = plan.patterns.filter(
    (p): p is typeof p & { partialFourier: number } =>
      'partialFourier' in p && typeof p.partialFourier === 'number' && p.partialFourier < 1,
  );
  if (partialFourierPatterns.length > 0) {
    const fractions = [...new Set(partialFourierPatterns.map((p) => p.partialFourier))].join(', ');
    notes.push(
      `Partial Fourier (${fractions}) in the sampling: part of those rows' time saved comes from leaving ` +
        'out one side of ky (⌈p·ny⌉ of ny rows kept), not from undersampling; the methods fill the missing rows ' +
        "as their partialFourier choice says (zero-fill unless 'homodyne' or 'pocs').",
    );
  }
  if (rows.some((row) => row.acquiredUnit === 'spokes')) {
    notes.push(
      'Radial rows count spokes; Nyquist radial sampling needs ⌈π/2·N⌉ spokes, more than the N Cartesian lines, ' +
        'so a radial row at low R can take longer than the fully sampled Cartesian scan.',
    );
  }
  if (rows.some((row) => row.metrics.psnr.mean === null)) {
    notes.push(
      'PSNR is +∞ (null in JSON, Infinity in CSV) where a reconstruction equals the reference exactly.',
    );
  }
  for (const result of cellResults)
    for (const note of result.notes) if (!notes.includes(note)) notes.push(note);
  return notes;
}

/** Mean of the values, or null when any is null (a cell without a TE model). */
function meanOrNull(values: readonly (number | null)[]): number | null {
  return values.every((v): v is number => v !== null) ? mean(values) : null;
}
