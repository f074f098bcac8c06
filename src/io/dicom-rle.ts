import { DecodeError } from '../core/errors.ts';

/**
 * DICOM RLE Lossless (PS3.5 Annex G): a 64-byte header (segment count, then 15 little-endian
 * offsets), one PackBits-style segment per byte plane, most significant byte plane first, one
 * plane group per sample. Returns the frame as little-endian interleaved samples.
 */
export function decodeRleFrame(
  fragment: Uint8Array,
  rows: number,
  columns: number,
  bytesPerSample: number,
  samplesPerPixel: number,
): Uint8Array {
  const pixels = rows * columns;
  if (fragment.length < 64) throw new DecodeError('RLE frame shorter than its 64-byte header');
  const view = new DataView(fragment.buffer, fragment.byteOffset, fragment.byteLength);
  const segments = view.getUint32(0, true);
  const expectedSegments = bytesPerSample * samplesPerPixel;
  if (segments !== expectedSegments || segments > 15) {
    throw new DecodeError(`RLE frame has ${segments} segments, expected ${expectedSegments}`);
  }
  const out = new Uint8Array(pixels * expectedSegments);
  for (let s = 0; s < segments; s++) {
    const start = view.getUint32(4 + 4 * s, true);
    const end = s + 1 < segments ? view.getUint32(8 + 4 * s, true) : fragment.length;
    if (start < 64 || end > fragment.length || start > end)
      throw new DecodeError('RLE segment offsets out of range');
    const sample = Math.floor(s / bytesPerSample);
    // Segment 0 of a sample holds its most significant byte; output is little-endian.
    const byteInSample = bytesPerSample - 1 - (s % bytesPerSample);
    const stride = expectedSegments;
    const offset = sample * bytesPerSample + byteInSample;
    let p = start;
    let written = 0;
    while (p < end && written < pixels) {
      const header = (fragment[p++] << 24) >> 24; // signed byte
      if (header >= 0) {
        const count = header + 1;
        for (let i = 0; i < count && written < pixels && p < end; i++)
          out[offset + stride * written++] = fragment[p++];
      } else if (header !== -128) {
        const count = 1 - header;
        const value = fragment[p++];
        for (let i = 0; i < count && written < pixels; i++) out[offset + stride * written++] = value;
      }
    }
    if (written < pixels) throw new DecodeError('RLE segment ends before the frame is complete');
  }
  return out;
}
