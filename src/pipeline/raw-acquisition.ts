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
import { fft2c } from '../core/centered-fft.ts';
import type { ComplexImage } from '../core/complex-image.ts';
import { ValidationError } from '../core/errors.ts';
import type { MultiCoilKspace } from '../encoding/index.ts';
import {
  type CoilData,
  coilImages,
  combineCoilImages,
  type ReconInput,
  zeroFilledCoilCombination,
} from '../recon/index.ts';
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
 * The request's matrix must be the raw data's own reconstructed matrix (raw data are not
 * resampled), nz included: a 3D acquisition is a volume request, a 2D slice is not.
 */
export function checkRawMatrixSides(
  raw: { nx: number; ny: number; nz: number },
  matrix: { nx: number; ny: number; nz?: number },
): void {
  if (raw.nx === matrix.nx && raw.ny === matrix.ny && raw.nz === (matrix.nz ?? 1)) return;
  const volume = raw.nz > 1;
  const sides = `nx = ${raw.nx}, ny = ${raw.ny}${volume ? `, nz = ${raw.nz}` : ''}`;
  throw new ValidationError({
    field: 'matrix',
    message: `the raw data's reconstructed matrix is ${sides}; raw data are not resampled`,
    allowed: `{ nx: ${raw.nx}, ny: ${raw.ny}${volume ? `, nz: ${raw.nz}` : ''} }`,
  });
}

/**
 * What every raw source refuses, 2D or 3D: a simulated receive array (the data bring their own)
 * and a non-Cartesian trajectory (the data are Cartesian lines).
 */
export function checkRawPieces(request: { coils?: CoilsSpec }, sampled: SampledMask): void {
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
}

/** The note every raw reconstruction carries: coils, prewhitening, and what the reference is. */
export function rawDataNote(raw: RawKspace): string {
  return (
    `raw data, ${raw.kspace.coils} coils${raw.noiseCovariance ? ', prewhitened with its noise covariance (from noise scans, or as an imported acquisition bundle states it)' : ' (noise covariance unknown: not prewhitened)'}; ` +
    'reference: root-sum-of-squares of the fully sampled coil images, which carry the scan’s own noise'
  );
}

/**
 * The noise the method sees in raw data: prewhitened scan noise has unit variance per complex
 * sample, the added noise 2σ² on top; without noise scans the data's own noise is unknown (null).
 */
export function rawNoise(raw: RawKspace, sigma: number): { prewhitened: boolean; variance: number | null } {
  const prewhitened = raw.noiseCovariance !== null;
  return { prewhitened, variance: prewhitened ? 1 + 2 * sigma ** 2 : null };
}

/** Root-sum-of-squares of the fully sampled coil images (no maps are known for raw data). */
export function rawReference(full: MultiCoilKspace): ComplexImage {
  return combineCoilImages(coilImages(full)).image;
}

/**
 * The method's input from acquired raw coil k-space (unacquired points zero): the coil data
 * without maps (methods that need maps estimate them from the ACS, the others combine by
 * root-sum-of-squares), `kspace` the k-space of the combined zero-filled image, which is also the
 * zero-filled comparison image. The one place a raw 2D plane becomes a method input (2D raw
 * requests and every x-plane of a 3D raw volume).
 */
export function rawCoilInput(
  acquired: MultiCoilKspace,
  sampled: SampledMask,
): { input: ReconInput; zeroFilled: ComplexImage } {
  const coils: CoilData = { kspace: acquired };
  const zeroFilled = zeroFilledCoilCombination(coils);
  const input: ReconInput = {
    kspace: fft2c(zeroFilled),
    mask: sampled.mask,
    ...(sampled.density ? { density: sampled.density } : {}),
    coils,
  };
  return { input, zeroFilled };
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
  request: { matrix: { nx: number; ny: number; nz?: number }; coils?: CoilsSpec; noise?: NoiseSpec },
  sampled: SampledMask,
  seed: number,
  notes: string[],
): RawAcquisition {
  const { nx, ny } = raw.kspace;
  checkRawMatrixSides({ nx, ny, nz: raw.nz ?? 1 }, request.matrix);
  checkRawPieces(request, sampled);
  const full = whitenedRawKspace(raw);
  const reference = rawReference(full);
  const objectMask = objectMaskOf(reference);
  const snr = checkedSnr(request.noise);
  const sigma = snr === null ? 0 : sigmaForSnr(reference, objectMask, snr);
  notes.push(rawDataNote(raw));
  if (sigma > 0) {
    notes.push(`complex Gaussian noise added: σ = ${sigma.toPrecision(4)} per real channel in every coil`);
  }
  const kspace = acquireRawLines(full, sampled.mask, sigma, seed);
  return { coils: { kspace }, reference, objectMask, sigma };
}
