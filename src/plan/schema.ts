import { z } from 'zod';
import { defaultLimits, type Limits } from '../core/limits.ts';
import { allowedText, fieldPath } from '../core/zod-problems.ts';
import { protocolSchema } from '../protocol/index.ts';
import { patternSpecs } from './pattern-specs.ts';
import { planCellCount } from './plan-cells.ts';
import { targetSchema } from './target-schema.ts';
import { isTaskMetric } from './task-metrics.ts';
import {
  cartesianRandomSchema,
  cartesianUniformSchema,
  coilsSchema,
  customSchema,
  gFactorRequestSchema,
  latticeSchema,
  lesionsSchema,
  methodSchemaFor,
  noiseSchema,
  phaseSchema,
  poissonDiscSchema,
  radialSchema,
  type SamplingSpec,
  samplingSchema,
  scoredMatrixSchemaFor,
  sourceSchema,
  spiralSchema,
  unsupportedVolumePieces,
  volumeAcquisitionSchema,
} from './upstream.ts';

type WithoutPlanKeys<T> = T extends unknown ? Omit<T, 'acceleration' | 'seed'> : never;
/** A sampling spec as a plan lists it: no acceleration, no seed. */
export type PlanPattern = WithoutPlanKeys<SamplingSpec>;

const planKeys = { acceleration: true, seed: true } as const;

/**
 * A pattern of a plan: one of the sampling piece's specs without `acceleration` (the plan's
 * `accelerations` set it) and without `seed` (repetition s of the plan uses seed s); unknown keys are
 * refused (omit keeps the objects strict). A custom mask (`maskPng`) has its own acceleration and
 * gives one row per method. Each pattern × R is also checked against the sampling schema itself,
 * reported under `patterns[i].…` or `accelerations[j]`. Adding a sampling pattern: one line here.
 */
export const planPatternSchema = z
  .discriminatedUnion('pattern', [
    cartesianUniformSchema.omit(planKeys),
    cartesianRandomSchema.omit(planKeys),
    poissonDiscSchema.omit(planKeys),
    radialSchema.omit(planKeys),
    spiralSchema.omit(planKeys),
    customSchema.omit({ seed: true }),
    latticeSchema.omit(planKeys),
  ])
  .describe('A sampling spec without acceleration (from accelerations) and seed (from seeds)');

type SameType<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
type Holds<T extends true> = T;
/** Compile-time check that the list above has every sampling pattern and nothing else. */
// biome-ignore lint/correctness/noUnusedVariables: read by the compiler only, which fails on a mismatch
type PlanPatternsMatchSampling = Holds<SameType<z.output<typeof planPatternSchema>, PlanPattern>>;

const accelerationSchema = z.number().min(1).max(64);

const planSchemas = new Map<string, ReturnType<typeof buildPlanSchema>>();

/**
 * The plan body with the configured limits baked in: matrix sides (11 … maxMatrixSide), method
 * iterations (≤ maxIterations) and the number of cells (≤ maxPlanCells), each a LimitError naming
 * the field. One schema object per set of limits. Checks that need a mask draw are validatePlan's.
 */
export function planSchemaFor(limits: Limits): ReturnType<typeof buildPlanSchema> {
  const key = `${limits.maxMatrixSide}|${limits.maxIterations}|${limits.maxPlanCells}`;
  let schema = planSchemas.get(key);
  if (!schema) {
    schema = buildPlanSchema(limits);
    planSchemas.set(key, schema);
  }
  return schema;
}

/** The plan body's fields, before the checks across fields. */
function planShape(limits: Limits) {
  return z.strictObject({
    source: sourceSchema,
    matrix: scoredMatrixSchemaFor(limits),
    protocol: protocolSchema,
    patterns: z.array(planPatternSchema).min(1).max(16),
    accelerations: z
      .array(accelerationSchema)
      .min(1)
      .max(32)
      .describe('acceleration factors R swept for every (non-custom) pattern'),
    methods: z.array(methodSchemaFor(limits)).min(1).max(8),
    seeds: z.int().min(1).max(100).describe('repetitions; repetition s uses seed s for mask and noise draws'),
    noise: noiseSchema.optional(),
    coilArrays: z
      .array(coilsSchema)
      .min(1)
      .max(8)
      .optional()
      .describe(
        'receive arrays swept for every pattern × R × method (default [{ "array": "uniform" }]); the reference row uses the first',
      ),
    phase: phaseSchema.optional(),
    gFactor: gFactorRequestSchema.optional(),
    target: targetSchema.optional(),
    targets: z
      .array(targetSchema)
      .min(1)
      .max(8)
      .optional()
      .describe(
        'targets a recommended row must all meet, beside target (e.g. { "metric": "gFactorMax", "atMost": 1.5 })',
      ),
    lesions: lesionsSchema
      .optional()
      .describe('lesions inserted in every cell; rows gain the fidelity column group'),
    acquisitions: z
      .array(volumeAcquisitionSchema)
      .min(1)
      .max(2)
      .optional()
      .describe(
        "volume plans (matrix.nz > 1): the acquisitions swept for every pattern × R × method (default ['3d']); " +
          "['3d', 'multi-slice'] puts both in one table. The reference row uses the first",
      ),
  });
}

function buildPlanSchema(limits: Limits) {
  return planShape(limits)
    .superRefine((plan, ctx) => {
      checkVolumePlan(plan, ctx);
      // A task score needs lesions to score it.
      const named = [plan.target, ...(Array.isArray(plan.targets) ? plan.targets : [])];
      named.forEach((t, i) => {
        if (!t || plan.lesions !== undefined || !isTaskMetric(t.metric)) return;
        ctx.addIssue({
          code: 'custom',
          path: i === 0 ? ['target', 'metric'] : ['targets', i - 1, 'metric'],
          message: `${t.metric} is a task score: the plan needs lesions to score it`,
          params: { allowed: 'a plan with lesions, or an image-quality metric (nrmse, psnr, ssim, hfen)' },
        });
      });
      // zod runs refinements on data that already has issues: check the shapes this relies on.
      if (!Array.isArray(plan.accelerations) || !Array.isArray(plan.patterns)) return;
      plan.accelerations.forEach((r, j) => {
        if (plan.accelerations.indexOf(r) !== j) {
          ctx.addIssue({
            code: 'custom',
            path: ['accelerations', j],
            message: `R = ${r} is listed twice`,
            params: { allowed: 'distinct values' },
          });
        }
      });
      plan.patterns.forEach((pattern, i) => {
        // Only patterns and R values that passed their own schemas: their problems are reported already.
        if (!planPatternSchema.safeParse(pattern).success) return;
        const seen = new Set<string>();
        for (const [j, spec] of patternSpecs(pattern, plan.accelerations)) {
          if (j !== null && !accelerationSchema.safeParse(plan.accelerations[j]).success) continue;
          const result = samplingSchema.safeParse(spec);
          if (result.success) continue;
          for (const issue of result.error.issues) {
            const path =
              issue.path[0] === 'acceleration' && j !== null
                ? ['accelerations', j, ...issue.path.slice(1)]
                : ['patterns', i, ...issue.path];
            const id = `${fieldPath('', path)}|${issue.message}`;
            if (seen.has(id)) continue; // the same pattern problem for every R: report it once
            seen.add(id);
            ctx.addIssue({
              ...issue,
              code: 'custom',
              path,
              params: { allowed: allowedText(issue) },
            });
          }
        }
      });
      // The cell count needs arrays of objects and an integer seed count; other shapes are reported already.
      const objects = plan.patterns.every((p) => typeof p === 'object' && p !== null);
      if (!objects || !Array.isArray(plan.methods) || !Number.isInteger(plan.seeds)) return;
      if (plan.coilArrays !== undefined && !Array.isArray(plan.coilArrays)) return;
      const cells = planCellCount(plan);
      if (cells > limits.maxPlanCells) {
        ctx.addIssue({
          code: 'custom',
          path: ['seeds'],
          message:
            `the plan expands to ${cells} cells ((1 reference + patterns × accelerations × methods × coil arrays) × seeds), ` +
            'more than the configured limit',
          params: { limit: true, allowed: `at most ${limits.maxPlanCells} cells` },
        });
      }
    })
    .describe('A sweep over patterns × accelerations × methods × coil arrays × seeds');
}

/**
 * A volume plan (matrix.nz > 1) carries only what the volume pipeline models; `acquisitions` needs
 * a volume and lists each mode once.
 */
function checkVolumePlan(plan: z.output<ReturnType<typeof planShape>>, ctx: z.RefinementCtx): void {
  const volume = (plan.matrix?.nz ?? 1) > 1;
  if (!volume) {
    if (plan.acquisitions !== undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['acquisitions'],
        message: 'acquisitions apply to volumes only',
        params: { allowed: 'matrix.nz > 1 with acquisitions, or no acquisitions' },
      });
    }
    return;
  }
  if (Array.isArray(plan.acquisitions) && new Set(plan.acquisitions).size !== plan.acquisitions.length) {
    ctx.addIssue({
      code: 'custom',
      path: ['acquisitions'],
      message: 'an acquisition is listed twice',
      params: { allowed: 'distinct values' },
    });
  }
  // zod runs refinements on data that already has issues: only shapes this can read.
  if (typeof plan.source !== 'object' || plan.source === null) return;
  // A raw volume is a 3D acquisition: it cannot be re-planned as separate 2D slices.
  if ('rawId' in plan.source && Array.isArray(plan.acquisitions)) {
    const slices = plan.acquisitions.indexOf('multi-slice');
    if (slices >= 0) {
      ctx.addIssue({
        code: 'custom',
        path: ['acquisitions', slices],
        message: 'raw data of a 3D acquisition cannot be re-planned as separate 2D slices',
        params: { allowed: "'3d' (the default for a raw source)" },
      });
    }
  }
  const problems = unsupportedVolumePieces({
    source: plan.source,
    coils: (Array.isArray(plan.coilArrays) ? plan.coilArrays : [])
      .map((spec, i) => ({ field: `coilArrays[${i}]`, spec }))
      .filter(({ spec }) => typeof spec === 'object' && spec !== null),
    lesions: plan.lesions,
    phase: plan.phase,
    gFactor: plan.gFactor,
  });
  for (const problem of problems) {
    const path = problem.field
      .split(/[.[\]]/)
      .filter(Boolean)
      .map((part) => (/^\d+$/.test(part) ? Number(part) : part));
    ctx.addIssue({ code: 'custom', path, message: problem.message, params: { allowed: problem.allowed } });
  }
}

/** The plan schema with the default limits (types, scripts; the service uses planSchemaFor). */
export const planSchema = planSchemaFor(defaultLimits);

export type Plan = z.output<typeof planSchema>;
export type PlanInput = z.input<typeof planSchema>;
