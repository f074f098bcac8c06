import { sampleTable } from '../../sampling/index.ts';
import { ACQUISITION_FORMAT } from '../io/acquisition-bundle-header.ts';
import { niftiComplex64 } from '../io/nifti-writer.ts';
import type { StoredAcquisition } from '../jobs/store.ts';
import type { AcquiredData } from '../pipeline/acquired-data.ts';
import type { ReconstructionOutcome } from '../pipeline/run-reconstruction.ts';
import { sampledSummary } from './sampled-summary.ts';

export { ACQUISITION_FORMAT };

/** The URLs of a reconstruction's acquisition bundle. */
export function acquisitionUrls(id: string): { nifti: string; json: string } {
  return { nifti: `/v1/results/${id}/acquisition.nii`, json: `/v1/results/${id}/acquisition.json` };
}

/**
 * What is stored with a reconstruction: the header of acquisition.json (everything but the
 * result id), the complex64 samples, and the layout bytes (the Cartesian mask).
 */
export function storedAcquisition(outcome: ReconstructionOutcome): StoredAcquisition | undefined {
  const data = outcome.acquisition;
  if (data === undefined) return undefined;
  const table = sampleTable(outcome.sampled);
  const rows: number[][] = [];
  for (let i = 0; i < table.values.length; i += 3) {
    rows.push([table.values[i], table.values[i + 1], table.values[i + 2]]);
  }
  const cartesian = data.geometry === 'cartesian';
  const volume = data.volume;
  const header = {
    format: ACQUISITION_FORMAT,
    geometry: data.geometry,
    matrix: volume ? { nx: data.nx, ny: data.ny, nz: volume.nz } : { nx: data.nx, ny: data.ny },
    ...(volume ? { volume: { acquisition: volume.acquisition } } : {}),
    fieldOfView: {
      x: 1,
      y: 1,
      ...(volume ? { z: 1 } : {}),
      unit: 'FOV',
      note: 'the reconstructed field of view; k-space positions are in cycles per FOV (grid step 1)',
    },
    coils: data.coils,
    samples: {
      file: 'acquisition.nii',
      datatype: 'complex64',
      dims: niftiDims(data),
      axes: cartesian
        ? [
            'kx: column u, kx = u − ⌊nx/2⌋',
            'ky: row v, ky = ⌊ny/2⌋ − v (v = 0 is the top row)',
            thirdAxis(data),
            'coil',
          ]
        : ['sample within the readout', 'readout', '1', 'coil'],
      unacquired: cartesian ? 'zero (see the mask table)' : null,
      count: data.samples.length / 2 / data.coils,
    },
    scaling: scalingRule(data),
    noise: {
      prewhitened: data.noise.prewhitened,
      variancePerSample: data.noise.variance,
      covariance: 'variancePerSample · I (coils independent, after prewhitening)',
      seed: data.noise.seed,
    },
    zeroFilled: zeroFilledRule(outcome, data),
    sampling: sampledSummary(outcome.sampled),
    ordering: table.ordering,
    // A 3D volume's mask is the ky–kz plane: its columns are kz (design §2.5).
    table: {
      columns:
        volume?.acquisition === '3d' ? table.columns.map((c) => (c === 'kx' ? 'kz' : c)) : [...table.columns],
      unit: table.unit,
      rows,
      ...(volume ? { appliesTo: volume.acquisition === '3d' ? 'every kx' : 'every z-slice' } : {}),
    },
  };
  return { header, samples: data.samples, layout: layoutBytes(data) };
}

/** The third NIfTI axis: 1 for 2D, kz for a 3D volume, the slice for multi-slice. */
function thirdAxis(data: AcquiredData): string {
  if (!data.volume) return '1';
  return data.volume.acquisition === '3d'
    ? 'kz: slice w, kz = w − ⌊nz/2⌋'
    : 'z: slice w of the volume (image space; each slice its own 2D k-space)';
}

function scalingRule(data: AcquiredData): string {
  const units = 'values in the reconstruction’s own units';
  if (data.volume?.acquisition === '3d') {
    return (
      'orthonormal centred 3D DFT: volume = fftshift(ifftn(ifftshift(K), norm="ortho")) with K[w, v, u] the ' +
      'NIfTI array transposed (numpy), row 0 at the top; the inverse along kx alone gives the hybrid-space ' +
      `x-planes (ky × kz) the method reconstructed; ${units}`
    );
  }
  const plane = data.volume
    ? 'slice image w = fftshift(ifft2(ifftshift(K_w)'
    : 'coil image = fftshift(ifft2(ifftshift(K)';
  return (
    `orthonormal centred DFT: ${plane}, norm="ortho")) with K[v, u] the NIfTI plane transposed (numpy), ` +
    `row 0 at the top; ${units}`
  );
}

/** How the response's zero-filled image is formed from these samples. */
function zeroFilledRule(outcome: ReconstructionOutcome, data: AcquiredData): string {
  if (data.volume) {
    const combined = data.coils > 1 ? ', root-sum-of-squares over the coils' : '';
    return `magnitude of the inverse DFT (3D: over kx, ky, kz; multi-slice: of every slice)${combined}: the zero-filled volume of images.nii`;
  }
  if (data.geometry === 'non-cartesian') {
    return 'gridding: adjoint NUFFT of the density-weighted samples (not reproducible from this bundle alone)';
  }
  if (outcome.coils) {
    return 'sensitivity-weighted combination with the simulated maps (maps not in this bundle)';
  }
  return 'root-sum-of-squares of the coil images (one coil: the magnitude of its image)';
}

function niftiDims(data: AcquiredData): [number, number, number, number] {
  if (data.trajectory) return [data.trajectory.samplesPerReadout, data.trajectory.readouts, 1, data.coils];
  return [data.nx, data.ny, data.volume?.nz ?? 1, data.coils];
}

/** Cartesian: the mask puts the samples back on the grid; non-Cartesian: the table has the points. */
function layoutBytes(data: AcquiredData): Uint8Array {
  return data.mask ?? new Uint8Array(0);
}

/**
 * acquisition.nii from the stored data: Cartesian samples go back onto the grid (zeros where not
 * acquired), voxel (u, v, 0, c) = column u, row v of coil c; non-Cartesian samples as they are.
 */
export function acquisitionNifti(stored: StoredAcquisition): Buffer {
  const dims = (stored.header.samples as { dims: [number, number, number, number] }).dims;
  if (stored.header.geometry !== 'cartesian') {
    return niftiComplex64(dims, stored.samples, 'kspace-planner acquisition: samples, coil last');
  }
  const [nx, ny, nz, coils] = dims;
  const n = nx * ny;
  const mask = stored.layout;
  const grid = new Float32Array(2 * n * nz * coils);
  const volume = stored.header.volume as { acquisition: string } | undefined;
  if (volume?.acquisition === '3d') {
    // The mask is the ky–kz plane (ny × nz), each acquired line holds its nx kx values; coil-major.
    let at = 0;
    for (let c = 0; c < coils; c++) {
      for (let z = 0; z < nz; z++) {
        for (let y = 0; y < ny; y++) {
          if (!mask[y * nz + z]) continue;
          grid.set(stored.samples.subarray(at, at + 2 * nx), 2 * ((c * nz + z) * ny + y) * nx);
          at += 2 * nx;
        }
      }
    }
    return niftiComplex64(dims, grid, 'kspace-planner acquisition: 3D k-space grid');
  }
  // 2D, and multi-slice volumes: the ny × nx mask on every coil (2D) or every slice (one coil).
  const planes = coils * nz;
  let at = 0;
  for (let p = 0; p < planes; p++) {
    for (let i = 0; i < n; i++) {
      if (!mask[i]) continue;
      grid[2 * (p * n + i)] = stored.samples[at++];
      grid[2 * (p * n + i) + 1] = stored.samples[at++];
    }
  }
  const what = volume ? 'multi-slice k-space grid, slice third' : 'k-space grid, coil last';
  return niftiComplex64(dims, grid, `kspace-planner acquisition: ${what}`);
}

/** acquisition.json: the stored header with the result id. */
export function acquisitionJson(id: string, stored: StoredAcquisition): Record<string, unknown> {
  return { resultId: id, ...stored.header };
}
