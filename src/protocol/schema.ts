import { z } from 'zod';

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
 * - `averages`: DICOM Number of Averages (0018,0083). `nex` is its deprecated alias, accepted for
 *   one version so that older clients keep working; it never travels past this schema.
 */
const averagesValue = z.int().min(1).max(64);

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

// Two groups so that `averages` sits after `trMs` in both schemas (and in openapi.yaml).
const leadingFields = {
  dimensions: z.enum(['2d', '3d']).default('2d').describe("'2d' multi-slice or '3d' (ny×nx = ky×kz)"),
  trMs: z.number().positive().max(100_000).describe('repetition time in milliseconds, > 0'),
};

const trailingFields = {
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
};

const averagesDescription = 'number of signal averages (DICOM Number of Averages, 0018,0083), integer ≥ 1';

/** What a client may send: `averages`, or (deprecated) `nex`, or neither (1). */
const protocolRequest = z
  .strictObject({
    ...leadingFields,
    averages: averagesValue.optional().meta({ description: `${averagesDescription}; default 1`, default: 1 }),
    nex: averagesValue.optional().meta({
      deprecated: true,
      description:
        'deprecated alias of `averages`, accepted in this version only; when both are given they must be equal',
    }),
    ...trailingFields,
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
    // Only two valid values can disagree; a bad one is reported by its own field already.
    const both = averagesValue.safeParse(p.averages).success && averagesValue.safeParse(p.nex).success;
    if (both && p.averages !== p.nex) {
      const message = `averages ${p.averages} and its deprecated alias nex ${p.nex} disagree`;
      const allowed = 'averages alone, or nex equal to averages';
      for (const path of ['averages', 'nex'])
        ctx.addIssue({ code: 'custom', path: [path], message, params: { allowed } });
    }
  });

/** What the engines read: `averages` only. Parsing it again gives the same value. */
const protocolParsed = z.strictObject({
  ...leadingFields,
  averages: averagesValue.describe(averagesDescription),
  ...trailingFields,
});

export const protocolSchema = protocolRequest
  // zod wants the transform's type to be the pipe target's input type (defaults still optional);
  // the complete value made here is one such input.
  .transform(
    ({ nex, averages, ...rest }): z.input<typeof protocolParsed> => ({
      ...rest,
      averages: averages ?? nex ?? 1,
    }),
  )
  .pipe(protocolParsed)
  .describe('Scan-time parameters');

export type Protocol = z.output<typeof protocolSchema>;
export type ProtocolInput = z.input<typeof protocolSchema>;
