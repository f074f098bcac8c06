import { createGunzip, inflateRawSync } from 'node:zlib';
import { DecodeError, LimitError } from '../core/errors.ts';

/**
 * Decompression with a ceiling on the output: a few hundred kilobytes of deflate can stand for
 * gigabytes (about 1000:1 for runs of one byte), so inflation stops as soon as the bound is passed
 * instead of after the memory is gone.
 */

function tooLarge(what: string, maxBytes: number): LimitError {
  return new LimitError({
    field: 'file',
    message: `the ${what} expands beyond ${maxBytes} bytes`,
    allowed: `≤ ${maxBytes} bytes once decompressed (the upload limit)`,
  });
}

/**
 * Raw deflate (DICOM Deflated Explicit VR Little Endian, PS3.5 A.5) into at most `room` bytes, the
 * part of the `maxBytes` limit left after what precedes the deflated data.
 */
export function inflateRawBounded(
  input: Uint8Array,
  bound: { room: number; maxBytes: number; what: string },
): Buffer {
  try {
    // node:zlib aborts with ERR_BUFFER_TOO_LARGE once the output passes maxOutputLength.
    return inflateRawSync(input, { maxOutputLength: Math.max(1, bound.room) });
  } catch (error) {
    if ((error as { code?: string }).code === 'ERR_BUFFER_TOO_LARGE')
      throw tooLarge(bound.what, bound.maxBytes);
    throw new DecodeError(`the ${bound.what} is damaged (the deflate stream cannot be inflated)`);
  }
}

/**
 * Gunzips a stream that starts with a header declaring its own length. `declaredLength` sees the
 * first bytes (at least `headerBytes`, or all of them when the stream is shorter) and returns how
 * many bytes the file needs, or throws when the header is bad. Inflation stops at that length or at
 * maxBytes, whichever comes first: what lies beyond the declared length is never inflated.
 */
export function gunzipBounded(
  input: Uint8Array,
  options: { maxBytes: number; headerBytes: number; declaredLength: (head: Buffer) => number },
): Promise<Buffer> {
  const { maxBytes, headerBytes, declaredLength } = options;
  return new Promise((resolve, reject) => {
    const gunzip = createGunzip();
    const chunks: Buffer[] = [];
    let total = 0;
    let wanted: number | undefined;
    let settled = false;
    const settle = (error: unknown, value?: Buffer): void => {
      if (settled) return;
      settled = true;
      gunzip.removeAllListeners('data');
      gunzip.destroy();
      if (error) reject(error);
      else resolve(value as Buffer);
    };
    const joined = (): Buffer => (chunks.length === 1 ? chunks[0] : Buffer.concat(chunks));
    gunzip.on('data', (chunk: Buffer) => {
      chunks.push(chunk);
      total += chunk.length;
      try {
        if (wanted === undefined && total >= headerBytes) wanted = declaredLength(joined());
      } catch (error) {
        settle(error);
        return;
      }
      if (wanted !== undefined && total >= wanted) settle(null, joined().subarray(0, wanted));
      else if (total > maxBytes) settle(tooLarge('gzip stream', maxBytes));
    });
    gunzip.on('end', () => {
      try {
        if (wanted === undefined) declaredLength(joined());
        settle(null, joined());
      } catch (error) {
        settle(error);
      }
    });
    gunzip.on('error', () => {
      settle(new DecodeError('the gzip stream is damaged or truncated'));
    });
    gunzip.end(input);
  });
}
