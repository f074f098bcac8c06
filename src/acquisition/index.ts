export { acquire } from './acquire.ts';
export { acquireTrajectory } from './acquire-trajectory.ts';
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
export { fullKspaceFromPhantom, RASTER_SUPERSAMPLE } from './phantom-source.ts';
