import { gunzipSync, gzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { DecodeError, LimitError, ValidationError } from '../../src/core/errors.ts';
import { decodeImage } from '../../src/io/decode-image.ts';
import { decodeNifti } from '../../src/io/nifti.ts';
import { debianFile } from './debian-files.ts';

/**
 * Header fields edited byte by byte in the nibabel test files, at the offsets of nifti1.h
 * (struct nifti_1_header: dim int16[8] at 40, datatype int16 at 70, bitpix int16 at 72, vox_offset
 * float32 at 108) and nifti2.h (struct nifti_2_header: datatype int16 at 12, bitpix int16 at 14,
 * dim int64[8] at 16, vox_offset int64 at 168), NIfTI Data Format Working Group. Both headers hold
 * dim[0] in 1..7, sizes dim[1..dim[0]] ≥ 1, bitpix matching datatype, and data from vox_offset on,
 * never inside the header (352 bytes with the extension flag for NIfTI-1, 544 for NIfTI-2).
 */
interface Variant {
  name: string;
  bytes: () => Buffer;
  littleEndian: boolean;
  headerEnd: number;
  setDim: (view: DataView, d: number, value: number | bigint) => void;
  setVoxOffset: (view: DataView, value: number | bigint) => void;
  datatypeAt: number;
  bitpixAt: number;
}

const variants: Variant[] = [
  {
    // anatomical.nii: NIfTI-1, big-endian int16 33×41×25, vox_offset 352 (tests/io/nifti.test.ts).
    name: 'NIfTI-1 anatomical.nii',
    bytes: () => Buffer.from(debianFile('nibabel', 'anatomical.nii')),
    littleEndian: false,
    headerEnd: 352,
    setDim: (v, d, value) => v.setInt16(40 + 2 * d, Number(value), false),
    setVoxOffset: (v, value) => v.setFloat32(108, Number(value), false),
    datatypeAt: 70,
    bitpixAt: 72,
  },
  {
    // example_nifti2.nii.gz: NIfTI-2, little-endian int16 32×20×12×2, vox_offset 608.
    name: 'NIfTI-2 example_nifti2.nii.gz',
    bytes: () => Buffer.from(gunzipSync(debianFile('nibabel', 'example_nifti2.nii.gz'))),
    littleEndian: true,
    headerEnd: 544,
    setDim: (v, d, value) => v.setBigInt64(16 + 8 * d, BigInt(value), true),
    setVoxOffset: (v, value) => v.setBigInt64(168, BigInt(value), true),
    datatypeAt: 12,
    bitpixAt: 14,
  },
];

function edited(variant: Variant, edit: (view: DataView) => void): Buffer {
  const bytes = variant.bytes();
  edit(new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength));
  return bytes;
}

/** The error decodeNifti throws, and the same through decodeImage after gzip (the streaming path). */
async function failures(bytes: Buffer, options: { maxSide?: number } = {}): Promise<unknown[]> {
  const caught: unknown[] = [];
  try {
    decodeNifti(bytes, options);
  } catch (error) {
    caught.push(error);
  }
  try {
    await decodeImage(gzipSync(bytes), options);
  } catch (error) {
    caught.push(error);
  }
  return caught;
}

async function expectFieldProblem(bytes: Buffer, field: string, options: { maxSide?: number } = {}) {
  const caught = await failures(bytes, options);
  expect(caught).toHaveLength(2);
  for (const error of caught) {
    expect(error).toBeInstanceOf(ValidationError);
    expect((error as ValidationError).problems[0].field).toBe(field);
    expect(typeof (error as ValidationError).problems[0].allowed).toBe('string');
  }
}

for (const variant of variants) {
  describe(`${variant.name}: header fields checked before any voxel is read`, () => {
    it('the unedited file decodes (the edits below are what breaks it)', async () => {
      const { image } = decodeNifti(variant.bytes(), { slice: 0 });
      expect(image.nx * image.ny).toBeGreaterThan(0);
    });

    const offsets: Array<number | bigint> = [-4, 0, variant.headerEnd - 1, -(2n ** 62n)];
    if (variant.headerEnd === 352) offsets.push(352.5, Number.NaN, Number.POSITIVE_INFINITY);
    else offsets.push(2n ** 62n); // beyond 2^53: not an exact byte position
    for (const offset of offsets) {
      it(`vox_offset ${offset} → 422 naming file.vox_offset`, async () => {
        await expectFieldProblem(
          edited(variant, (v) => variant.setVoxOffset(v, offset)),
          'file.vox_offset',
        );
      });
    }

    for (const rank of [0, 8, -1]) {
      it(`dim[0] = ${rank} → 422 naming file.dim[0]`, async () => {
        await expectFieldProblem(
          edited(variant, (v) => variant.setDim(v, 0, rank)),
          'file.dim[0]',
        );
      });
    }

    for (const size of [0, -1]) {
      it(`dim[2] = ${size} → 422 naming file.dim[2]`, async () => {
        await expectFieldProblem(
          edited(variant, (v) => variant.setDim(v, 2, size)),
          'file.dim[2]',
        );
      });
    }

    it('datatype 3 (no such code in nifti1.h) → 422 file.datatype; bitpix 8 for int16 → 422 file.bitpix', async () => {
      await expectFieldProblem(
        edited(variant, (v) => v.setInt16(variant.datatypeAt, 3, variant.littleEndian)),
        'file.datatype',
      );
      await expectFieldProblem(
        edited(variant, (v) => v.setInt16(variant.bitpixAt, 8, variant.littleEndian)),
        'file.bitpix',
      );
    });

    it('complex64 (datatype 32, bitpix 64), a real NIfTI type we do not read → 415 naming file.datatype', async () => {
      const bytes = edited(variant, (v) => {
        v.setInt16(variant.datatypeAt, 32, variant.littleEndian);
        v.setInt16(variant.bitpixAt, 64, variant.littleEndian);
      });
      for (const error of await failures(bytes)) {
        expect(error).toBeInstanceOf(DecodeError);
        expect((error as DecodeError).field).toBe('file.datatype');
      }
    });

    it('dim[3] = 3000: data beyond the end of the file → 415 truncated (never a read past the end)', async () => {
      const caught = await failures(edited(variant, (v) => variant.setDim(v, 3, 3000)));
      expect(caught).toHaveLength(2);
      for (const error of caught) {
        expect(error).toBeInstanceOf(DecodeError);
        expect((error as DecodeError).message).toMatch(/truncated/);
      }
    });

    it('dim[1] = 2000 beyond maxMatrixSide 1024 → LimitError on "file"', async () => {
      const caught = await failures(
        edited(variant, (v) => variant.setDim(v, 1, 2000)),
        { maxSide: 1024 },
      );
      expect(caught).toHaveLength(2);
      for (const error of caught) {
        expect(error).toBeInstanceOf(LimitError);
        expect((error as LimitError).problems[0].field).toBe('file');
      }
    });
  });
}

describe('NIfTI extensions are never parsed', () => {
  it('example4d.nii.gz with its extension chain pointing backwards (esize −16) decodes, no endless loop', async () => {
    // nifti1.h: extensions follow the 4-byte flag at 348, each with esize (int32, a multiple of 16)
    // then ecode; a reader that follows esize = −16 from byte 352 back to 336 and reads 16 there
    // comes back to 352 for ever. The voxel data (vox_offset 416) is left as it was.
    const plain = Buffer.from(gunzipSync(debianFile('nibabel', 'example4d.nii.gz')));
    const littleEndian = plain.readInt32LE(0) === 348;
    const write = (value: number, at: number) =>
      littleEndian ? plain.writeInt32LE(value, at) : plain.writeInt32BE(value, at);
    expect(plain[348]).toBe(1); // the extension flag is set in the original
    write(-16, 352);
    write(16, 336);
    const edited = decodeNifti(plain, { slice: 0 });
    const original = await decodeImage(debianFile('nibabel', 'example4d.nii.gz'), { slice: 0 });
    expect(edited.image.data).toEqual(original.image.data);
  });
});
