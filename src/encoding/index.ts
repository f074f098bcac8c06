export { transformPlaneInPlace } from './block-fft.ts';
export { CartesianEncoding } from './cartesian-encoding.ts';
export type { CoilSamples, EncodingOperator, EncodingShapes } from './encoding-operator.ts';
export {
  type CoilMaps,
  checkMultiCoilShape,
  createMultiCoilArray,
  type MultiCoilArray,
  type MultiCoilKspace,
  scalePixels,
  sumOfSquaresOverCoils,
} from './multi-coil.ts';
export { NonCartesianEncoding } from './non-cartesian-encoding.ts';
export {
  addConjugateSensitivityProduct,
  peakSensitivityPower,
  sensitivityProduct,
} from './sensitivity-products.ts';
