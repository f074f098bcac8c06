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
  const header = {
    format: ACQUISITION_FORMAT,
    geometry: data.geometry,
    matrix: { nx: data.nx, ny: data.ny },
    fieldOfView: {
      x: 1,
      y: 1,
      unit: 'FOV',
      note: 'the reconstructed field of view; k-space positions are in cycles per FOV (grid step 1)',
    },
    coils: data.coils,
    samples: {
      file: 'acquisition.nii',
      datatype: 'complex64',
      dims: niftiDims(data),
      axes: cartesian
        ? ['kx: column u, kx = u − ⌊nx/2⌋', 'ky: row v, ky = ⌊ny/2⌋ − v (v = 0 is the top row)', '1', 'coil']
        : ['sample within the readout', 'readout', '1', 'coil'],
      unacquired: cartesian ? 'zero (see the mask table)' : null,
      count: data.samples.length / 2 / data.coils,
    },
    scaling:
      'orthonormal centred DFT: coil image = fftshift(ifft2(ifftshift(K), norm="ortho")) with K[v, u] the ' +
      'NIfTI plane transposed (numpy), row 0 at the top; values in the reconstruction’s own units',
    noise: {
      prewhitened: data.noise.prewhitened,
      variancePerSample: data.noise.variance,
      covariance: 'variancePerSample · I (coils independent, after prewhitening)',
      seed: data.noise.seed,
    },
    zeroFilled: zeroFilledRule(outcome, data),
    sampling: sampledSummary(outcome.sampled),
    ordering: table.ordering,
    table: { columns: [...table.columns], unit: table.unit, rows },
  };
  return { header, samples: data.samples, layout: layoutBytes(data) };
}

/** How the response's zero-filled image is formed from these samples. */
function zeroFilledRule(outcome: ReconstructionOutcome, data: AcquiredData): string {
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
  return [data.nx, data.ny, 1, data.coils];
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
  const [nx, ny, , coils] = dims;
  const n = nx * ny;
  const mask = stored.layout;
  const grid = new Float32Array(2 * n * coils);
  let at = 0;
  for (let c = 0; c < coils; c++) {
    for (let i = 0; i < n; i++) {
      if (!mask[i]) continue;
      grid[2 * (c * n + i)] = stored.samples[at++];
      grid[2 * (c * n + i) + 1] = stored.samples[at++];
    }
  }
  return niftiComplex64(dims, grid, 'kspace-planner acquisition: k-space grid, coil last');
}

/** acquisition.json: the stored header with the result id. */
export function acquisitionJson(id: string, stored: StoredAcquisition): Record<string, unknown> {
  return { resultId: id, ...stored.header };
}
