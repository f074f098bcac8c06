import { z } from 'zod';

/**
 * The protocol piece of a request: what the scan-time model needs. One schema is the TypeScript
 * type, the validator and the OpenAPI schema.
 *
 * - `dimensions`: '2d' multi-slice (phase encode = matrix rows ny) or '3d' (the matrix's ny×nx
 *   plane is the phase-encode plane ky×kz; the readout is not part of the simulated matrix).
 * - `slicesPerPass`: how many slices fit in one TR (interleaved). Defaults to all `slices`, i.e. one
 *   pass, the common practice that slices do not multiply 2D time while they fit in one TR; fewer
 *   per pass means ⌈slices / slicesPerPass⌉ passes (concatenations), each a full repeat.
 */
export const protocolSchema = z
  .strictObject({
    dimensions: z.enum(['2d', '3d']).default('2d').describe("'2d' multi-slice or '3d' (ny×nx = ky×kz)"),
    trMs: z.number().positive().max(100_000).describe('repetition time in milliseconds, > 0'),
    nex: z.int().min(1).max(64).default(1).describe('number of excitations (averages), integer ≥ 1'),
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
    partialFourier: z
      .number()
      .min(0.5)
      .max(1)
      .default(1)
      .describe('fraction p of the phase-encode (ky) extent acquired, 0.5…1; keeps ⌈p·ny⌉ rows'),
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
