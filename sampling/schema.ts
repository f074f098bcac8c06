import { z } from 'zod';
import { type FieldProblem, ValidationError } from '../src/core/errors.ts';
import { problemsFromIssues } from '../src/core/zod-problems.ts';
import { noPartialFourier, partialFourierFraction } from './partial-fourier.ts';

/**
 * The "sampling" piece of a request (docs/design.md §4.3): one object per mask family, told apart by `pattern`.
 * Matrix-dependent limits (R too high for the matrix, ACS larger than the matrix) are checked by the
 * generators, which know the matrix; this schema checks what can be checked on its own.
 */

export const SAMPLING_PATTERNS = [
  'cartesian-uniform',
  'cartesian-random',
  'poisson-disc',
  'radial',
  'spiral',
  'custom',
  'lattice',
] as const;
export type SamplingPattern = (typeof SAMPLING_PATTERNS)[number];

/** Largest seed: the generator state is seeded from 32 bits. */
export const MAX_SEED = 4294967295;
/** Largest polynomial power for random lines (Lustig 2007 calls d ≈ 50 "weak" variable density). */
export const MAX_LINE_DENSITY_POWER = 64;
/**
 * Fall-off powers for Poisson-disc. Some fall-off is needed: with equal radii everywhere (power 0)
 * the grid allows only a few distinct counts (the count jumps as the radius crosses √(integer)),
 * and R could miss the request by over 20 %. p = 8 already makes the edge radius (1 + √2)⁴ ≈ 34
 * times the centre one (density ratio ≈ 1150); more would only make the disc search radius huge.
 */
export const MIN_POISSON_DENSITY_POWER = 0.5;
export const MAX_POISSON_DENSITY_POWER = 8;

const acceleration = z
  .number()
  .min(1)
  .describe('Requested acceleration R = Nyquist count / acquired count; fractional values allowed, R ≥ 1.');

const acs = z
  .number()
  .int()
  .min(0)
  .optional()
  .describe(
    'Fully sampled calibration region: central lines (Cartesian lines) or an acs×acs square (Poisson-disc); ' +
      'counted in the acquired total. Default 0.',
  );

const seed = z
  .number()
  .int()
  .min(0)
  .max(MAX_SEED)
  .optional()
  .describe('Seed of every random choice; required by cartesian-random and poisson-disc.');

function densitySchema(minPower: number, maxPower: number, law: string) {
  return z
    .strictObject({
      power: z
        .number()
        .min(minPower)
        .max(maxPower)
        .optional()
        .describe(`Polynomial fall-off of the sampling density with |k| (default 2): ${law}.`),
    })
    .optional()
    .describe('Variable-density law.');
}

export const cartesianUniformSchema = z.strictObject({
  pattern: z.literal('cartesian-uniform'),
  acceleration,
  acs,
  seed,
  partialFourier: partialFourierFraction,
});

export const cartesianRandomSchema = z.strictObject({
  pattern: z.literal('cartesian-random'),
  acceleration,
  acs,
  seed,
  density: densitySchema(0, MAX_LINE_DENSITY_POWER, 'probability ∝ (1 − |ky|/max|ky|)^power'),
  partialFourier: partialFourierFraction,
});

export const poissonDiscSchema = z.strictObject({
  pattern: z.literal('poisson-disc'),
  acceleration,
  acs,
  seed,
  density: densitySchema(
    MIN_POISSON_DENSITY_POWER,
    MAX_POISSON_DENSITY_POWER,
    'disc radius ∝ (1 + ρ)^(power/2), density ∝ (1 + ρ)^(−power)',
  ),
  partialFourier: partialFourierFraction,
});

const trajectory = z
  .enum(['non-cartesian', 'rasterised'])
  .optional()
  .describe(
    "'non-cartesian' (default): samples at the exact trajectory points, reconstructed through a NUFFT; " +
      "'rasterised': each sample moved to its nearest grid point (a Cartesian mask shaped like the trajectory).",
  );

export const radialSchema = z.strictObject({
  pattern: z.literal('radial'),
  acceleration,
  angles: z
    .enum(['uniform', 'golden', 'tiny-golden'])
    .optional()
    .describe(
      'Spoke angles: equally spaced over 180°, golden-angle increments 180°/φ, or tiny golden angles ' +
        '180°/(φ + N − 1) with N = tinyN (default uniform).',
    ),
  tinyN: z
    .number()
    .int()
    .min(1)
    .max(100)
    .optional()
    .describe('N of the tiny golden angle (angles "tiny-golden" only; default 7).'),
  readoutOversampling: z
    .number()
    .int()
    .min(1)
    .max(8)
    .optional()
    .describe('Samples per spoke = oversampling × max(nx, ny), non-Cartesian only (default 2).'),
  trajectory,
  seed,
  partialFourier: noPartialFourier,
});

export const spiralSchema = z.strictObject({
  pattern: z.literal('spiral'),
  acceleration: acceleration.describe(
    'Outermost turn spacing of the combined interleaves in cycles per FOV; R = Nyquist interleaves / interleaves.',
  ),
  interleaves: z
    .number()
    .int()
    .min(1)
    .max(4096)
    .optional()
    .describe('Interleaves, rotated by 360°/interleaves (default 16); at most 4·max(nx, ny).'),
  samplesPerInterleaf: z
    .number()
    .int()
    .min(2)
    .max(1_000_000)
    .optional()
    .describe(
      'Readout samples per interleaf, equally spaced in arc length (default: spacing ≤ ½ cycle/FOV).',
    ),
  density: z
    .strictObject({
      power: z
        .number()
        .min(1)
        .max(8)
        .optional()
        .describe(
          'k ∝ τ^power: 1 = uniform-density Archimedean spiral, > 1 denser at the centre (default 1).',
        ),
    })
    .optional()
    .describe('Variable-density law.'),
  trajectory,
  seed,
  partialFourier: noPartialFourier,
});

/** Standard base64 alphabet with optional padding (RFC 4648 §4); whitespace is not accepted. */
const BASE64 = /^[A-Za-z0-9+/]*={0,2}$/;

export const customSchema = z.strictObject({
  pattern: z.literal('custom'),
  maskPng: z
    .string()
    .min(1)
    .regex(BASE64, 'must be standard base64 (RFC 4648) without whitespace')
    .optional()
    .describe(
      'Base64 PNG of exactly ny×nx pixels; a pixel with any non-zero colour channel is sampled. ' +
        'Its length is bounded by the JSON body limit (MAX_JSON_BYTES). Give this or `table`.',
    ),
  table: z
    .string()
    .min(1)
    .optional()
    .describe(
      'A sample table as GET /v1/masks/{id}/table.csv writes it: CSV with the header order,ky,kx and ' +
        'integer indices relative to the k-space centre (ky up). Give this or `maskPng`.',
    ),
  seed,
  partialFourier: partialFourierFraction,
});

/** Lattice sides: a step of more than 64 along either axis leaves too little to reconstruct. */
export const MAX_LATTICE_STEP = 64;

export const latticeSchema = z.strictObject({
  pattern: z.literal('lattice'),
  acceleration: z
    .int()
    .min(1)
    .describe('Exact R of the lattice (ACS excluded): an integer multiple of `rows`, R/rows the kz step.'),
  rows: z
    .int()
    .min(1)
    .max(MAX_LATTICE_STEP)
    .describe('step of the lattice along ky (rows of the ny×nx plane)'),
  shift: z
    .int()
    .min(0)
    .max(MAX_LATTICE_STEP - 1)
    .optional()
    .describe('kz offset added from one lattice row to the next, 0 ≤ shift < R/rows (default 0)'),
  acs,
  seed,
  partialFourier: partialFourierFraction,
});

export const samplingSchema = z.discriminatedUnion('pattern', [
  cartesianUniformSchema,
  cartesianRandomSchema,
  poissonDiscSchema,
  radialSchema,
  spiralSchema,
  customSchema,
  latticeSchema,
]);

export type SamplingSpec = z.infer<typeof samplingSchema>;
export type CartesianUniformSpec = z.infer<typeof cartesianUniformSchema>;
export type CartesianRandomSpec = z.infer<typeof cartesianRandomSchema>;
export type PoissonDiscSpec = z.infer<typeof poissonDiscSchema>;
export type RadialSpec = z.infer<typeof radialSchema>;
export type SpiralSpec = z.infer<typeof spiralSchema>;
export type CustomSpec = z.infer<typeof customSchema>;
export type LatticeSpec = z.infer<typeof latticeSchema>;

/** zod issues → field problems whose paths start with `prefix` (e.g. "sampling"): the one converter. */
export function zodProblems(error: z.ZodError, prefix: string): FieldProblem[] {
  return problemsFromIssues(error.issues, prefix);
}

/** Validates a sampling spec; throws ValidationError with `sampling.*` field paths. */
export function parseSampling(spec: unknown): SamplingSpec {
  const result = samplingSchema.safeParse(spec);
  if (!result.success) throw new ValidationError(zodProblems(result.error, 'sampling'));
  return result.data;
}
