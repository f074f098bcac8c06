import sharp from 'sharp';
import type { SampledMask } from '../../sampling/index.ts';
import { ValidationError } from '../core/errors.ts';
import type { RealImage } from '../core/real-image.ts';

/** Decades of dynamic range shown by the log scale unless told otherwise (60 dB in amplitude). */
export const DEFAULT_LOG_DECADES = 3;

export interface GreyPngOptions {
  /** Bits per sample of the PNG (default 8). */
  bits?: 8 | 16;
  /** linear: v / max; log: 1 + log10(v / max) / decades, clipped to [0, 1] (default linear). */
  scale?: 'linear' | 'log';
  /** Value shown as white (default: the image maximum). */
  max?: number;
  /** Dynamic range of the log scale in decades (default 3). */
  decades?: number;
}

/**
 * Maps an image to [0, 1] grey levels: values ≤ 0 (and NaN) are black, values ≥ max white.
 * Linear: v / max. Log: 1 + log10(v / max) / decades, so max is white and max·10^(−decades) black.
 */
export function greyLevels(image: RealImage, options: GreyPngOptions = {}): Float64Array {
  const { data } = image;
  const scale = options.scale ?? 'linear';
  const decades = options.decades ?? DEFAULT_LOG_DECADES;
  if (!(decades > 0) || !Number.isFinite(decades)) {
    throw new ValidationError({
      field: 'png.decades',
      message: `must be > 0, got ${decades}`,
      allowed: '> 0',
    });
  }
  let max = options.max;
  if (max === undefined) {
    max = 0;
    for (let i = 0; i < data.length; i++) if (data[i] > max) max = data[i];
  }
  if (!Number.isFinite(max)) {
    throw new ValidationError({
      field: 'png.max',
      message: `must be finite, got ${max}`,
      allowed: 'finite, > 0',
    });
  }
  const out = new Float64Array(data.length);
  if (!(max > 0)) return out;
  for (let i = 0; i < data.length; i++) {
    const v = data[i];
    if (!(v > 0)) continue;
    const level = scale === 'log' ? 1 + Math.log10(v / max) / decades : v / max;
    out[i] = Math.min(Math.max(level, 0), 1);
  }
  return out;
}

/**
 * A grey PNG of a real image through sharp: row 0 of the image is the top row of the picture,
 * 8-bit levels round(255·g) or 16-bit levels round(65535·g) with g from greyLevels.
 */
export async function greyPng(image: RealImage, options: GreyPngOptions = {}): Promise<Buffer> {
  const { nx, ny, data } = image;
  const bits = options.bits ?? 8;
  if (bits !== 8 && bits !== 16) {
    throw new ValidationError({
      field: 'png.bits',
      message: `must be 8 or 16, got ${bits}`,
      allowed: '8 | 16',
    });
  }
  if (!Number.isInteger(nx) || !Number.isInteger(ny) || nx < 1 || ny < 1 || data.length !== nx * ny) {
    throw new ValidationError({
      field: 'image',
      message: `image of ${ny}×${nx} holds ${data.length} values`,
      allowed: 'positive integer sizes with nx·ny values',
    });
  }
  const levels = greyLevels(image, options);
  const raw = { width: nx, height: ny, channels: 1 as const };
  if (bits === 16) {
    const samples = new Uint16Array(nx * ny);
    for (let i = 0; i < samples.length; i++) samples[i] = Math.round(levels[i] * 65535);
    return sharp(samples, { raw }).toColourspace('grey16').png().toBuffer();
  }
  const samples = new Uint8Array(nx * ny);
  for (let i = 0; i < samples.length; i++) samples[i] = Math.round(levels[i] * 255);
  return sharp(samples, { raw }).toColourspace('b-w').png().toBuffer();
}

/** The sampling mask as an 8-bit grey PNG, ny rows × nx columns: 255 = acquired, 0 = not. */
export async function maskPng(m: SampledMask): Promise<Buffer> {
  const samples = new Uint8Array(m.nx * m.ny);
  for (let i = 0; i < samples.length; i++) samples[i] = m.mask[i] !== 0 ? 255 : 0;
  return sharp(samples, { raw: { width: m.nx, height: m.ny, channels: 1 } })
    .toColourspace('b-w')
    .png()
    .toBuffer();
}
