import { acquisitionScanTime } from '../protocol/index.ts';
import type { CellResult } from './cell-result.ts';
import { jsonNumber } from './metric-direction.ts';
import type { PlanCell } from './plan-cells.ts';
import type { Plan } from './schema.ts';
import {
  coilsLabel,
  type FidelityOutcome,
  type PipelineContext,
  type ReconstructionOutcome,
  runReconstruction,
  type SampledMask,
} from './upstream.ts';

/**
 * Runs one cell: simulated acquisition with the cell's seed (mask draw and noise draw),
 * reconstruction, scoring, and the scan time of the mask that was drawn. Returns plain data only.
 */
export async function runCell(plan: Plan, cell: PlanCell, ctx?: PipelineContext): Promise<CellResult> {
  return (await runCellOutcome(plan, cell, ctx)).result;
}

/** runCell that also hands back the pipeline's outcome (images included), for a runner that keeps it. */
export async function runCellOutcome(
  plan: Plan,
  cell: PlanCell,
  ctx?: PipelineContext,
): Promise<{ result: CellResult; outcome: ReconstructionOutcome }> {
  const outcome = await runReconstruction(
    {
      source: plan.source,
      matrix: plan.matrix,
      sampling: cell.sampling,
      ...(plan.noise === undefined ? {} : { noise: plan.noise }),
      method: cell.method,
      coils: cell.coils,
      ...(plan.phase === undefined ? {} : { phase: plan.phase }),
      ...(plan.gFactor === undefined ? {} : { gFactor: plan.gFactor }),
      ...(plan.lesions === undefined ? {} : { lesions: plan.lesions }),
      ...(cell.acquisition === undefined ? {} : { acquisition: cell.acquisition }),
    },
    cell.seed,
    ctx,
  );
  const g = outcome.gFactor;
  const result: CellResult = {
    ...cellScanColumns(plan, cell, outcome.sampled),
    coils: outcome.coils?.label ?? coilsLabel(cell.coils),
    coilCount: outcome.coils?.count ?? 1,
    ...(g ? { gFactor: { mean: g.mean, p95: g.p95, max: g.max, method: g.method } } : {}),
    metrics: {
      nrmse: jsonNumber(outcome.metrics.nrmse),
      psnr: jsonNumber(outcome.metrics.psnr),
      ssim: jsonNumber(outcome.metrics.ssim),
      hfen: jsonNumber(outcome.metrics.hfen),
    },
    ...(outcome.fidelity ? { fidelity: cellFidelity(outcome.fidelity) } : {}),
    ...solverStopOf(outcome.info),
    reconMs: outcome.timing.reconMs,
    notes: [...outcome.notes],
  };
  return { result, outcome };
}

/** An iterative method's stop from its `info` (iterations, iterationLimit, converged), when it reports one. */
export function solverStopOf(info: Record<string, unknown>): Pick<CellResult, 'solverStop'> {
  const { iterations, iterationLimit, converged } = info;
  if (
    typeof iterations !== 'number' ||
    typeof iterationLimit !== 'number' ||
    typeof converged !== 'boolean'
  ) {
    return {};
  }
  return { solverStop: { iterations, iterationLimit, converged } };
}

/** The task scores of a cell's lesion study as plain numbers (src/plan/task-metrics.ts). */
function cellFidelity(f: FidelityOutcome): NonNullable<CellResult['fidelity']> {
  return {
    contrastRecovery: f.contrastRecovery.mean,
    falseLesions: f.falseLesions.count,
    detectability: jsonNumber(f.detectability.mean),
    resolvedFraction: f.resolved / f.lesions.length,
    ...(f.contrastDetail ? { contrastDetail: f.contrastDetail } : {}),
  };
}

/**
 * The columns of a cell result that the cell and the mask drawn for it fix: which cell it is,
 * the requested and actual acceleration, the scan time and what the mask acquired.
 */
export function cellScanColumns(
  plan: Plan,
  cell: PlanCell,
  sampled: SampledMask,
): Omit<CellResult, 'metrics' | 'reconMs' | 'notes' | 'coils' | 'coilCount' | 'gFactor'> {
  const time = acquisitionScanTime(plan.matrix, plan.protocol, sampled, cell.acquisition);
  return {
    index: cell.index,
    reference: cell.reference,
    patternIndex: cell.patternIndex,
    accelerationIndex: cell.accelerationIndex,
    methodIndex: cell.methodIndex,
    ...(cell.coilIndex === undefined ? {} : { coilIndex: cell.coilIndex }),
    ...(cell.acquisitionIndex === undefined ? {} : { acquisitionIndex: cell.acquisitionIndex }),
    seed: cell.seed,
    requestedR: cell.acceleration,
    actualR: sampled.acceleration.actual,
    acquired: time.acquired,
    acquiredUnit: time.unit,
    scanSeconds: time.seconds,
    effectiveTeMs: time.effectiveTeMs,
    mask: { acquired: sampled.acquired.count, unit: sampled.acquired.unit, fraction: sampled.fraction },
  };
}
