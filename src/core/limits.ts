/** Configurable safety limits with safe defaults (overridable from the environment in main.ts). */
export interface Limits {
  maxMatrixSide: number;
  maxIterations: number;
  maxPlanCells: number;
  maxUploadBytes: number;
  /** Points per POST /v1/phantoms/{name}/kspace: a million took 3.5 s of the event loop and 50 MB of JSON. */
  maxKspacePoints: number;
}

export const defaultLimits: Readonly<Limits> = Object.freeze({
  maxMatrixSide: 1024,
  maxIterations: 2000,
  maxPlanCells: 2000,
  maxUploadBytes: 64 * 1024 * 1024,
  maxKspacePoints: 65_536,
});

/** Largest MAX_KSPACE_POINTS accepted: a million points is already about 50 MB of JSON back. */
export const MAX_KSPACE_POINTS_CEILING = 1_048_576;

/**
 * An OpenAPI id for a schema built from `fields` of the limits: the plain name with the default
 * limits (the committed openapi.yaml), suffixed with the fields that differ otherwise. zod converts
 * every registered schema together, so two schemas built from different limits in one process (tests
 * run several apps) must not share an id.
 */
export function limitsId(base: string, limits: Limits, fields: readonly (keyof Limits)[]): string {
  const differing = fields.filter((field) => limits[field] !== defaultLimits[field]);
  return differing.length === 0 ? base : `${base}_${differing.map((f) => `${f}${limits[f]}`).join('_')}`;
}

export const allLimitFields = Object.keys(defaultLimits) as (keyof Limits)[];
