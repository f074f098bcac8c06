import { z } from 'zod';
import { scanTimeResultSchema } from '../protocol/index.ts';
import { contrastDetailPointSchema } from './cell-result.ts';
import { metricNames } from './metric-direction.ts';
import { targetSchema } from './target-schema.ts';
import { type TaskMetricName, taskMetricNames } from './task-metrics.ts';
import { acquiredUnitSchema } from './upstream.ts';

// The tradeoff table as zod schemas: one source for the TypeScript types, for response validation
// and for the OpenAPI schemas of GET /v1/plans/{id}. No registry ids here: the HTTP layer names the
// components it publishes (`.meta({ id })` returns a registered copy).

export const summarySchema = z.object({
  mean: z.number().nullable().describe('mean over seeds; null = +∞ (PSNR of an exact reconstruction)'),
  sd: z
    .number()
    .nullable()
    .describe('sample standard deviation (n − 1), 0 for one seed; null when the mean is +∞'),
});

/**
 * The fidelity column group of a plan with lesions: each task score's mean and sd over seeds
 * (detectability null = +∞ when noiseless), and, when asked, the contrast–detail curves.
 */
export const fidelityColumnsSchema = z.object({
  ...(Object.fromEntries(taskMetricNames.map((m) => [m, summarySchema])) as Record<
    TaskMetricName,
    typeof summarySchema
  >),
  contrastDetail: z
    .object({ curve: z.array(contrastDetailPointSchema), fullySampled: z.array(contrastDetailPointSchema) })
    .optional()
    .describe(
      'on the contrast-detail phantom; per diameter the largest smallest-resolved contrast over seeds (null if any seed resolves none)',
    ),
});

const gridPosition = {
  reference: z.boolean().describe('the fully sampled reference row (R = 1, zero-filled)'),
  patternIndex: z.int().nullable().describe('index into the plan patterns; null for the reference row'),
  accelerationIndex: z
    .int()
    .nullable()
    .describe('index into the plan accelerations; null for the reference row and custom masks'),
  methodIndex: z.int().nullable().describe('index into the plan methods; null for the reference row'),
  coilIndex: z
    .int()
    .optional()
    .describe(
      'index into the plan coilArrays (0 when the plan has none); the reference row uses coilArrays[0]',
    ),
  acquisitionIndex: z
    .int()
    .optional()
    .describe('index into a volume plan acquisitions (absent: 0); the reference row uses the first'),
};

/**
 * One row of the tradeoff table: one pattern × R × method, aggregated over the plan's seeds.
 * Means are arithmetic means over seeds; `sd` is the sample standard deviation (n − 1), 0 for one
 * seed. A null mean stands for +∞ (PSNR of an exact reconstruction), its sd is then null (undefined).
 */
export const planRowSchema = z.object({
  ...gridPosition,
  key: z.string().describe("stable id: 'reference', 'p0-r2-m1', 'p3-m0' (custom mask)"),
  pattern: z.string().describe("pattern label ('fully sampled' for the reference row)"),
  method: z.string().describe('method label'),
  coils: z.string().describe('receive-array label: "uniform", "8 loops", "maps <id>"'),
  coilCount: z.int().describe('number of coils'),
  acquisition: z
    .enum(['3d', 'multi-slice'])
    .optional()
    .describe('volume plans: how the volume was acquired (3D ky–kz undersampling or multi-slice 2D)'),
  gFactorMean: z
    .number()
    .nullable()
    .describe('mean over seeds of the mean g over the object; null where no g-factor applies'),
  gFactorMax: z
    .number()
    .nullable()
    .describe('mean over seeds of the largest g over the object; null where no g-factor applies'),
  gFactorMethod: z
    .enum(['analytic', 'pseudo-replica'])
    .nullable()
    .describe('how g was found; null where no g-factor applies'),
  requestedR: z.number().nullable().describe('requested R; 1 for the reference row, null for a custom mask'),
  actualR: z.number().describe("mean over seeds of the mask's actual R"),
  acquired: z.number().describe('mean over seeds of the count that costs scan time, in acquiredUnit'),
  acquiredUnit: acquiredUnitSchema,
  scanSeconds: z.number().describe('mean over seeds of the scan time in seconds'),
  scanFormatted: z.string().describe('scanSeconds as m:ss'),
  timeSavedPct: z.number().describe('100 · (1 − scanSeconds / fully sampled seconds)'),
  effectiveTeMs: z
    .number()
    .nullable()
    .optional() // tables stored before the field existed are served as they were stored
    .describe(
      'mean over seeds of the effective TE in ms (the echo acquiring the k-space centre); null without ' +
        "echoSpacingMs or teMs. Passes and slices per TR are the protocol's: see fullySampled",
    ),
  metrics: z.object(
    Object.fromEntries(metricNames.map((m) => [m, summarySchema])) as Record<
      (typeof metricNames)[number],
      typeof summarySchema
    >,
  ),
  fidelity: fidelityColumnsSchema
    .optional()
    .describe(
      'task scores of the inserted lesions (plans with lesions): contrast recovery, false lesions, …',
    ),
  iterationsRun: z
    .number()
    .nullable()
    .optional() // tables stored before the field existed are served as they were stored
    .describe('mean over seeds of the iterations run; null for a non-iterative method'),
  iterationLimit: z
    .number()
    .nullable()
    .optional()
    .describe('the iteration cap (requested or default); null for a non-iterative method'),
  converged: z
    .boolean()
    .nullable()
    .optional()
    .describe('every seed stopped on the convergence test before the cap; null for a non-iterative method'),
  reconMs: z.number().describe('mean reconstruction wall time in ms (varies between runs)'),
  seeds: z.int().describe('seeds aggregated in this row'),
  pareto: z.boolean().describe('on the Pareto front of scan time vs paretoMetric'),
  meetsTarget: z
    .boolean()
    .nullable()
    .describe('the row meets every target (target and targets); null without a target'),
  resultId: z
    .string()
    .optional()
    .describe("the row's representative reconstruction (its seed-1 cell), when the runner stored one"),
});

export const rowPickSchema = z.object({
  rowIndex: z.int().describe('index into rows'),
  key: z.string(),
  pattern: z.string(),
  method: z.string(),
  requestedR: z.number().nullable(),
  scanSeconds: z.number(),
  scanFormatted: z.string(),
  timeSavedPct: z.number(),
  value: z.number().nullable().describe('mean of the target metric; null = +∞'),
});

export const methodRecommendationSchema = z.object({
  methodIndex: z.int(),
  method: z.string(),
  pick: rowPickSchema.nullable().describe('shortest scan with this method meeting the target'),
  closest: rowPickSchema.nullable().describe('when none does: the row of this method closest to the target'),
});

export const recommendationSchema = z.object({
  target: targetSchema.nullable().describe('the first target (target, else targets[0])'),
  targets: z.array(targetSchema).describe('every target a recommended row meets: target, then targets'),
  decidedBy: targetSchema
    .nullable()
    .describe('the target that ruled out the shorter scans; null when the shortest candidate meets all'),
  met: z.boolean().describe('some undersampled row meets every target'),
  overall: rowPickSchema.nullable().describe('shortest scan meeting the target over all methods'),
  closest: rowPickSchema.nullable().describe('when nothing meets the target: the closest row'),
  perMethod: z.array(methodRecommendationSchema),
  statement: z.string().describe('the recommendation in plain words'),
});

export const planTableSchema = z.object({
  rows: z
    .array(planRowSchema)
    .describe('rows[0] is the fully sampled reference; the others follow plan order'),
  // Tables stored before slicesPerTr and effectiveTeMs existed are served as they were stored.
  fullySampled: scanTimeResultSchema.partial({ slicesPerTr: true, effectiveTeMs: true }),
  paretoMetric: z.enum(metricNames).describe("the first image-quality target's metric; nrmse without one"),
  recommendation: recommendationSchema,
  cells: z.object({ done: z.int(), total: z.int() }),
  notes: z.array(z.string()),
});

export type PlanRow = z.infer<typeof planRowSchema>;
export type FidelityColumns = z.infer<typeof fidelityColumnsSchema>;
export type RowPick = z.infer<typeof rowPickSchema>;
export type MethodRecommendation = z.infer<typeof methodRecommendationSchema>;
export type Recommendation = z.infer<typeof recommendationSchema>;
export type PlanTable = z.infer<typeof planTableSchema>;
