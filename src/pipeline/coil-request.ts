import { z } from 'zod';
import { COIL_LIMITS, ringCorrelationRange } from '../coils/index.ts';

// The receive-array and object-phase request pieces (docs/design.md §4.3), one schema each, used by
// reconstructions and plans alike. Past this edge the engines trust the typed values.

const count = z
  .int()
  .min(1)
  .max(COIL_LIMITS.maxCoils)
  .describe(`number of coils on the ring, 1–${COIL_LIMITS.maxCoils}`);

/** A number within one of COIL_LIMITS' [low, high] ranges. */
function within([low, high]: readonly [number, number]) {
  return z.number().min(low).max(high);
}

function ringRadius([low, high]: readonly [number, number], what: string) {
  const side = within([low, high]);
  return z
    .union([side, z.tuple([side, side])])
    .describe(
      `${what}: distance from the field-of-view centre, or the ring's semi-axes [x, y], ${low}–${high} phantom units (the FOV is 2 units wide)`,
    );
}

const correlation = z
  .number()
  .min(-1)
  .max(1)
  .optional()
  .describe(
    'noise correlation ρ between ring neighbours (default 0): Ψ_cc = 1, Ψ_c,c±1 = ρ; must keep Ψ positive definite (for C ≥ 3: −0.5 < ρ < 1/(2·|min cos 2πk/C|); C = 2: |ρ| < 1)',
  );

const loopsSchema = z.strictObject({
  array: z.literal('loops'),
  count,
  loopRadius: within(COIL_LIMITS.loopRadius).describe(
    `loop radius, phantom units (${COIL_LIMITS.loopRadius[0]}–${COIL_LIMITS.loopRadius[1]}); sensitivity from the Biot–Savart field`,
  ),
  ringRadius: ringRadius(COIL_LIMITS.loopRing, 'ring of loop centres'),
  correlation,
  tiltDeg: within(COIL_LIMITS.tiltDeg)
    .optional()
    .describe('out-of-plane tilt of every loop axis, degrees (default 0: axes point at the FOV centre)'),
});

const gaussianSchema = z.strictObject({
  array: z.literal('gaussian'),
  count,
  width: within(COIL_LIMITS.width).describe('standard deviation of each Gaussian profile, phantom units'),
  ringRadius: ringRadius(COIL_LIMITS.gaussianRing, 'ring of profile centres'),
  correlation,
});

const arraySchema = z
  .discriminatedUnion('array', [
    z.strictObject({ array: z.literal('uniform') }).describe('one coil, S = 1: the single-coil acquisition'),
    loopsSchema.describe('circular surface loops on a ring around the object'),
    gaussianSchema.describe('Gaussian sensitivity profiles on a ring (a simple model)'),
  ])
  .superRefine((spec, ctx) => {
    if (spec.array === 'uniform' || spec.correlation === undefined) return;
    const [low, high] = ringCorrelationRange(spec.count);
    if (!(spec.correlation > low && spec.correlation < high)) {
      ctx.addIssue({
        code: 'custom',
        path: ['correlation'],
        message: `${spec.correlation} makes the ${spec.count}-coil noise covariance not positive definite`,
        params: { allowed: `${low} < correlation < ${Number(high.toPrecision(6))}` },
      });
    }
  });

const mapsSchema = z
  .strictObject({
    mapsId: z.string().min(1).max(200).describe('id of uploaded sensitivity maps (POST /v1/coil-maps)'),
  })
  .describe('uploaded maps, used as given (never refitted or renormalised)');

export const coilsSchema = z
  .union([arraySchema, mapsSchema])
  .describe(
    'the receive array: { array: "uniform" } (default, one coil), loops or gaussian on a ring, or uploaded maps { mapsId }',
  )
  .meta({ id: 'CoilArray' });
export type CoilsSpec = z.output<typeof coilsSchema>;

export const PHASE_MAX_ORDER = 4;

export const phaseSchema = z
  .strictObject({
    order: z
      .int()
      .min(0)
      .max(PHASE_MAX_ORDER)
      .describe(`total degree of the polynomial phase in x and y, 0–${PHASE_MAX_ORDER}`),
    seed: z.int().min(0).max(4294967295).describe('seeds the polynomial coefficients'),
  })
  .describe('a smooth object phase: a seeded polynomial in x, y (the object becomes complex)')
  .meta({ id: 'ObjectPhase' });
export type PhaseSpec = z.output<typeof phaseSchema>;

/** Replica counts a pseudo-replica g-factor may ask for. */
export const G_FACTOR_REPLICAS = { min: 2, max: 200 } as const;

export const gFactorRequestSchema = z
  .strictObject({
    replicas: z
      .int()
      .min(G_FACTOR_REPLICAS.min)
      .max(G_FACTOR_REPLICAS.max)
      .describe(
        'noise replicas of the pseudo-replica g-factor (Robson et al. 2008); each costs one reconstruction, ' +
          'plus one at full sampling',
      ),
  })
  .describe(
    'a pseudo-replica g-factor for methods without a closed form (SENSE on a uniform lattice always has the analytic one)',
  )
  .meta({ id: 'GFactorRequest' });
export type GFactorRequestSpec = z.output<typeof gFactorRequestSchema>;

/** The label a table and a response use for an array: "uniform", "8 loops", "maps abc…". */
export function coilsLabel(spec: CoilsSpec): string {
  if ('mapsId' in spec) return `maps ${spec.mapsId}`;
  if (spec.array === 'uniform') return 'uniform';
  return `${spec.count} ${spec.array === 'loops' ? 'loops' : 'gaussian'}`;
}
