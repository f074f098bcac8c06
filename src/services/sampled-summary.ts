import { z } from 'zod';
import { acquiredUnitSchema, type MaskDiagnostics, type SampledMask } from '../../sampling/index.ts';

/** What a response says about a drawn mask (the typed arrays stay on the server). */
export const sampledSummarySchema = z
  .object({
    nx: z.int(),
    ny: z.int(),
    pattern: z.string(),
    acceleration: z.object({
      requested: z.number().nullable().describe('null for a custom mask'),
      actual: z.number().describe('R = total / acquired'),
    }),
    acquired: z.object({ count: z.number(), unit: acquiredUnitSchema }),
    total: z.number().describe('Nyquist count in the same unit'),
    fraction: z.number().describe('acquired k-space grid points / (nx·ny)'),
    acs: z
      .object({ lines: z.number().optional(), size: z.tuple([z.number(), z.number()]).optional() })
      .nullable(),
    representation: z
      .enum(['cartesian', 'radial-rasterised', 'spiral-rasterised', 'non-cartesian'])
      .describe(
        "how the samples sit: on the grid, moved to the grid ('*-rasterised'), or at exact trajectory points",
      ),
    seed: z.number().nullable(),
    details: z.record(z.string(), z.union([z.number(), z.string()])).optional(),
  })
  .meta({ id: 'SampledMaskSummary' });

export const psfSummarySchema = z
  .object({
    peakSidelobe: z.number().describe('largest |PSF| outside the main lobe, PSF normalised to peak 1'),
    mainLobeRadius: z.number().describe('pixels'),
    radialProfile: z.array(z.number()).describe('mean |PSF| per integer radius from the centre'),
  })
  .meta({ id: 'PsfSummary' });

export function sampledSummary(m: SampledMask): z.infer<typeof sampledSummarySchema> {
  return {
    nx: m.nx,
    ny: m.ny,
    pattern: m.pattern,
    acceleration: m.acceleration,
    acquired: m.acquired,
    total: m.total,
    fraction: m.fraction,
    acs: m.acs,
    representation: m.representation,
    seed: m.seed,
    ...(m.details ? { details: m.details } : {}),
  };
}

export function psfSummary(d: MaskDiagnostics): z.infer<typeof psfSummarySchema> {
  return { peakSidelobe: d.peakSidelobe, mainLobeRadius: d.mainLobeRadius, radialProfile: d.radialProfile };
}
