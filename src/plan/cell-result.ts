import { z } from 'zod';
import { metricNames } from './metric-direction.ts';
import { gFactorSummarySchema, acquiredUnitSchema as unit } from './upstream.ts';

/** One point of a contrast–detail curve: the smallest contrast resolved at a diameter (null: none). */
export const contrastDetailPointSchema = z.object({
  diameterUnits: z.number(),
  diameterPixels: z.number(),
  smallestContrast: z.number().nullable().describe('null: not resolved at any contrast'),
});

const metricValue = z.number().nullable().describe('null = +∞ (PSNR of an exact reconstruction)');

/**
 * What one cell of a plan produced: plain JSON (no typed arrays, no images, no infinities) so a
 * worker thread can send it back and a store can persist it. Metric values are `number | null`,
 * null standing for +∞.
 */
export const cellResultSchema = z.object({
  index: z.int().describe('position in planCells order'),
  reference: z.boolean(),
  patternIndex: z.int().nullable(),
  accelerationIndex: z.int().nullable(),
  methodIndex: z.int().nullable(),
  coilIndex: z.int().optional().describe('index into the plan coilArrays; absent = 0'),
  acquisitionIndex: z.int().optional().describe('index into a volume plan acquisitions; absent = 0'),
  coils: z.string().optional().describe('receive-array label; absent = "uniform"'),
  coilCount: z.int().optional().describe('number of coils; absent = 1'),
  gFactor: gFactorSummarySchema.optional().describe('g over the object, where one applies'),
  seed: z.int().describe('seed of the mask draw and the noise draw'),
  requestedR: z.number().nullable().describe('null for a custom mask'),
  actualR: z.number(),
  acquired: z.number().describe('count that costs scan time, in acquiredUnit (src/protocol/scan-time.ts)'),
  acquiredUnit: unit,
  scanSeconds: z.number(),
  effectiveTeMs: z
    .number()
    .nullable()
    .optional()
    .describe('effective TE of the mask drawn (src/protocol/echo-train-timing.ts); absent in older results'),
  mask: z
    .object({ acquired: z.number(), unit, fraction: z.number() })
    .describe('the mask as drawn: its own count and unit (a 2D point mask counts points), grid fraction'),
  metrics: z.object(
    Object.fromEntries(metricNames.map((m) => [m, metricValue])) as Record<
      (typeof metricNames)[number],
      typeof metricValue
    >,
  ),
  fidelity: z
    .object({
      contrastRecovery: z.number(),
      falseLesions: z.number(),
      detectability: z.number().nullable().describe('mean over lesions; null = +∞ (noiseless)'),
      resolvedFraction: z.number(),
      contrastDetail: z
        .object({
          curve: z.array(contrastDetailPointSchema),
          fullySampled: z.array(contrastDetailPointSchema),
        })
        .optional(),
    })
    .optional()
    .describe('task scores of the lesion study (plans with lesions)'),
  solverStop: z
    .object({
      iterations: z.int().describe('iterations run'),
      iterationLimit: z.int().describe('the cap (requested or default)'),
      converged: z.boolean().describe('stopped by the convergence test before the cap'),
    })
    .optional()
    .describe("an iterative method's stop (absent for zero-filled, GRAPPA and older results)"),
  reconMs: z.number(),
  notes: z.array(z.string()).describe('pipeline notes (inverse crime for uploads, rescaling, …)'),
  resultId: z
    .string()
    .optional()
    .describe("the stored result of this cell (seed 1 only, when the runner keeps the row's images)"),
});

export type CellResult = z.infer<typeof cellResultSchema>;
