export {
  ACQUISITION_FORMAT,
  acquisitionJson,
  acquisitionNifti,
  acquisitionUrls,
} from './acquisition-export.ts';
export type { Caller, MissingImage } from './caller.ts';
export { CoilMapService, type CoilMapsInfo, coilMapsInfoSchema } from './coil-maps.ts';
export { contentId } from './content-id.ts';
export { finiteOrNull, jsonSafe } from './json-safe.ts';
export { type MaskRequest, type MaskResult, MaskService, maskResultSchema } from './masks.ts';
export { PhantomService, type RasterRequest } from './phantoms.ts';
export { planLabel } from './plan-label.ts';
export {
  isTerminal,
  type PlanListItem,
  PlanService,
  type PlanStatusView,
  planListItemSchema,
  planProgressSchema,
  planRowViewSchema,
  planStatusNames,
  planStatusSchema,
  planTableViewSchema,
} from './plans.ts';
export { RawDataService, type RawInfo, rawInfoSchema } from './raw-data.ts';
export {
  type Reconstruction,
  ReconstructionService,
  reconstructionSchema,
  type SeededReconstructionRequest,
} from './reconstructions.ts';
export { type ResultImageKey, resultImageNames, resultImageUrl } from './result-images.ts';
export { psfSummary, psfSummarySchema, sampledSummary, sampledSummarySchema } from './sampled-summary.ts';
export { ScanTimeService } from './scan-times.ts';
export { type ImageInfo, imageInfoSchema, type PictureChoice, UploadService } from './uploads.ts';
