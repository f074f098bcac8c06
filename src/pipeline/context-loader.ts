import { type FieldProblem, ValidationError } from '../core/errors.ts';

/**
 * What one of the PipelineContext loaders (uploaded image, volume, coil maps, raw data) gives for
 * `id`. A context without that loader has no store behind it (a bare engine call, a test): the
 * request is refused with `unavailable`, a ValidationError naming the field that asked for it.
 */
export async function loadFromContext<T>(
  load: ((id: string) => Promise<T>) | undefined,
  id: string,
  unavailable: FieldProblem,
): Promise<T> {
  if (!load) throw new ValidationError(unavailable);
  return load(id);
}
