export {
  COIL_LIMITS,
  type CoilArraySpec,
  coilArrayMaps,
  coilArrayNoise,
  type GaussianArraySpec,
  type LoopArraySpec,
  type UniformArraySpec,
} from './coil-array.ts';
export { analyticCoilKspace } from './coil-kspace.ts';
export { analyticCoilSamplesAt } from './coil-samples-at.ts';
export { gaussianArrayMaps } from './gaussian-array.ts';
export { arrayLoops, loopArrayMaps } from './loop-array.ts';
export { addLoopField, type CircularLoop } from './loop-field.ts';
export { CoilNoise, ringCorrelationRange, ringNoiseCovariance } from './noise-covariance.ts';
export { normaliseSumOfSquares } from './normalise.ts';
export {
  type GFactorMapOptions,
  type GFactorSummary,
  SenseFoldSolver,
  senseGFactorMap,
  summariseGFactor,
} from './sense-g-factor.ts';
export {
  evaluateTrigPolynomial,
  fitTrigPolynomial,
  TRIG_FIT_LIMITS,
  type TrigFitError,
  type TrigFitOptions,
  type TrigPolynomialMaps,
  trigFitError,
} from './trig-fit.ts';
