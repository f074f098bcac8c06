import { LimitError } from '../core/errors.ts';
import { defaultLimits, type Limits } from '../core/limits.ts';
import { patternSpecs, withProtocolPartialFourier } from './pattern-specs.ts';
import type { GridPosition } from './row-key.ts';
import type { Plan } from './schema.ts';
import type { CoilsSpec, MethodSpec, SamplingSpec, VolumeAcquisitionMode } from './upstream.ts';

/** One simulated acquisition + reconstruction of a plan. Plain data, so it can cross to a worker thread. */
export interface PlanCell extends GridPosition {
  /** Position in planCells order: the reference seeds first, then patterns × R × methods × seeds. */
  index: number;
  /**
   * The whole sampling spec with the plan's acceleration filled in (seed is passed separately); the
   * table row's `pattern` is only its label.
   */
  sampling: SamplingSpec;
  /** Requested R; null for a custom mask. */
  acceleration: number | null;
  method: MethodSpec;
  /** The receive array of this cell (coilArrays[coilIndex]). */
  coils: CoilsSpec;
  /** Volume plans: how this cell acquires the volume (acquisitions[acquisitionIndex]). */
  acquisition?: VolumeAcquisitionMode;
  /** 1…seeds: seeds the mask draw and the noise draw of this repetition. */
  seed: number;
}

/** Fully sampled reference: every line (R = 1), zero-filled reconstruction. */
export const referenceSampling: SamplingSpec = { pattern: 'cartesian-uniform', acceleration: 1 };
export const referenceMethod: MethodSpec = { name: 'zero-filled' };

/** The acquisitions a plan sweeps: a volume plan's acquisitions (default 3D); none for a 2D plan. */
export function planAcquisitions(
  plan: Pick<Plan, 'matrix'> & { acquisitions?: Plan['acquisitions'] },
): readonly (VolumeAcquisitionMode | undefined)[] {
  return (plan.matrix.nz ?? 1) > 1 ? (plan.acquisitions ?? ['3d']) : [undefined];
}

/** The receive arrays a plan sweeps: its coilArrays, or the uniform single coil. */
export function planCoilArrays(plan: Pick<Plan, 'coilArrays'>): readonly CoilsSpec[] {
  return plan.coilArrays ?? [{ array: 'uniform' }];
}

type SizedPlan = Pick<Plan, 'patterns' | 'accelerations' | 'methods' | 'seeds'> &
  Partial<Pick<Plan, 'coilArrays' | 'acquisitions'>>;

/** Number of cells a plan expands to: (reference + Σ patterns' R counts × methods × coil arrays) × seeds. */
export function planCellCount(plan: SizedPlan): number {
  const arrays = planCoilArrays(plan).length * (plan.acquisitions?.length ?? 1);
  let rows = 1;
  for (const pattern of plan.patterns)
    rows += patternSpecs(pattern, plan.accelerations).length * plan.methods.length * arrays;
  return rows * plan.seeds;
}

/**
 * Expands a validated plan into cells in a fixed order (so results and tables are reproducible);
 * the specs are the plan's own typed values, never parsed again.
 * Plans larger than `limits.maxPlanCells` are refused with a LimitError before any work starts.
 */
export function planCells(plan: Plan, limits: Limits = defaultLimits): PlanCell[] {
  checkPlanSize(plan, limits);
  const arrays = planCoilArrays(plan);
  const acquisitions = planAcquisitions(plan);
  const cells: PlanCell[] = [];
  const push = (
    position: GridPosition,
    sampling: SamplingSpec,
    acceleration: number | null,
    method: MethodSpec,
  ) => {
    const coils = arrays[position.coilIndex ?? 0];
    const acquisition = acquisitions[position.acquisitionIndex ?? 0];
    for (let seed = 1; seed <= plan.seeds; seed++) {
      cells.push({
        ...position,
        index: cells.length,
        sampling,
        acceleration,
        method,
        coils,
        ...(acquisition ? { acquisition } : {}),
        seed,
      });
    }
  };
  push(
    { reference: true, patternIndex: null, accelerationIndex: null, methodIndex: null, coilIndex: 0 },
    referenceSampling,
    1,
    referenceMethod,
  );
  plan.patterns.forEach((pattern, patternIndex) => {
    for (const [accelerationIndex, sampling] of patternSpecs(pattern, plan.accelerations)) {
      const acceleration = accelerationIndex === null ? null : plan.accelerations[accelerationIndex];
      plan.methods.forEach((method, methodIndex) => {
        arrays.forEach((_, coilIndex) => {
          acquisitions.forEach((_, acquisitionIndex) => {
            push(
              {
                reference: false,
                patternIndex,
                accelerationIndex,
                methodIndex,
                coilIndex,
                ...(acquisitions.length > 1 ? { acquisitionIndex } : {}),
              },
              withProtocolPartialFourier(sampling, plan.protocol.partialFourier),
              acceleration,
              method,
            );
          });
        });
      });
    }
  });
  return cells;
}

export function checkPlanSize(plan: SizedPlan, limits: Limits): void {
  const count = planCellCount(plan);
  if (count > limits.maxPlanCells) {
    throw new LimitError({
      field: 'seeds',
      message:
        `the plan expands to ${count} cells ((1 reference + patterns × accelerations × methods × coil arrays) × seeds), ` +
        `more than the configured limit`,
      allowed: `at most ${limits.maxPlanCells} cells`,
    });
  }
}
