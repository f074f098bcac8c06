import { constants, deflateRawSync, gunzipSync, gzipSync, inflateRawSync } from 'node:zlib';
import { debianFile } from './debian-files.ts';

/**
 * Small files that inflate to hundreds of megabytes, built in memory without ever holding the
 * inflated bytes: the same compressed run of zeros is repeated. Raw deflate segments that end in a
 * full flush (byte-aligned, no reference to earlier data) may follow each other and are closed by
 * an empty final fixed-Huffman block, 0x03 0x00 (RFC 1951 §3.2.3, §3.2.6); gzip members may simply
 * be concatenated (RFC 1952 §2.2).
 */
const mebibyte = 1 << 20;
const zeroDeflateSegment = deflateRawSync(Buffer.alloc(mebibyte), { finishFlush: constants.Z_FULL_FLUSH });
const zeroGzipMember = gzipSync(Buffer.alloc(mebibyte));
const finalEmptyBlock = Buffer.from([0x03, 0x00]);

/** Raw deflate of `prefix` followed by `mebibytes` MiB of zeros. */
export function deflatedWithZeros(prefix: Uint8Array, mebibytes: number): Buffer {
  const head = deflateRawSync(prefix, { finishFlush: constants.Z_FULL_FLUSH });
  return Buffer.concat([head, ...Array(mebibytes).fill(zeroDeflateSegment), finalEmptyBlock]);
}

/** gzip of `prefix` followed by `mebibytes` MiB of zeros (one member each). */
export function gzippedWithZeros(prefix: Uint8Array, mebibytes: number): Buffer {
  return Buffer.concat([gzipSync(prefix), ...Array(mebibytes).fill(zeroGzipMember)]);
}

/**
 * pydicom's image_dfl.dcm (Deflated Explicit VR Little Endian, PS3.5 A.5) with its Pixel Data
 * length set to `mebibytes` MiB and the deflated data set rebuilt to hold that many zero bytes:
 * a few hundred kilobytes that would inflate to `mebibytes` MiB.
 */
export function deflatedDicomBomb(mebibytes: number): Buffer {
  const file = debianFile('pydicom', 'image_dfl.dcm');
  // (0002,0000) File Meta Information Group Length, explicit VR UL, right after "DICM" (PS3.10 7.1).
  const metaEnd = 132 + 12 + file.readUInt32LE(140);
  const dataSet = inflateRawSync(file.subarray(metaEnd));
  // Pixel Data (7FE0,0010) OB/OW: tag, VR, 2 reserved bytes, 4-byte length (PS3.5 7.1.2).
  const pixelTag = Buffer.from([0xe0, 0x7f, 0x10, 0x00]);
  const at = dataSet.lastIndexOf(pixelTag);
  if (at < 0) throw new Error('image_dfl.dcm has no Pixel Data element');
  const header = Buffer.from(dataSet.subarray(0, at + 12));
  header.writeUInt32LE(mebibytes * mebibyte, at + 8);
  return Buffer.concat([file.subarray(0, metaEnd), deflatedWithZeros(header, mebibytes)]);
}

/**
 * nibabel's example_nifti2.nii.gz (NIfTI-2, int16 32×20×12×2) followed by `mebibytes` MiB of zeros
 * in further gzip members; `edit` may change header fields first (offsets of nifti2.h).
 */
export function gzippedNifti2Bomb(mebibytes: number, edit: (header: Buffer) => void = () => {}): Buffer {
  const plain = Buffer.from(gunzipSync(debianFile('nibabel', 'example_nifti2.nii.gz')));
  edit(plain);
  return gzippedWithZeros(plain, mebibytes);
}
