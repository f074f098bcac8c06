export { type RadialOrdering, radialAngles, tinyGoldenAngle } from './radial-angles.ts';
export {
  nyquistSpokeCount,
  type RadialTrajectory,
  type RadialTrajectorySpec,
  radialTrajectory,
} from './radial-trajectory.ts';
export {
  nyquistSpiralInterleaves,
  type SpiralTrajectory,
  type SpiralTrajectorySpec,
  spiralTrajectory,
} from './spiral-trajectory.ts';
export type { Trajectory } from './trajectory.ts';
