import { type FieldProblem, ValidationError } from '../core/errors.ts';
import { defaultLimits, type Limits } from '../core/limits.ts';
import { parseOrThrow } from '../core/zod-problems.ts';
import { acquisitionScanTime, patternGrid } from '../protocol/index.ts';
import { patternSpecs, withProtocolPartialFourier } from './pattern-specs.ts';
import { planAcquisitions } from './plan-cells.ts';
import { type Plan, planSchemaFor } from './schema.ts';
import {
  generateMask,
  getPhantom,
  lesionSpecOf,
  nonCartesianVolume,
  phantomLesionPositions,
} from './upstream.ts';

export interface ValidatePlanOptions {
  limits?: Limits;
  /**
   * Draw every non-custom pattern × R mask once (seed 1) and time it, so that problems only the
   * generator or the scan-time model can see (ACS wider than N/R, radial with a 3D protocol, …) are
   * reported before the plan is queued, not halfway through it.
   */
  checkMasks?: boolean;
}

/**
 * Validates a plan body outside HTTP (runPlan, tests): the schema built from the configured limits
 * (field paths as in the request: `protocol.trMs`, `accelerations[2]`, `patterns[0].acs`, `seeds`;
 * LimitError for the matrix side, method iterations and the number of cells), then checkPlan.
 */
export function validatePlan(input: unknown, options: ValidatePlanOptions = {}): Plan {
  const limits = options.limits ?? defaultLimits;
  return checkPlan(parseOrThrow(planSchemaFor(limits), input, ''), options);
}

/**
 * The checks of a parsed plan that the schema cannot make: the phantom exists (422 on
 * source.phantom now, not halfway through the plan; image ids are checked against the store by the
 * route) and, by default, one draw of every mask and the placement of the lesions in a phantom.
 */
export function checkPlan(plan: Plan, options: ValidatePlanOptions = {}): Plan {
  if ('phantom' in plan.source) getPhantom(plan.source.phantom);
  if (options.checkMasks ?? true) {
    checkMasks(plan, options.limits ?? defaultLimits);
    // Lesions that do not fit the phantom's object are a 422 on lesions.count now (uploads: per cell).
    if (plan.lesions && 'phantom' in plan.source) {
      const { nx, ny } = plan.matrix;
      phantomLesionPositions(getPhantom(plan.source.phantom), nx, ny, lesionSpecOf(plan.lesions));
    }
  }
  return plan;
}

function checkMasks(plan: Plan, limits: Limits): void {
  const problems: FieldProblem[] = [];
  const seen = new Set<string>();
  plan.patterns.forEach((pattern, i) => {
    for (const [j, spec] of patternSpecs(pattern, plan.accelerations)) {
      if (j === null) continue; // custom masks are decoded asynchronously by the pipeline
      try {
        // The scan-time model too: radial masks refuse 3D and partial Fourier.
        const sampling = withProtocolPartialFourier({ ...spec, seed: 1 }, plan.protocol.partialFourier);
        for (const acquisition of planAcquisitions(plan)) {
          const mask = generateMask(patternGrid(plan.matrix, acquisition), sampling, limits);
          if ((plan.matrix.nz ?? 1) > 1 && mask.trajectory) {
            throw new ValidationError(nonCartesianVolume);
          }
          acquisitionScanTime(plan.matrix, plan.protocol, mask, acquisition);
        }
      } catch (error) {
        if (!(error instanceof ValidationError)) throw error;
        for (const problem of error.problems) {
          const field =
            problem.field === 'sampling.acceleration'
              ? `accelerations[${j}]`
              : problem.field.startsWith('sampling.')
                ? `patterns[${i}].${problem.field.slice('sampling.'.length)}`
                : problem.field;
          const id = `${field}|${problem.message}`;
          if (seen.has(id)) continue;
          seen.add(id);
          problems.push({ ...problem, field, message: `${problem.message} (R = ${plan.accelerations[j]})` });
        }
      }
    }
  });
  if (problems.length > 0) throw new ValidationError(problems);
}
