import { z } from 'zod';
import type { Limits } from '../core/limits.ts';
import { withinLimit } from '../core/zod-problems.ts';
import { csTv, csTvSchema } from './cs-tv.ts';
import { lowrankHankel, lowrankHankelSchema } from './lowrank-hankel.ts';
import type { ReconMethod } from './method.ts';
import { zeroFilled, zeroFilledSchema } from './zero-filled.ts';

/** Every reconstruction method by name. Adding a method: its file, then one entry here and in methodSchema. */
export const reconMethods: ReadonlyMap<string, ReconMethod<{ name: string }>> = new Map(
  [zeroFilled, csTv, lowrankHankel].map((m) => [m.name, m as unknown as ReconMethod<{ name: string }>]),
);

export const methodSchema = z.discriminatedUnion('name', [zeroFilledSchema, csTvSchema, lowrankHankelSchema]);
export type MethodSpec = z.infer<typeof methodSchema>;
export type MethodName = MethodSpec['name'];

const limitedSchemas = new Map<number, typeof methodSchema>();

/** An iteration count refused above the configured limit (LimitError naming `method.iterations`). */
function limitedIterations(schema: z.ZodOptional<z.ZodNumber>, max: number) {
  return withinLimit(schema.unwrap(), max, ' iterations', `1 ≤ iterations ≤ ${max}`)
    .optional()
    .describe(schema.description ?? 'iteration limit');
}

/** The method piece of a request with the configured iteration limit baked in (one object per limit). */
export function methodSchemaFor(limits: Limits): typeof methodSchema {
  const max = limits.maxIterations;
  let schema = limitedSchemas.get(max);
  if (!schema) {
    schema = z.discriminatedUnion('name', [
      zeroFilledSchema,
      csTvSchema.extend({ iterations: limitedIterations(csTvSchema.shape.iterations, max) }),
      lowrankHankelSchema.extend({
        iterations: limitedIterations(lowrankHankelSchema.shape.iterations, max),
      }),
    ]) as typeof methodSchema;
    limitedSchemas.set(max, schema);
  }
  return schema;
}
