import { ValidationError } from '../core/errors.ts';
import { type CoilMaps, createMultiCoilArray } from '../encoding/index.ts';
import { checkCoilMapValues } from './coil-map-values.ts';

/** Maps as the JSON upload carries them: per coil a real and an imaginary plane in base64. */
export interface CoilPlanes {
  nx: number;
  ny: number;
  coils: Array<{ re: string; im: string }>;
}

/** The base64 length of `bytes` bytes with padding (RFC 4648 §4): 4 characters per 3 bytes begun. */
export function base64Length(bytes: number): number {
  return 4 * Math.ceil(bytes / 3);
}

/**
 * Decodes the planes into coil-major interleaved maps. Each plane is ny×nx little-endian float32,
 * row-major in the image convention (row 0 at the top), exactly 4·nx·ny bytes; the values are used
 * as given (float32 → float64 is exact). Bad text, a wrong length, a non-finite value or a coil that
 * is zero everywhere is a ValidationError naming `coils[c].re` / `coils[c].im` / `coils[c]`.
 */
export function decodeCoilPlanes(planes: CoilPlanes): CoilMaps {
  const { nx, ny } = planes;
  const plane = nx * ny;
  const maps = createMultiCoilArray(planes.coils.length, nx, ny);
  planes.coils.forEach((coil, c) => {
    for (const [part, offset] of [
      ['re', 0],
      ['im', 1],
    ] as const) {
      const field = `coils[${c}].${part}`;
      const text = coil[part];
      const bytes = Buffer.from(text, 'base64');
      // Node's decoder skips what is not base64; encoding back must give the text itself. One pass
      // each way, ten times faster on a 256² plane than an anchored regular expression.
      if (bytes.toString('base64') !== text) {
        throw new ValidationError({
          field,
          message: 'not base64 text',
          allowed: 'standard base64 (A–Z, a–z, 0–9, +, /) with = padding and no line breaks, RFC 4648 §4',
        });
      }
      if (bytes.length !== 4 * plane) {
        throw new ValidationError({
          field,
          message: `decodes to ${bytes.length} bytes`,
          allowed: `exactly 4·nx·ny = ${4 * plane} bytes (${ny}×${nx} float32; ${base64Length(4 * plane)} base64 characters)`,
        });
      }
      const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
      const base = 2 * c * plane + offset;
      for (let p = 0; p < plane; p++) maps.data[base + 2 * p] = view.getFloat32(4 * p, true);
    }
  });
  checkCoilMapValues(maps, (c, part) => (part === null ? `coils[${c}]` : `coils[${c}].${part}`));
  return maps;
}
