import { DecodeError } from '../core/errors.ts';
import { defaultLimits } from '../core/limits.ts';
import type { DecodedImage, DecodeOptions } from './decoded-image.ts';
import { decodeDicom, isDicomPart10 } from './dicom.ts';
import { decodeNifti, inflatedNifti, isGzip, niftiKind, unrecognisedFile } from './nifti.ts';
import { decodeRaster } from './raster.ts';

export type { DecodedImage, DecodeOptions, ImageFormat } from './decoded-image.ts';

/** Decompression bound when the caller gives none (the default upload limit). */
const defaultMaxBytes = defaultLimits.maxUploadBytes;

function startsWith(bytes: Uint8Array, signature: number[]): boolean {
  return bytes.length >= signature.length && signature.every((b, i) => bytes[i] === b);
}

/**
 * Decodes an uploaded file by its content (magic numbers), never by its name or declared type:
 * PNG, JPEG, TIFF, DICOM Part 10, NIfTI-1/-2 (.nii, .nii.gz). Anything else is a DecodeError (415).
 */
export async function decodeImage(bytes: Buffer, options: DecodeOptions = {}): Promise<DecodedImage> {
  const decoded = await decodeByContent(bytes, options);
  // Float NIfTI may hold NaN or ±∞ (nifti1.h allows them); the simulation needs finite numbers.
  const replaced = zeroNonFinite(decoded.image.data);
  if (replaced > 0) decoded.notes.push(`${replaced} non-finite values (NaN, ±∞) replaced by 0`);
  const replacedInVolume = decoded.volume ? zeroNonFinite(decoded.volume.data) : 0;
  if (replacedInVolume > 0) {
    decoded.notes.push(`${replacedInVolume} non-finite values (NaN, ±∞) in the volume replaced by 0`);
  }
  return decoded;
}

function zeroNonFinite(data: Float64Array): number {
  let replaced = 0;
  for (let i = 0; i < data.length; i++) {
    if (!Number.isFinite(data[i])) {
      data[i] = 0;
      replaced++;
    }
  }
  return replaced;
}

async function decodeByContent(bytes: Buffer, options: DecodeOptions): Promise<DecodedImage> {
  // DICOM first: a Part 10 preamble may itself look like a TIFF header (PS3.10 7.1 allows dual-format files).
  if (isDicomPart10(bytes)) return decodeDicom(bytes, options);
  if (startsWith(bytes, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]))
    return decodeRaster(bytes, 'png', options);
  if (startsWith(bytes, [0xff, 0xd8, 0xff])) return decodeRaster(bytes, 'jpeg', options);
  if (startsWith(bytes, [0x49, 0x49, 0x2a, 0x00]) || startsWith(bytes, [0x4d, 0x4d, 0x00, 0x2a])) {
    return decodeRaster(bytes, 'tiff', options);
  }
  if (isGzip(bytes)) {
    const plain = await inflatedNifti(bytes, { ...options, maxBytes: options.maxBytes ?? defaultMaxBytes });
    return decodeNifti(plain, options);
  }
  if (niftiKind(bytes) !== null) return decodeNifti(bytes, options);
  throw new DecodeError(unrecognisedFile);
}
