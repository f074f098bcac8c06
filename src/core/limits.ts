/** Configurable safety limits with safe defaults (overridable from the environment in main.ts). */
export interface Limits {
  maxMatrixSide: number;
  maxIterations: number;
  maxPlanCells: number;
  maxUploadBytes: number;
}

export const defaultLimits: Readonly<Limits> = Object.freeze({
  maxMatrixSide: 1024,
  maxIterations: 2000,
  maxPlanCells: 2000,
  maxUploadBytes: 64 * 1024 * 1024,
});
