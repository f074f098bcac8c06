import type { InputRef, Store } from '../jobs/store.ts';
import type { UploadedCoilMaps } from '../jobs/tasks.ts';
import type { Caller } from './caller.ts';
import { coilMapsNotFound, readCoilMaps } from './coil-maps.ts';

/** An uploaded coil-map id a request names, with the field that names it (for a 404). */
export interface CoilMapRef {
  id: string;
  field: string;
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

function mapsIdOf(coils: unknown): string | undefined {
  return isRecord(coils) && typeof coils.mapsId === 'string' ? coils.mapsId : undefined;
}

/**
 * The maps a request names: a reconstruction's `coils: { mapsId }`, a plan's
 * `coilArrays: [{ mapsId }, …]`. Read from the parsed request by shape, so any piece that carries
 * `mapsId` there is found; an id named twice is loaded once.
 */
export function coilMapRefs(request: unknown): CoilMapRef[] {
  if (!isRecord(request)) return [];
  const refs: CoilMapRef[] = [];
  const single = mapsIdOf(request.coils);
  if (single !== undefined) refs.push({ id: single, field: 'coils.mapsId' });
  if (Array.isArray(request.coilArrays)) {
    request.coilArrays.forEach((coils, i) => {
      const id = mapsIdOf(coils);
      if (id !== undefined) refs.push({ id, field: `coilArrays[${i}].mapsId` });
    });
  }
  return refs.filter((ref, i) => refs.findIndex((other) => other.id === ref.id) === i);
}

/** The input links a result or plan made with these maps records (deleting the maps deletes it). */
export function coilMapInputs(refs: readonly CoilMapRef[]): InputRef[] {
  return refs.map((ref) => ({ kind: 'coilMaps', id: ref.id }));
}

/**
 * Loads every map a request names for the caller, to send to the worker with the task; an id the
 * caller may not see is a 404 naming its field.
 */
export function loadNamedCoilMaps(
  store: Store,
  refs: readonly CoilMapRef[],
  caller: Caller,
): UploadedCoilMaps[] {
  return refs.map((ref) => ({ id: ref.id, maps: readCoilMaps(store, ref.id, caller, ref.field) }));
}

/**
 * The submit check of a plan's maps (as for its image): each named id must exist for the caller,
 * else a 404 naming `coilArrays[i].mapsId`. Gives the links the stored plan records.
 */
export function checkPlanCoilMaps(store: Store, plan: unknown, caller: Caller): InputRef[] {
  const refs = coilMapRefs(plan);
  for (const ref of refs) {
    if (!store.getCoilMapsInfo(ref.id, caller.scope)) throw coilMapsNotFound(ref.id, ref.field);
  }
  return coilMapInputs(refs);
}
