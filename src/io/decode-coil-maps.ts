import type { CoilMaps } from '../encoding/index.ts';
import { type CoilPlanes, decodeCoilPlanes } from './coil-planes.ts';
import { decodeNiftiCoilMaps } from './nifti-coil-maps.ts';

/** An upload of coil maps in either form POST /v1/coil-maps takes. */
export type CoilMapsUpload =
  | { planes: CoilPlanes }
  | { nifti: Uint8Array; limits: { maxSide: number; maxBytes: number } };

/** Decoded maps with the whitelisted facts of their form (numbers and names only). */
export interface DecodedCoilMaps {
  maps: CoilMaps;
  format: 'planes' | 'nifti';
  details: Record<string, string | number | number[]>;
}

/** Decodes either upload form into checked maps (see coil-planes.ts and nifti-coil-maps.ts). */
export async function decodeCoilMaps(upload: CoilMapsUpload): Promise<DecodedCoilMaps> {
  if ('planes' in upload) {
    return { maps: decodeCoilPlanes(upload.planes), format: 'planes', details: { datatype: 'float32' } };
  }
  const bytes = upload.nifti;
  const { maps, details } = await decodeNiftiCoilMaps(
    Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength),
    upload.limits,
  );
  return { maps, format: 'nifti', details };
}
