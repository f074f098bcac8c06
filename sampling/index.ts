export { type AcquiredUnit, acquiredUnitSchema } from './acquired-unit.ts';
export { DEFAULT_DENSITY_POWER, lineDensityWeights } from './cartesian-random.ts';
export { customMaskFromArray } from './custom.ts';
export { DEFAULT_MAIN_LOBE_RADIUS, type MaskDiagnostics, maskDiagnostics } from './diagnostics.ts';
export { generateMask, resolveSampling } from './generate-mask.ts';
export { latticeAliasOffsets } from './lattice.ts';
export { DEFAULT_RADIAL_OVERSAMPLING, DEFAULT_SPIRAL_INTERLEAVES, trajectoryOf } from './non-cartesian.ts';
export {
  applyPartialFourier,
  keptRowCount,
  occupiedRows,
  type PartialFourierBand,
  partialFourierBand,
} from './partial-fourier.ts';
export { DEFAULT_POISSON_POWER, poissonRadiusProfile } from './poisson-disc.ts';
export { GOLDEN_ANGLE, GOLDEN_RATIO, nyquistSpokes, spokeAngles } from './radial.ts';
export { rasteriseTrajectory } from './rasterise-trajectory.ts';
export {
  orderedSampleTable,
  type SampleOrdering,
  sampleOrderingSchema,
  sampleOrderings,
} from './sample-order.ts';
export { type SampleTable, sampleTable, sampleTableCsv, sampleTableJson } from './sample-table.ts';
export { countSampled, type SampledMask } from './sampled-mask.ts';
export {
  cartesianRandomSchema,
  cartesianUniformSchema,
  customSchema,
  type LatticeSpec,
  latticeSchema,
  parseSampling,
  poissonDiscSchema,
  radialSchema,
  SAMPLING_PATTERNS,
  type SamplingPattern,
  type SamplingSpec,
  type SpiralSpec,
  samplingSchema,
  spiralSchema,
  zodProblems,
} from './schema.ts';
export type { Trajectory } from './trajectories/trajectory.ts';
