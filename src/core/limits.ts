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
