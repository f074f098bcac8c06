import { z } from 'zod';
import {
  type LesionSpec,
  MAX_LESION_CONTRAST,
  MAX_LESION_DIAMETER,
  MAX_LESIONS,
  MIN_LESION_DIAMETER,
} from './lesion.ts';

/** Noise replicas a study draws for the detectability of a method without a known-σ form (our choice). */
export const DEFAULT_LESION_REPLICAS = 8;
export const MAX_LESION_REPLICAS = 64;

/**
 * The `lesions` piece of reconstruction and plan requests: lesions inserted into the object, scored
 * by paired acquisitions with and without them (DEVELOPERS.md "Feature fidelity"). Field problems
 * name `lesions.<field>` and the allowed range.
 */
export const lesionsSchema = z
  .strictObject({
    count: z.int().min(1).max(MAX_LESIONS).describe('number of lesions, drawn inside the object'),
    diameter: z
      .number()
      .min(MIN_LESION_DIAMETER)
      .max(MAX_LESION_DIAMETER)
      .describe("diameter in pixels (a disc's diameter, a Gaussian's full width at half maximum)"),
    contrast: z
      .number()
      .min(-MAX_LESION_CONTRAST)
      .max(MAX_LESION_CONTRAST)
      .refine((c) => c !== 0, { message: 'a lesion needs a non-zero contrast', params: { allowed: '≠ 0' } })
      .describe("amplitude relative to the object's mean intensity; negative for dark lesions"),
    shape: z.enum(['disc', 'gaussian']).optional().describe("'disc' (default) or 'gaussian'"),
    seed: z.int().optional().describe('seed of the lesion positions (default 1)'),
    replicas: z
      .int()
      .min(2)
      .max(MAX_LESION_REPLICAS)
      .optional()
      .describe(
        `noise replicas for CNR and detectability of methods other than zero-filled (default ${DEFAULT_LESION_REPLICAS}); ` +
          'zero-filled uses the known noise σ exactly and draws none',
      ),
    contrastDetail: z
      .boolean()
      .optional()
      .describe(
        "also run the same sampling and method on the 'contrast-detail' phantom and report its contrast–detail curve",
      ),
  })
  .describe(
    'Lesions inserted for the feature-fidelity scores, e.g. { "count": 6, "diameter": 3, "contrast": 0.05 }',
  );

export type LesionsRequest = z.output<typeof lesionsSchema>;

/** The placement spec of a request, defaults filled in (disc, seed 1). */
export function lesionSpecOf(request: LesionsRequest): LesionSpec {
  return {
    count: request.count,
    diameter: request.diameter,
    contrast: request.contrast,
    shape: request.shape ?? 'disc',
    seed: request.seed ?? 1,
  };
}
