import sharp, { type Metadata, type OutputInfo } from 'sharp';
import { DecodeError, LimitError } from '../core/errors.ts';
import type { DecodedImage, DecodeOptions, ImageFormat } from './decoded-image.ts';
import { checkImageSize, checkIndex } from './image-size.ts';

/** ITU-R BT.709 luma weights (the ones skimage.color.rgb2gray uses), applied to the stored values. */
export const lumaWeights = [0.2125, 0.7154, 0.0721] as const;

/**
 * PNG, JPEG and TIFF through sharp: 8- or 16-bit values kept as stored (no display scaling),
 * colour reduced to BT.709 luminance, alpha ignored. TIFF pages are chosen with `frame`.
 */
export async function decodeRaster(
  bytes: Buffer,
  format: Extract<ImageFormat, 'png' | 'jpeg' | 'tiff'>,
  options: DecodeOptions = {},
): Promise<DecodedImage> {
  let metadata: Metadata;
  try {
    // The header alone (no pixel is decoded): lift sharp's pixel cap here so that an oversized image
    // is reported as such by checkImageSize (422 limit-exceeded) rather than as unreadable.
    metadata = await sharp(bytes, { failOn: 'error', limitInputPixels: false }).metadata();
  } catch {
    throw new DecodeError(`the ${format.toUpperCase()} file could not be read (damaged or truncated)`);
  }
  const { width, height } = metadata;
  if (!width || !height) throw new DecodeError(`the ${format.toUpperCase()} file has no image size`);
  checkImageSize(width, height, options.maxSide);
  const pages = metadata.pages ?? 1;
  const page = options.frame ?? 0;
  checkIndex('frame', page, pages);
  const depth = metadata.depth === 'ushort' ? 'ushort' : 'uchar';
  if (metadata.depth !== 'uchar' && metadata.depth !== 'ushort') {
    throw new DecodeError(`sample format ${metadata.depth} is not supported (8- or 16-bit integers only)`);
  }
  const colour = (metadata.channels ?? 1) >= 3;
  // The decoder itself refuses more pixels than the matrix limit allows (a second guard for files
  // whose pages differ in size).
  const limitInputPixels = options.maxSide === undefined ? true : options.maxSide * options.maxSide;
  let pipeline = sharp(bytes, { failOn: 'error', page, limitInputPixels });
  if (!colour) pipeline = pipeline.toColourspace(depth === 'ushort' ? 'grey16' : 'b-w');
  let raw: { data: Buffer; info: OutputInfo };
  try {
    raw = await pipeline.raw({ depth }).toBuffer({ resolveWithObject: true });
  } catch (error) {
    if (limitInputPixels !== true && /pixel limit/.test(String((error as Error)?.message))) {
      throw new LimitError({
        field: 'file',
        message: `page ${page} has more than ${limitInputPixels} pixels`,
        allowed: `≤ ${options.maxSide} per side`,
      });
    }
    throw new DecodeError(
      `the ${format.toUpperCase()} pixel data could not be decoded (damaged or truncated)`,
    );
  }
  const { data: buffer, info } = raw;
  const samples =
    depth === 'ushort'
      ? new Uint16Array(buffer.buffer, buffer.byteOffset, buffer.byteLength / 2)
      : new Uint8Array(buffer.buffer, buffer.byteOffset, buffer.byteLength);
  const n = info.width * info.height;
  const data = new Float64Array(n);
  const channels = info.channels;
  const notes: string[] = [];
  if (colour && channels >= 3) {
    const [wr, wg, wb] = lumaWeights;
    for (let i = 0, s = 0; i < n; i++, s += channels) {
      data[i] = wr * samples[s] + wg * samples[s + 1] + wb * samples[s + 2];
    }
    notes.push(
      'colour converted to luminance Y = 0.2125 R + 0.7154 G + 0.0721 B (ITU-R BT.709) on stored values',
    );
  } else {
    for (let i = 0, s = 0; i < n; i++, s += channels) data[i] = samples[s];
  }
  if (metadata.hasAlpha) notes.push('alpha channel ignored');
  return {
    image: { nx: info.width, ny: info.height, data },
    format,
    meta: {
      bitsPerSample: depth === 'ushort' ? 16 : 8,
      channels: metadata.channels ?? 1,
      colour,
      pages,
      frame: page,
    },
    notes,
  };
}
