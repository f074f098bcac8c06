export {
  type ContrastDetailCell,
  type ContrastDetailPoint,
  contrastDetailCells,
  contrastDetailCurve,
} from './contrast-detail-curve.ts';
export { contrastDetailLesionSet } from './contrast-detail-set.ts';
export { contrastRecovery, fullySampledResponse, lesionResponse } from './contrast-recovery.ts';
export { lesionCnr, npwDetectability, ROSE_K, roseResolved } from './detectability.ts';
export { countFalseLesions, discFilterMap, type FalseLesions } from './false-lesions.ts';
export {
  checkLesionSpec,
  discOffsets,
  gaussianSigma,
  type Lesion,
  type LesionShape,
  type LesionSpec,
  lesionDiscPixels,
} from './lesion.ts';
export { discLesionShape, lesionGridKspace } from './lesion-kspace.ts';
export { lesionCandidates, lesionMargins, placeLesions } from './lesion-placement.ts';
export { LESION_SUPERSAMPLE, rasterizeLesions } from './lesion-raster.ts';
export {
  DEFAULT_LESION_REPLICAS,
  type LesionsRequest,
  lesionSpecOf,
  lesionsSchema,
  MAX_LESION_REPLICAS,
} from './lesion-schema.ts';
export {
  imageLesionSet,
  type LesionSet,
  lesionSetOn,
  phantomLesionPositions,
  phantomLesionSet,
} from './lesion-sources.ts';
export {
  acquiredWithNoise,
  type LesionScore,
  type LesionStudy,
  type LesionStudyInput,
  type NoiseKnowledge,
  runLesionStudy,
} from './lesion-study.ts';
export { OBJECT_FRACTION, objectSupport } from './object-support.ts';
export { observerOutput, replicaVariance, zeroFilledVariance } from './observer-noise.ts';
