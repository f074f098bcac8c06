export { acquire } from './acquire.ts';
export { acquireCoils, type CoilAcquisition } from './acquire-coils.ts';
export { acquireTrajectory } from './acquire-trajectory.ts';
export { acquireTrajectoryCoils, type TrajectoryCoilAcquisition } from './acquire-trajectory-coils.ts';
export type { CoilSimulation } from './coil-simulation.ts';
export type { FullAcquisition } from './full-acquisition.ts';
export { fullKspaceFromImage } from './image-source.ts';
export {
  addComplexNoise,
  checkedSnr,
  meanObjectMagnitude,
  type NoiseSpec,
  noiseSchema,
  OBJECT_THRESHOLD,
  objectMaskOf,
  SNR_MAX,
  sigmaForSnr,
} from './noise.ts';
export { objectPhaseFactor } from './object-phase.ts';
export { fullKspaceFromPhantom, RASTER_SUPERSAMPLE } from './phantom-source.ts';
export { acquireRawLines, type RawKspace, whitenedRawKspace } from './raw-kspace.ts';
