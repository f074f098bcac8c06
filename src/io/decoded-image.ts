import type { RealImage } from '../core/real-image.ts';
import type { RealVolume } from '../core/real-volume.ts';

export type ImageFormat = 'png' | 'jpeg' | 'tiff' | 'dicom' | 'nifti';

/** Which 2D picture to take out of a file that holds several (0-based; defaults noted per format). */
export interface DecodeOptions {
  /** DICOM multi-frame frame or TIFF page; default 0. */
  frame?: number;
  /** NIfTI slice along the third axis; default the middle slice ⌊nz/2⌋. */
  slice?: number;
  /** NIfTI volume along the fourth axis; default 0. */
  volume?: number;
  /** NIfTI: also keep every slice of the chosen volume (for 3D and multi-slice plans). */
  wholeVolume?: boolean;
  /** Largest accepted width/height in pixels. */
  maxSide?: number;
  /** Largest decompressed size in bytes (gzip NIfTI, deflated DICOM); the upload limit. */
  maxBytes?: number;
}

/** One decoded 2D image plus safe, whitelisted facts about it (never patient identifiers). */
export interface DecodedImage {
  image: RealImage;
  format: ImageFormat;
  /** Numeric and enumerated facts only, chosen per format (bit depth, scaling, frame, ...). */
  meta: Record<string, string | number | boolean | number[] | null>;
  /** Human-readable notes on every transformation applied (rescale, inversion, luminance, flips). */
  notes: string[];
  /** NIfTI with `wholeVolume`: all slices of the chosen volume, rows flipped like `image`. */
  volume?: RealVolume;
}
