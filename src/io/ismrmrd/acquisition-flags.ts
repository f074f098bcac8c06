/**
 * Acquisition flag bits of the ISMRMRD acquisition header (Inati et al. 2017), as enumerated in
 * libismrmrd's ismrmrd.h (`ISMRMRD_AcquisitionFlags`, Debian package libismrmrd-dev 1.8.0):
 * the standard numbers bits from 1, so flag n is the value 1 << (n − 1) of the 64-bit `flags` field.
 */
export const acquisitionFlagBits = {
  isNoiseMeasurement: 19,
  isParallelCalibration: 20,
  isParallelCalibrationAndImaging: 21,
  isReverse: 22,
  isNavigationData: 23,
  isPhasecorrData: 24,
  isHpFeedbackData: 26,
  isDummyscanData: 27,
  isRtFeedbackData: 28,
  isSurfaceCoilCorrectionScanData: 29,
} as const;

/** Records that carry no imaging line: calibration-only, navigator, correction and feedback data. */
export const nonImagingFlagBits: readonly number[] = [
  acquisitionFlagBits.isParallelCalibration,
  acquisitionFlagBits.isNavigationData,
  acquisitionFlagBits.isPhasecorrData,
  acquisitionFlagBits.isHpFeedbackData,
  acquisitionFlagBits.isDummyscanData,
  acquisitionFlagBits.isRtFeedbackData,
  acquisitionFlagBits.isSurfaceCoilCorrectionScanData,
];

export function hasFlag(flags: bigint, bit: number): boolean {
  return (flags & (1n << BigInt(bit - 1))) !== 0n;
}
