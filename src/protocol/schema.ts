import { z } from 'zod';

/**
 * Echo-train timing (docs/design.md §2.2): with `echoSpacingMs` the slices per TR follow from the
 * train's length, ⌊TR / (echoTrainLength × echoSpacingMs + sliceOverheadMs)⌋; without it the model
 * is the one above (`slicesPerPass`, default all slices). `teMs` is the requested effective TE.
 */
const timingFields = {
  echoSpacingMs: z
    .number()
    .positive()
    .max(1000)
    .optional()
    .describe('time between echoes of a train, ms; enables the slices-per-TR and effective-TE model'),
  teMs: z
    .number()
    .positive()
    .max(100_000)
    .optional()
    .describe(
      'requested effective TE, ms: the echo that acquires the k-space centre is the one nearest it ' +
        '(needs ES ≤ teMs ≤ echoTrainLength × ES with echoSpacingMs)',
    ),
  echoOrder: z
    .enum(['linear', 'centric'])
    .optional()
    .describe(
      "echo ordering without teMs: 'linear' sweeps ky across the train (the centre where the sweep reaches it), " +
        "'centric' starts at the centre (effective TE = one echo spacing); default linear",
    ),
  sliceOverheadMs: z
    .number()
    .min(0)
    .max(100_000)
    .optional()
    .describe('time each slice needs beyond its echo train (excitation, spoilers), ms; default 0'),
};

/**
 * The protocol piece of a request: what the scan-time model needs. One schema is the TypeScript
 * type, the validator and the OpenAPI schema. Field names follow the DICOM attributes where one
 * exists (Repetition Time, Number of Averages, Echo Train Length).
 *
 * - `dimensions`: '2d' multi-slice (phase encode = matrix rows ny) or '3d' (the matrix's ny×nx
 *   plane is the phase-encode plane ky×kz; the readout is not part of the simulated matrix).
 * - `slicesPerPass`: how many slices fit in one TR (interleaved). Defaults to all `slices`, i.e. one
 *   pass, the common practice that slices do not multiply 2D time while they fit in one TR; fewer
 *   per pass means ⌈slices / slicesPerPass⌉ passes, each a full repeat.
 * - `averages`: DICOM Number of Averages (0018,0083), the signal averages each line is acquired with.
 */
export const protocolSchema = z
  .strictObject({
    dimensions: z.enum(['2d', '3d']).default('2d').describe("'2d' multi-slice or '3d' (ny×nx = ky×kz)"),
    trMs: z.number().positive().max(100_000).describe('repetition time in milliseconds, > 0'),
    averages: z
      .int()
      .min(1)
      .max(64)
      .default(1)
      .describe('number of signal averages (DICOM Number of Averages, 0018,0083), integer ≥ 1; default 1'),
    echoTrainLength: z
      .int()
      .min(1)
      .max(1024)
      .default(1)
      .describe('echoes (phase-encode lines or points) per TR; lines per shot rounded up to whole shots'),
    slices: z.int().min(1).max(1024).default(1).describe('2D slices; must be 1 in 3D'),
    slicesPerPass: z
      .int()
      .min(1)
      .max(1024)
      .optional()
      .describe('slices that fit in one TR (default: all of them, one pass)'),
    partitions: z
      .int()
      .min(1)
      .max(1024)
      .default(1)
      .describe(
        'kz partitions of a 3D stack of stars or spirals (radial or spiral in the simulated plane); ' +
          'Cartesian 3D takes kz from the matrix and needs 1',
      ),
    partialFourier: z
      .number()
      .min(0.5)
      .max(1)
      .default(1)
      .describe(
        'fraction p of the phase-encode (ky) extent acquired, 0.5…1; keeps ⌈p·ny⌉ rows. Deprecated alias of ' +
          'sampling.partialFourier (the same rows), accepted in this version; when both are given they must agree',
      ),
    ...timingFields,
  })
  .superRefine((p, ctx) => {
    if (p.dimensions === '3d' && p.slices !== 1) {
      ctx.addIssue({
        code: 'custom',
        path: ['slices'],
        message: "3D partitions are the matrix's nx (kz); slices must be 1",
        params: { allowed: "1 when dimensions is '3d'" },
      });
    }
  })
  .describe('Scan-time parameters');

export type Protocol = z.output<typeof protocolSchema>;
export type ProtocolInput = z.input<typeof protocolSchema>;
