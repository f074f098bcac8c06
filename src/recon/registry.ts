import { z } from 'zod';
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
