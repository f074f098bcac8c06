import { type FieldProblem, LimitError, ValidationError } from '../core/errors.ts';
import { defaultLimits, type Limits } from '../core/limits.ts';
import { parseOrThrow, scanTime } from '../protocol/index.ts';
import { patternSpecs } from './pattern-specs.ts';
import { checkPlanSize } from './plan-cells.ts';
import { type Plan, planSchema } from './schema.ts';
import { checkScorableMatrix, generateMask, getPhantom, samplingSchema } from './upstream.ts';

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
 * Validates a plan body: the zod schema (field paths as in the request: `protocol.trMs`,
 * `accelerations[2]`, `patterns[0].acs`, `seeds`), the configured limits (LimitError for the matrix
 * side, method iterations and the number of cells) and, by default, one draw of every mask.
 */
export function validatePlan(input: unknown, options: ValidatePlanOptions = {}): Plan {
  const limits = options.limits ?? defaultLimits;
  const plan = parseOrThrow(planSchema, input, '');
  // An unknown phantom is refused now (422 on source.phantom), as a reconstruction request is,
  // not found halfway through the plan. (Image ids are checked against the store by the route.)
  if ('phantom' in plan.source) getPhantom(plan.source.phantom);

  const tooLarge: FieldProblem[] = [];
  for (const key of ['nx', 'ny'] as const) {
    if (plan.matrix[key] > limits.maxMatrixSide) {
      tooLarge.push({
        field: `matrix.${key}`,
        message: `${plan.matrix[key]} exceeds the configured limit`,
        allowed: `1 ≤ ${key} ≤ ${limits.maxMatrixSide}`,
      });
    }
  }
  plan.methods.forEach((method, k) => {
    const iterations = (method as { iterations?: unknown }).iterations;
    if (typeof iterations === 'number' && iterations > limits.maxIterations) {
      tooLarge.push({
        field: `methods[${k}].iterations`,
        message: `${iterations} iterations exceed the configured limit`,
        allowed: `1 ≤ iterations ≤ ${limits.maxIterations}`,
      });
    }
  });
  if (tooLarge.length > 0) throw new LimitError(tooLarge);
  checkScorableMatrix(plan.matrix);
  checkPlanSize(plan, limits);

  if (options.checkMasks ?? true) checkMasks(plan, limits);
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
        scanTime(
          plan.matrix,
          plan.protocol,
          generateMask(plan.matrix, samplingSchema.parse({ ...spec, seed: 1 }), limits),
        );
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
