/**
 * The pieces of the sampling, reconstruction and pipeline modules the plan engine builds on, in one
 * place (their module contracts: sampling/ generateMask and SampledMask, src/recon methodSchema,
 * src/acquisition noiseSchema, src/pipeline runReconstruction).
 */
export {
  acquiredUnitSchema,
  cartesianRandomSchema,
  cartesianUniformSchema,
  customSchema,
  generateMask,
  latticeSchema,
  poissonDiscSchema,
  radialSchema,
  type SampledMask,
  type SamplingSpec,
  samplingSchema,
  spiralSchema,
} from '../../sampling/index.ts';
export { noiseSchema } from '../acquisition/index.ts';
export { lesionSpecOf, lesionsSchema, phantomLesionPositions } from '../fidelity/index.ts';
export { getPhantom } from '../phantoms/index.ts';
export { gFactorSummarySchema } from '../pipeline/coil-g-factor.ts';
export {
  type CoilsSpec,
  coilsLabel,
  coilsSchema,
  gFactorRequestSchema,
  type PhaseSpec,
  phaseSchema,
} from '../pipeline/coil-request.ts';
export type { FidelityOutcome } from '../pipeline/lesion-run.ts';
export {
  type PipelineContext,
  type ReconstructionOutcome,
  runReconstruction,
  scoredMatrixSchemaFor,
  sourceSchema,
} from '../pipeline/run-reconstruction.ts';
export { type MethodSpec, methodSchema, methodSchemaFor } from '../recon/index.ts';
export { type VolumeAcquisitionMode, volumeAcquisitionSchema } from '../volume/volume-schema.ts';
export { nonCartesianVolume, unsupportedVolumePieces } from '../volume/volume-support.ts';
