import { z } from 'zod';
import type { Limits } from '../core/limits.ts';
import { withinLimit } from '../core/zod-problems.ts';
import { csTv, csTvSchema } from './cs-tv.ts';
import { csWavelet, csWaveletSchema } from './cs-wavelet.ts';
import { grappa, grappaSchema } from './grappa.ts';
import { lowrankHankel, lowrankHankelSchema } from './lowrank-hankel.ts';
import type { ReconInput, ReconMethod, ReconOutput } from './method.ts';
import { partialFourierMethodField as pf } from './partial-fourier/partial-fourier-step.ts';
import { sense, senseSchema } from './sense.ts';
import { zeroFilled, zeroFilledSchema } from './zero-filled.ts';

// Every method takes `partialFourier` (how rows left out by partial Fourier are filled; a step after the method).
export const methodSchema = z.discriminatedUnion('name', [
  zeroFilledSchema.extend(pf),
  csTvSchema.extend(pf),
  csWaveletSchema.extend(pf),
  lowrankHankelSchema.extend(pf),
  senseSchema.extend(pf),
  grappaSchema.extend(pf),
]);
export type MethodSpec = z.infer<typeof methodSchema>;
export type MethodName = MethodSpec['name'];

/** Each method's spec by its name, from the schema's inferred union. */
type SpecByName = { [S in MethodSpec as S['name']]: S };

/**
 * Every reconstruction method by name, each typed with its own spec (the key must equal the
 * method's name). Adding a method: its file, then one entry here and in methodSchema.
 */
const methodByName: { readonly [N in MethodName]: ReconMethod<SpecByName[N]> } = {
  'zero-filled': zeroFilled,
  'cs-tv': csTv,
  'cs-wavelet': csWavelet,
  'lowrank-hankel': lowrankHankel,
  sense,
  grappa,
};

/** The registered methods by name, for lookups of a name not yet known to be valid. */
export const reconMethods: ReadonlyMap<string, ReconMethod<MethodSpec>> = new Map(
  Object.entries(methodByName),
);

/** Runs the method `spec` names, with `spec` typed as that method's own spec. */
export function runMethod<N extends MethodName>(
  input: ReconInput,
  spec: SpecByName[N] & { name: N },
  options: Parameters<ReconMethod['run']>[2],
): ReconOutput {
  const method: ReconMethod<SpecByName[N]> = methodByName[spec.name];
  return method.run(input, spec, options);
}

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
      zeroFilledSchema.extend(pf),
      csTvSchema.extend({ iterations: limitedIterations(csTvSchema.shape.iterations, max), ...pf }),
      csWaveletSchema.extend({ iterations: limitedIterations(csWaveletSchema.shape.iterations, max), ...pf }),
      lowrankHankelSchema.extend({
        iterations: limitedIterations(lowrankHankelSchema.shape.iterations, max),
        ...pf,
      }),
      senseSchema.extend({ iterations: limitedIterations(senseSchema.shape.iterations, max) }),
      grappaSchema,
    ]) as typeof methodSchema;
    limitedSchemas.set(max, schema);
  }
  return schema;
}
