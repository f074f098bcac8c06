import dicomParser from 'dicom-parser';
import { DecodeError, LimitError } from '../core/errors.ts';
import { defaultLimits } from '../core/limits.ts';
import { inflateRawBounded } from './bounded-inflate.ts';
import type { DecodedImage, DecodeOptions } from './decoded-image.ts';
import { decodeRleFrame } from './dicom-rle.ts';
import { checkImageSize, checkIndex } from './image-size.ts';
import { lumaWeights } from './raster.ts';

/** Transfer syntaxes (PS3.5) whose pixel data we can read. */
const transferSyntaxes: Record<string, { name: string; littleEndian: boolean; rle?: boolean }> = {
  '1.2.840.10008.1.2': { name: 'Implicit VR Little Endian', littleEndian: true },
  '1.2.840.10008.1.2.1': { name: 'Explicit VR Little Endian', littleEndian: true },
  '1.2.840.10008.1.2.1.99': { name: 'Deflated Explicit VR Little Endian', littleEndian: true },
  '1.2.840.10008.1.2.2': { name: 'Explicit VR Big Endian', littleEndian: false },
  '1.2.840.10008.1.2.5': { name: 'RLE Lossless', littleEndian: true, rle: true },
};

/** True when the bytes look like a DICOM Part 10 file ("DICM" after the 128-byte preamble). */
export function isDicomPart10(bytes: Uint8Array): boolean {
  return (
    bytes.length >= 132 &&
    bytes[128] === 0x44 &&
    bytes[129] === 0x49 &&
    bytes[130] === 0x43 &&
    bytes[131] === 0x4d
  );
}

function parse(bytes: Uint8Array, maxBytes: number): dicomParser.DataSet {
  try {
    return dicomParser.parseDicom(bytes, {
      // Deflated data sets (PS3.5 A.5) inflate into at most the upload limit: the same data set sent
      // uncompressed could be no larger. Rows and Columns lie inside the deflated part, so the matrix
      // limit can only be checked once it is inflated.
      inflater: (array: Uint8Array, position: number) => {
        const inflated = inflateRawBounded(array.subarray(position), {
          room: maxBytes - position,
          maxBytes,
          what: 'deflated data set',
        });
        const out = new Uint8Array(position + inflated.length);
        out.set(array.subarray(0, position));
        out.set(inflated, position);
        return out;
      },
    } as dicomParser.ParseDicomOptions);
  } catch (error) {
    if (error instanceof LimitError || error instanceof DecodeError) throw error;
    const overrun = typeof error === 'object' && error !== null && 'exception' in error;
    // Only the parser's fixed wording is used; header contents never reach the message.
    throw new DecodeError(
      overrun
        ? 'the DICOM file is truncated or damaged (an element runs past the end of the file)'
        : 'not a readable DICOM Part 10 file',
    );
  }
}

function decimal(dataSet: dicomParser.DataSet, tag: string, fallback: number): number {
  const text = dataSet.string(tag);
  if (text === undefined || text.trim() === '') return fallback;
  const value = Number(text.split('\\')[0]);
  return Number.isFinite(value) ? value : fallback;
}

function frameBytes(
  dataSet: dicomParser.DataSet,
  pixelElement: dicomParser.Element,
  frame: number,
  frameLength: number,
  rle: boolean,
  shape: { rows: number; columns: number; bytesPerSample: number; samplesPerPixel: number },
): Uint8Array {
  if (rle) {
    // PS3.5 A.4: each RLE frame is exactly one fragment.
    const fragments = pixelElement.fragments ?? [];
    if (frame >= fragments.length)
      throw new DecodeError('the RLE pixel data has fewer fragments than frames');
    const fragment = dicomParser.readEncapsulatedPixelDataFromFragments(dataSet, pixelElement, frame, 1);
    return decodeRleFrame(fragment, shape.rows, shape.columns, shape.bytesPerSample, shape.samplesPerPixel);
  }
  if (pixelElement.encapsulatedPixelData)
    throw new DecodeError('encapsulated pixel data in a native transfer syntax');
  const start = pixelElement.dataOffset + frame * frameLength;
  const available =
    Math.min(pixelElement.length, dataSet.byteArray.length - pixelElement.dataOffset) - frame * frameLength;
  if (available < frameLength) {
    throw new DecodeError(
      `the DICOM pixel data is truncated: frame ${frame} needs ${frameLength} bytes, ${Math.max(0, available)} present`,
    );
  }
  return dataSet.byteArray.subarray(start, start + frameLength);
}

/**
 * DICOM Part 10 (PS3.10) with native or RLE pixel data: the stored values of one frame through the
 * Modality LUT (value = Rescale Slope × stored + Rescale Intercept, PS3.3 C.11.1), MONOCHROME1
 * inverted so that larger always means brighter, RGB reduced to BT.709 luminance.
 * Only numeric image attributes are read; patient, study and institution attributes never are.
 */
export function decodeDicom(bytes: Uint8Array, options: DecodeOptions = {}): DecodedImage {
  const dataSet = parse(bytes, options.maxBytes ?? defaultLimits.maxUploadBytes);
  const transferSyntax = dataSet.string('x00020010')?.trim() ?? '1.2.840.10008.1.2';
  const syntax = transferSyntaxes[transferSyntax];
  if (!syntax) {
    throw new DecodeError(
      `DICOM transfer syntax ${transferSyntax} (compressed pixel data) is not supported; send native (uncompressed) or RLE pixel data`,
    );
  }
  const pixelElement = dataSet.elements.x7fe00010;
  if (!pixelElement) throw new DecodeError('the DICOM file has no Pixel Data (7FE0,0010)');
  const rows = dataSet.uint16('x00280010') ?? 0;
  const columns = dataSet.uint16('x00280011') ?? 0;
  checkImageSize(columns, rows, options.maxSide);
  const samplesPerPixel = dataSet.uint16('x00280002') ?? 1;
  const photometric = (dataSet.string('x00280004') ?? 'MONOCHROME2').trim().toUpperCase();
  const bitsAllocated = dataSet.uint16('x00280100') ?? 16;
  const bitsStored = dataSet.uint16('x00280101') ?? bitsAllocated;
  const highBit = dataSet.uint16('x00280102') ?? bitsStored - 1;
  const signed = (dataSet.uint16('x00280103') ?? 0) === 1;
  const planar = (dataSet.uint16('x00280006') ?? 0) === 1;
  const frames = Math.max(1, Math.trunc(decimal(dataSet, 'x00280008', 1)));
  if (![8, 16, 32].includes(bitsAllocated))
    throw new DecodeError(`Bits Allocated ${bitsAllocated} is not supported (8, 16 or 32)`);
  if (bitsStored < 1 || bitsStored > bitsAllocated || highBit < bitsStored - 1 || highBit >= bitsAllocated) {
    throw new DecodeError('inconsistent Bits Stored / High Bit');
  }
  const monochrome = photometric === 'MONOCHROME1' || photometric === 'MONOCHROME2';
  if (!(monochrome && samplesPerPixel === 1) && !(photometric === 'RGB' && samplesPerPixel === 3)) {
    throw new DecodeError(
      `photometric interpretation ${photometric} with ${samplesPerPixel} samples is not supported`,
    );
  }
  const frame = options.frame ?? 0;
  checkIndex('frame', frame, frames);

  const bytesPerSample = bitsAllocated / 8;
  const pixels = rows * columns;
  const frameLength = pixels * samplesPerPixel * bytesPerSample;
  const raw = frameBytes(dataSet, pixelElement, frame, frameLength, syntax.rle === true, {
    rows,
    columns,
    bytesPerSample,
    samplesPerPixel,
  });
  const view = new DataView(raw.buffer, raw.byteOffset, raw.byteLength);
  const littleEndian = syntax.littleEndian;
  const shift = highBit + 1 - bitsStored;
  const storedMask = bitsStored >= 32 ? 0xffffffff : 2 ** bitsStored - 1;
  const signBit = 2 ** (bitsStored - 1);
  const storedValue = (sampleIndex: number): number => {
    const offset = sampleIndex * bytesPerSample;
    let word: number;
    if (bytesPerSample === 1) word = view.getUint8(offset);
    else if (bytesPerSample === 2) word = view.getUint16(offset, littleEndian);
    else word = view.getUint32(offset, littleEndian);
    // Keep the Bits Stored field, then read it as two's complement when Pixel Representation is 1.
    let value = bitsStored >= 32 ? word >>> shift : (word >>> shift) & storedMask;
    if (signed && value >= signBit) value -= 2 * signBit;
    return value;
  };

  const slope = decimal(dataSet, 'x00281053', 1);
  const intercept = decimal(dataSet, 'x00281052', 0);
  const hasRescale = dataSet.elements.x00281053 !== undefined || dataSet.elements.x00281052 !== undefined;
  const data = new Float64Array(pixels);
  const notes: string[] = [];
  if (samplesPerPixel === 1) {
    for (let i = 0; i < pixels; i++) data[i] = slope * storedValue(i) + intercept;
  } else {
    const [wr, wg, wb] = lumaWeights;
    for (let i = 0; i < pixels; i++) {
      const [r, g, b] = planar ? [i, i + pixels, i + 2 * pixels] : [3 * i, 3 * i + 1, 3 * i + 2];
      data[i] = wr * storedValue(r) + wg * storedValue(g) + wb * storedValue(b);
    }
    notes.push('RGB converted to luminance Y = 0.2125 R + 0.7154 G + 0.0721 B (ITU-R BT.709)');
  }
  if (hasRescale) notes.push(`Modality LUT applied: value = ${slope} × stored + ${intercept}`);
  if (photometric === 'MONOCHROME1') {
    let min = Number.POSITIVE_INFINITY;
    let max = Number.NEGATIVE_INFINITY;
    for (let i = 0; i < pixels; i++) {
      if (data[i] < min) min = data[i];
      if (data[i] > max) max = data[i];
    }
    for (let i = 0; i < pixels; i++) data[i] = min + max - data[i];
    notes.push('MONOCHROME1 inverted (value → min + max − value) so that larger values are brighter');
  }
  if (pixelElement.length > frameLength * frames && !syntax.rle) {
    notes.push('Pixel Data longer than rows × columns × frames; the excess bytes were ignored');
  }
  const spacing = dataSet.string('x00280030');
  const pixelSpacingMm = spacing
    ? spacing
        .split('\\')
        .map(Number)
        .filter((v) => Number.isFinite(v))
    : null;
  return {
    image: { nx: columns, ny: rows, data },
    format: 'dicom',
    meta: {
      transferSyntax,
      transferSyntaxName: syntax.name,
      modality: codeString(dataSet.string('x00080060')),
      photometric,
      bitsAllocated,
      bitsStored,
      signed,
      frames,
      frame,
      rescaleSlope: slope,
      rescaleIntercept: intercept,
      pixelSpacingMm: pixelSpacingMm && pixelSpacingMm.length === 2 ? pixelSpacingMm : null,
    },
    notes,
  };
}

/** A Code String (upper-case letters, digits, space, underscore; PS3.5 6.2) or null: nothing free-text passes. */
function codeString(value: string | undefined): string | null {
  const text = value?.trim() ?? '';
  return /^[A-Z0-9_ ]{1,16}$/.test(text) ? text : null;
}
