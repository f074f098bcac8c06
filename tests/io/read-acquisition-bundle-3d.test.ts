import { describe, expect, it } from 'vitest';
import { LimitError, ValidationError } from '../../src/core/errors.ts';
import { defaultLimits } from '../../src/core/limits.ts';
import { parseAcquisitionBundleHeader } from '../../src/io/acquisition-bundle-header.ts';
import { readRawKspace } from '../../src/io/ismrmrd/read-raw-kspace.ts';
import { niftiComplex64 } from '../../src/io/nifti-writer.ts';
import { readAcquisitionBundle } from '../../src/io/read-acquisition-bundle.ts';
import type { BundleJson } from '../api/acquisition-helpers.ts';
import {
  peakRelativeError,
  raw3dBytes,
  raw3dFileName,
  raw3dReference as reference,
  rssVolume,
} from './ismrmrd/raw-3d-fixture.ts';

/**
 * The bundle reader on a 3D bundle written from its documented layout (docs/design.md §4.11:
 * complex64 NIfTI-1, dim = [4, nx, ny, nz, coils], voxel (u, v, w, c) = kx column u, ky row v, kz
 * partition w of coil c; acquisition.json with `matrix.nz` and `volume.acquisition` "3d"), not by
 * the service's export. The samples: the 3D ISMRMRD file of
 * tests/reference/generate_ismrmrd_3d_fixture.py (h5py and numpy), checked against numpy's RSS volume.
 */
const { nx, ny, nz, coils } = reference;
const encoder = new TextEncoder();

/** acquisition.json of a 3D Cartesian acquisition of `lines` ky–kz lines (fields §4.11 names). */
function headerOf(change: (json: BundleJson) => void = () => {}, lines = ny * nz): Uint8Array {
  const json: BundleJson = {
    format: 'kspace-planner acquisition 1',
    geometry: 'cartesian',
    matrix: { nx, ny, nz },
    volume: { acquisition: '3d' },
    coils,
    samples: { datatype: 'complex64', dims: [nx, ny, nz, coils], count: lines * nx },
    noise: { prewhitened: false, variancePerSample: null },
    table: { rows: Array.from({ length: lines }, (_, i) => [i, i % ny, Math.floor(i / ny)]) },
  };
  change(json);
  return encoder.encode(JSON.stringify(json));
}

function refusal(read: () => unknown): { field: string; message: string } {
  try {
    read();
  } catch (error) {
    expect(error).toBeInstanceOf(ValidationError);
    return (error as ValidationError).problems[0];
  }
  throw new Error('not refused');
}

describe('readAcquisitionBundle on a 3D volume (docs/design.md §4.11 layout)', () => {
  it('reads the samples of the 3D file as 3D raw k-space: float32 of the file, numpy’s RSS volume', async () => {
    const raw = await readRawKspace(new Uint8Array(raw3dBytes(raw3dFileName)));
    // The raw store's order (coil-major, then partition, row, column) is the NIfTI's (u fastest).
    const samples = Float32Array.from(raw.kspace.data);
    const nifti = niftiComplex64([nx, ny, nz, coils], samples, 'documented layout');
    const imported = await readAcquisitionBundle(new Uint8Array(nifti), headerOf(), defaultLimits);
    expect(imported.nz).toBe(nz);
    expect(imported.facts).toMatchObject({ nx, ny, nz, coils, format: 'acquisition-bundle' });
    expect(imported.kspace).toMatchObject({ coils, nx, ny });
    expect(imported.kspace.data).toEqual(Float64Array.from(samples));
    expect(imported.noiseCovariance).toBeNull();
    // numpy (generate_ismrmrd_3d_fixture.py): RSS of the centred orthonormal inverse 3D DFT.
    expect(peakRelativeError(rssVolume(imported.kspace, nz), reference.rss)).toBeLessThan(1e-6);
  });

  it('refuses undersampled, multi-slice, inconsistent and oversized 3D headers naming the field', () => {
    const parse = (bytes: Uint8Array) => () =>
      parseAcquisitionBundleHeader(bytes, defaultLimits.maxMatrixSide);
    const under = refusal(parse(headerOf(undefined, 100)));
    expect(under.field).toBe('header.samples.count');
    expect(under.message).toContain(
      `not fully sampled: 100 of ${ny * nz} ky–kz points acquired (fraction 0.5208)`,
    );
    const slices = refusal(
      parse(
        headerOf((j) => {
          j.volume.acquisition = 'multi-slice';
        }),
      ),
    );
    expect(slices.field).toBe('header.volume.acquisition');
    const flat = refusal(
      parse(
        headerOf((j) => {
          j.samples.dims = [nx, ny, 1, coils];
        }),
      ),
    );
    expect(flat).toMatchObject({ field: 'header.samples.dims' });
    expect(flat.message).toContain(`matrix ${nx}×${ny}×${nz}`);
    // 2²³ voxels is the volume limit (src/core/matrix.ts), as for a 3D ISMRMRD file.
    const huge = () =>
      parseAcquisitionBundleHeader(
        headerOf((j) => {
          j.matrix = { nx: 512, ny: 512, nz: 64 };
        }),
        1024,
      );
    expect(huge).toThrow(LimitError);
    expect(refusal(huge).field).toBe('header.matrix.nz');
  });
});
