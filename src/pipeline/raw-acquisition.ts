import type { SampledMask } from '../../sampling/index.ts';
import {
  acquireRawLines,
  checkedSnr,
  type NoiseSpec,
  objectMaskOf,
  type RawKspace,
  sigmaForSnr,
  whitenedRawKspace,
} from '../acquisition/index.ts';
import type { ComplexImage } from '../core/complex-image.ts';
import { ValidationError } from '../core/errors.ts';
import { type CoilData, coilImages, combineCoilImages } from '../recon/index.ts';
import type { CoilsSpec } from './coil-request.ts';

/** The acquired coil data of an imported raw file, with the reference every score compares against. */
export interface RawAcquisition {
  coils: CoilData;
  /** Root-sum-of-squares of the fully sampled (prewhitened) coil images (docs/design.md §3.8). */
  reference: ComplexImage;
  objectMask: Uint8Array;
  /** σ per real channel of the added noise in each prewhitened coil; 0 without `noise`. */
  sigma: number;
}

/**
 * A raw source (docs/design.md §2.1): the file's fully sampled coil k-space is the data, so the
 * matrix must be the file's, the receive array is the file's own (no `coils` piece but uniform), and
 * the mask selects the acquired lines. Prewhitened with the file's noise covariance when it has
 * one; no noise is added unless `noise` asks for it (σ = mean |reference| over the object / SNR, per
 * real channel in every prewhitened coil). No maps are known: CoilData.maps is absent.
 */
export function rawAcquisition(
  raw: RawKspace,
  request: { matrix: { nx: number; ny: number }; coils?: CoilsSpec; noise?: NoiseSpec },
  sampled: SampledMask,
  seed: number,
  notes: string[],
): RawAcquisition {
  const { nx, ny, coils } = raw.kspace;
  if (request.matrix.nx !== nx || request.matrix.ny !== ny) {
    throw new ValidationError({
      field: 'matrix',
      message: `the raw data's reconstructed matrix is nx = ${nx}, ny = ${ny}; raw data are not resampled`,
      allowed: `{ nx: ${nx}, ny: ${ny} }`,
    });
  }
  if (request.coils !== undefined && !('array' in request.coils && request.coils.array === 'uniform')) {
    throw new ValidationError({
      field: 'coils',
      message: 'raw data bring their own receive array; a simulated array or maps cannot be applied',
      allowed: 'no coils piece (or { array: "uniform" }) with source.rawId',
    });
  }
  if (sampled.trajectory) {
    throw new ValidationError({
      field: 'sampling.trajectory',
      message: 'raw data are Cartesian lines; a non-Cartesian trajectory cannot be taken from them',
      allowed: "a Cartesian pattern, or trajectory: 'rasterised'",
    });
  }
  const full = whitenedRawKspace(raw);
  const reference = combineCoilImages(coilImages(full)).image;
  const objectMask = objectMaskOf(reference);
  const snr = checkedSnr(request.noise);
  const sigma = snr === null ? 0 : sigmaForSnr(reference, objectMask, snr);
  notes.push(
    `raw data, ${coils} coils${raw.noiseCovariance ? ', prewhitened with the noise covariance of its noise scans' : ' (no noise scans: not prewhitened)'}; ` +
      'reference: root-sum-of-squares of the fully sampled coil images, which carry the scan’s own noise',
  );
  if (sigma > 0) {
    notes.push(`complex Gaussian noise added: σ = ${sigma.toPrecision(4)} per real channel in every coil`);
  }
  const kspace = acquireRawLines(full, sampled.mask, sigma, seed);
  return { coils: { kspace }, reference, objectMask, sigma };
}
