import { z } from 'zod';
import type { FidelityOutcome } from '../pipeline/lesion-run.ts';
import { finiteOrNull } from './json-safe.ts';

const infiniteAsNull = z.number().nullable().describe('null = +∞ (noiseless)');

const contrastDetailPointSchema = z.object({
  diameterUnits: z.number().describe('disc diameter in phantom units'),
  diameterPixels: z.number(),
  smallestContrast: z
    .number()
    .nullable()
    .describe('smallest contrast resolved at this diameter (with every higher one); null: none'),
});

/** `fidelity` of a reconstruction with `lesions` (DEVELOPERS.md "Feature fidelity"). */
export const fidelitySchema = z
  .object({
    contrastRecovery: z
      .object({ mean: z.number(), min: z.number() })
      .describe('Re⟨r, t⟩/⟨t, t⟩ over each lesion disc: 1 = fully recovered'),
    resolved: z.int().describe("lesions whose CNR reaches Rose's k"),
    lesions: z
      .array(
        z.object({
          row: z.int(),
          col: z.int(),
          contrastRecovery: z.number(),
          cnr: infiniteAsNull,
          resolved: z.boolean(),
          detectability: infiniteAsNull.describe("non-prewhitening matched filter d'; null = +∞"),
          called: z.boolean().describe('the disc mean of the response reaches the threshold'),
        }),
      )
      .describe('each lesion as placed (centre row, col in pixels) with its scores'),
    detectability: z.object({
      mean: infiniteAsNull,
      min: infiniteAsNull,
      method: z.enum(['replicas', 'known-sigma', 'noiseless']),
      replicas: z.int(),
    }),
    falseLesions: z
      .object({
        count: z.int(),
        positions: z.array(z.object({ row: z.int(), col: z.int() })),
      })
      .describe('blobs of the lesion-free error map called lesions at the same threshold'),
    threshold: z.number().describe('absolute intensity a lesion is called at'),
    roseK: z.number(),
    diameter: z.number(),
    shape: z.enum(['disc', 'gaussian']),
    contrast: z.number(),
    amplitude: z.number().describe('contrast × the object mean intensity'),
    reconstructions: z.int().describe('reconstructions the study added to the base run'),
    contrastDetail: z
      .object({ curve: z.array(contrastDetailPointSchema), fullySampled: z.array(contrastDetailPointSchema) })
      .optional()
      .describe('on the contrast-detail phantom: this sampling and method, and full sampling'),
  })
  .describe('Feature fidelity of inserted lesions (present when the request has lesions)');

export type Fidelity = z.infer<typeof fidelitySchema>;

/** The JSON form of a pipeline fidelity outcome: infinities as null, no image. */
export function describeFidelity(outcome: FidelityOutcome): Fidelity {
  return {
    contrastRecovery: outcome.contrastRecovery,
    resolved: outcome.resolved,
    lesions: outcome.lesions.map((l) => ({
      ...l,
      cnr: finiteOrNull(l.cnr),
      detectability: finiteOrNull(l.detectability),
    })),
    detectability: {
      ...outcome.detectability,
      mean: finiteOrNull(outcome.detectability.mean),
      min: finiteOrNull(outcome.detectability.min),
    },
    falseLesions: outcome.falseLesions,
    threshold: outcome.threshold,
    roseK: outcome.roseK,
    diameter: outcome.diameter,
    shape: outcome.shape,
    contrast: outcome.contrast,
    amplitude: outcome.amplitude,
    reconstructions: outcome.reconstructions,
    ...(outcome.contrastDetail ? { contrastDetail: outcome.contrastDetail } : {}),
  };
}
