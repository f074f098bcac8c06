import { readFileSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { DecodeError, LimitError, ValidationError } from '../../src/core/errors.ts';
import { base64Length, decodeCoilPlanes } from '../../src/io/coil-planes.ts';
import { decodeNiftiCoilMaps } from '../../src/io/nifti-coil-maps.ts';
import { caughtValidationError } from '../core/caught-validation-error.ts';
import { float32Base64 } from './float32-base64.ts';

// NIfTI files and expected maps: tests/reference/generate_coil_map_niftis.py (Debian python3-nibabel
// wrote the files, numpy laid the expected maps out: row r = voxel j = ny − 1 − r, coil-major,
// interleaved re/im). Header byte offsets from nifti1.h (datatype 70, bitpix 72, vox_offset 108;
// docs/references.md §10.2); base64 per RFC 4648 §4 (docs/references.md §10.8).

const fixtureDir = new URL('../fixtures/coil-maps/', import.meta.url);
const fixture = (name: string) => readFileSync(new URL(name, fixtureDir));
const expected = JSON.parse(
  readFileSync(new URL('../reference/fixtures/coil-map-niftis.json', import.meta.url), 'utf8'),
) as { cases: Record<string, { nx: number; ny: number; coils: number; data: number[] }> };
const bounds = { maxSide: 1024, maxBytes: 64 * 1024 * 1024 };

async function caught(promise: Promise<unknown>): Promise<Error> {
  try {
    await promise;
  } catch (error) {
    return error as Error;
  }
  throw new Error('expected a refusal');
}

describe('NIfTI coil maps: coils along the last dimension (nibabel-written files)', () => {
  for (const name of ['complex64-4d.nii.gz', 'complex64-3d-nifti2.nii', 'float32-3d.nii'] as const) {
    it(`${name}: every value as nibabel wrote it, rows flipped, coil-major`, async () => {
      const want = expected.cases[name];
      const { maps, details } = await decodeNiftiCoilMaps(fixture(name), bounds);
      expect([maps.nx, maps.ny, maps.coils]).toEqual([want.nx, want.ny, want.coils]);
      expect(Array.from(maps.data)).toEqual(want.data);
      expect(details.datatype).toBe(name.startsWith('complex') ? 'complex64' : 'float32');
      expect(details.version).toBe(name.includes('nifti2') ? 2 : 1);
    });
  }

  it('header strings (descrip, intent_name) are not carried into the result', async () => {
    const decoded = await decodeNiftiCoilMaps(fixture('described.nii'), bounds);
    expect(Array.from(decoded.maps.data)).toEqual(expected.cases['described.nii'].data);
    expect(JSON.stringify(decoded.details)).not.toMatch(/Invented/);
    expect(fixture('described.nii').includes('Invented Person')).toBe(true); // the check can fail
  });

  it('two slices in a 4D file: 422 on file.dim[3]; 33 coils: limit on file.dim[3]; scaling: file.scl_slope', async () => {
    const slices = await caught(decodeNiftiCoilMaps(fixture('slices-4d.nii'), bounds));
    expect(slices).toBeInstanceOf(ValidationError);
    expect((slices as ValidationError).problems[0].field).toBe('file.dim[3]');
    const tooMany = await caught(decodeNiftiCoilMaps(fixture('coils-33.nii'), bounds));
    expect(tooMany).toBeInstanceOf(LimitError);
    expect((tooMany as LimitError).problems[0]).toMatchObject({
      field: 'file.dim[3]',
      allowed: '1 … 32 coils',
    });
    const scaled = await caught(decodeNiftiCoilMaps(fixture('scaled.nii'), bounds));
    expect((scaled as ValidationError).problems[0].field).toBe('file.scl_slope');
  });

  it('a NaN voxel is named by coil, row and column; a coil of zeros is refused', async () => {
    const bytes = Buffer.from(fixture('float32-3d.nii'));
    const voxOffset = bytes.readFloatLE(108);
    // Voxel (i = 2, j = 1, c = 3) of the 9×7×4 volume: image row 7 − 1 − 1 = 5, column 2.
    bytes.writeFloatLE(Number.NaN, voxOffset + 4 * (3 * 63 + 1 * 9 + 2));
    const nan = await caught(decodeNiftiCoilMaps(bytes, bounds));
    expect((nan as ValidationError).problems[0]).toMatchObject({
      field: 'file',
      message: 'coil 3, row 5, column 2 is NaN',
    });
    const zeros = Buffer.from(fixture('float32-3d.nii'));
    zeros.fill(0, voxOffset + 4 * 63, voxOffset + 4 * 126);
    const zero = await caught(decodeNiftiCoilMaps(zeros, bounds));
    expect((zero as ValidationError).problems[0].message).toBe('the map of coil 1 is zero everywhere');
  });

  it('int16 voxels are 415 on file.datatype; a truncated file is 415; the gzip bound is a limit on file', async () => {
    const int16 = Buffer.from(fixture('float32-3d.nii'));
    int16.writeInt16LE(4, 70);
    int16.writeInt16LE(16, 72);
    const datatype = await caught(decodeNiftiCoilMaps(int16, bounds));
    expect(datatype).toBeInstanceOf(DecodeError);
    expect((datatype as DecodeError).field).toBe('file.datatype');
    const full = fixture('float32-3d.nii');
    expect(await caught(decodeNiftiCoilMaps(full.subarray(0, full.length - 4), bounds))).toBeInstanceOf(
      DecodeError,
    );
    // The header declares 352 + 9·7·4·4 = 1360 bytes; a bound below that stops the inflation.
    const limited = await caught(decodeNiftiCoilMaps(gzipSync(full), { maxSide: 1024, maxBytes: 1000 }));
    expect(limited).toBeInstanceOf(LimitError);
    expect((limited as LimitError).problems[0].field).toBe('file');
  });
});

const planeOf = float32Base64;

describe('JSON coil planes: base64 little-endian float32, ny×nx row-major', () => {
  // 3 columns × 2 rows, two coils; values exact in float32 (small dyadic fractions and 2^-24·3).
  const re0 = [1, -0.5, 0.25, 3, 2 ** -24 * 3, -7];
  const im0 = [0, 0.125, -1, 2, 0, 5.5];
  const re1 = [0, 0, 0, 0, 0, 0];
  const im1 = [0, 0, 1e-3, 0, 0, 0];
  const body = {
    nx: 3,
    ny: 2,
    coils: [
      { re: planeOf(re0), im: planeOf(im0) },
      { re: planeOf(re1), im: planeOf(im1) },
    ],
  };

  it('values land at 2·(c·ny·nx + row·nx + column) and are the float32 numbers sent', () => {
    const maps = decodeCoilPlanes(body);
    expect([maps.coils, maps.nx, maps.ny]).toEqual([2, 3, 2]);
    for (let p = 0; p < 6; p++) {
      expect(maps.data[2 * p]).toBe(re0[p]);
      expect(maps.data[2 * p + 1]).toBe(im0[p]);
      expect(maps.data[2 * (6 + p)]).toBe(re1[p]);
      // 1e-3 is not a float32: it arrives rounded to the nearest one, as sent.
      expect(maps.data[2 * (6 + p) + 1]).toBe(Math.fround(im1[p]));
    }
  });

  it('the padded base64 length of a plane: 4·⌈bytes/3⌉ (RFC 4648 §4)', () => {
    expect(base64Length(24)).toBe(planeOf(re0).length);
    expect(base64Length(4 * 64 * 64)).toBe(21848);
  });

  it('bad text, a wrong length, a non-finite value and an all-zero coil name their field', () => {
    const withPlane = (c: number, part: 're' | 'im', text: string) => ({
      ...body,
      coils: body.coils.map((coil, i) => (i === c ? { ...coil, [part]: text } : coil)),
    });
    const fieldOf = (value: typeof body) => caughtValidationError(() => decodeCoilPlanes(value)).problems[0];
    expect(fieldOf(withPlane(1, 'im', `${planeOf(im1).slice(0, -4)}!!!!`)).field).toBe('coils[1].im');
    expect(fieldOf(withPlane(0, 're', 'AAAA=AAA')).field).toBe('coils[0].re');
    expect(fieldOf(withPlane(0, 're', planeOf([...re0, 1])))).toMatchObject({
      field: 'coils[0].re',
      message: 'decodes to 28 bytes',
    });
    expect(fieldOf({ ...body, nx: 2 })).toMatchObject({
      field: 'coils[0].re',
      message: 'decodes to 24 bytes',
    });
    expect(fieldOf(withPlane(0, 'im', planeOf([0, 0, 0, 0, Number.POSITIVE_INFINITY, 0])))).toMatchObject({
      field: 'coils[0].im',
      message: 'coil 0, row 1, column 1 is Infinity',
    });
    expect(fieldOf(withPlane(1, 'im', planeOf(re1)))).toMatchObject({
      field: 'coils[1]',
      message: 'the map of coil 1 is zero everywhere',
    });
  });
});
