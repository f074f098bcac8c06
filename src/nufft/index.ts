export { expectedRelativeError } from './accuracy-table.ts';
export { griddingReconstruction } from './gridding.ts';
export { besselI0, kaiserBessel, kaiserBesselBeta, kaiserBesselTransform } from './kaiser-bessel.ts';
export { NUFFT_DEFAULTS, type NufftOptions } from './nufft-options.ts';
export { createNufftPlan, fastGridSize, type NufftPlan } from './nufft-plan.ts';
export { PIPE_MENON_KERNEL, type PipeMenonOptions, pipeMenonWeights } from './pipe-menon-weights.ts';
export { nufftPlanFor } from './plan-cache.ts';
export { radialRampWeights, spokeAngularShares } from './radial-ramp-weights.ts';
export { type ToeplitzOperator, toeplitzNormalOperator } from './toeplitz.ts';
