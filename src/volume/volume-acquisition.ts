import type { SampledMask } from '../../sampling/index.ts';
import { addComplexNoise, checkedSnr, type NoiseSpec, OBJECT_THRESHOLD } from '../acquisition/noise.ts';
import { fft2c } from '../core/centered-fft.ts';
import { type ComplexImage, complexFromReal, createComplexImage } from '../core/complex-image.ts';
import type { RealImage } from '../core/real-image.ts';
import type { RealVolume } from '../core/real-volume.ts';
import type { ReconInput } from '../recon/index.ts';
import { phaseEncodeTransform, readoutTransform } from './readout-transform.ts';
import type { VolumeAcquisitionMode } from './volume-schema.ts';

/** The 2D problems a volume acquisition splits into, each with its noiseless reference plane. */
export interface PlaneStack {
  mode: VolumeAcquisitionMode;
  /** One per reconstructed plane: x-planes (ny × nz) in 3D, z-slices (ny × nx) in multi-slice. */
  inputs: ReconInput[];
  references: RealImage[];
  /** σ per real channel of the k-space noise (0 when noiseless). */
  sigma: number;
  /**
   * The acquired k-space samples, complex64 interleaved, for the acquisition export: 3D, the nx kx
   * values of every acquired (ky, kz) line, z outer then y (x fastest); multi-slice, the acquired
   * grid points of every z-slice in row-major order, slice after slice.
   */
  samples: Float32Array;
}

/**
 * σ = mean |volume| over the object / SNR, the object being the voxels above OBJECT_THRESHOLD of
 * the peak: the 2D rule (src/acquisition/noise.ts) applied to every voxel of the volume (in any order).
 */
export function volumeSigma(voxels: Float64Array, noise: NoiseSpec | undefined): number {
  const snr = checkedSnr(noise);
  if (snr === null) return 0;
  let peak = 0;
  for (const v of voxels) peak = Math.max(peak, Math.abs(v));
  let sum = 0;
  let count = 0;
  for (const v of voxels) {
    if (Math.abs(v) <= OBJECT_THRESHOLD * peak) continue;
    sum += Math.abs(v);
    count++;
  }
  return count > 0 ? sum / count / snr : 0;
}

/**
 * 3D Cartesian acquisition (docs/design.md §2.5): k = F_x F_yz(volume) on the full grid, noise added
 * to every sample, the ky–kz mask (ny rows × nz columns, the same for every kx) applied, then the
 * exact inverse readout transform gives hybrid space; x-plane i is the 2D k-space (ky, kz) of
 * the y–z image at x = i, and its reference is that image.
 */
function acquire3d(volume: RealVolume, sampled: SampledMask, sigma: number, noiseSeed: number): PlaneStack {
  const { nx, ny, nz } = volume;
  if (sampled.nx !== nz || sampled.ny !== ny) throw new RangeError('the ky–kz mask must be ny × nz');
  const kspace = new Float64Array(2 * nx * ny * nz);
  for (let i = 0; i < volume.data.length; i++) kspace[2 * i] = volume.data[i];
  phaseEncodeTransform(kspace, nx, ny, nz, -1);
  readoutTransform(kspace, nx, ny, nz, -1);
  if (sigma > 0) addComplexNoise(kspace, sigma, noiseSeed);
  let lines = 0;
  for (const m of sampled.mask) if (m) lines++;
  const samples = new Float32Array(2 * nx * lines);
  let at = 0;
  for (let z = 0; z < nz; z++) {
    for (let y = 0; y < ny; y++) {
      const line = 2 * (z * ny + y) * nx;
      if (sampled.mask[y * nz + z]) {
        samples.set(kspace.subarray(line, line + 2 * nx), at);
        at += 2 * nx;
      } else kspace.fill(0, line, line + 2 * nx);
    }
  }
  readoutTransform(kspace, nx, ny, nz, 1);
  const inputs: ReconInput[] = [];
  const references: RealImage[] = [];
  for (let x = 0; x < nx; x++) {
    const plane = createComplexImage(nz, ny);
    const reference = new Float64Array(ny * nz);
    for (let y = 0; y < ny; y++) {
      for (let z = 0; z < nz; z++) {
        const from = (z * ny + y) * nx + x;
        const to = y * nz + z;
        plane.data[2 * to] = kspace[2 * from];
        plane.data[2 * to + 1] = kspace[2 * from + 1];
        reference[to] = Math.abs(volume.data[from]);
      }
    }
    inputs.push(planeInput(plane, sampled));
    references.push({ nx: nz, ny, data: reference });
  }
  return { mode: '3d', inputs, references, sigma, samples };
}

/**
 * Multi-slice 2D acquisition: every z-slice its own 2D acquisition (ky rows × kx columns) with the
 * same mask; noise added to the stacked slice k-spaces with one seeded stream.
 */
function acquireSlices(
  volume: RealVolume,
  sampled: SampledMask,
  sigma: number,
  noiseSeed: number,
): PlaneStack {
  const { nx, ny, nz } = volume;
  if (sampled.nx !== nx || sampled.ny !== ny) throw new RangeError('the ky–kx mask must be ny × nx');
  const n = nx * ny;
  const stacked = new Float64Array(2 * n * nz);
  for (let z = 0; z < nz; z++) {
    const slice = complexFromReal(volume.data.subarray(z * n, (z + 1) * n), nx, ny);
    stacked.set(fft2c(slice).data, 2 * z * n);
  }
  if (sigma > 0) addComplexNoise(stacked, sigma, noiseSeed);
  let points = 0;
  for (const m of sampled.mask) if (m) points++;
  const samples = new Float32Array(2 * points * nz);
  let at = 0;
  const inputs: ReconInput[] = [];
  const references: RealImage[] = [];
  for (let z = 0; z < nz; z++) {
    const plane: ComplexImage = { nx, ny, data: stacked.slice(2 * z * n, 2 * (z + 1) * n) };
    for (let i = 0; i < n; i++) {
      if (sampled.mask[i]) {
        samples[at++] = plane.data[2 * i];
        samples[at++] = plane.data[2 * i + 1];
        continue;
      }
      plane.data[2 * i] = 0;
      plane.data[2 * i + 1] = 0;
    }
    const reference = new Float64Array(n);
    for (let i = 0; i < n; i++) reference[i] = Math.abs(volume.data[z * n + i]);
    inputs.push(planeInput(plane, sampled));
    references.push({ nx, ny, data: reference });
  }
  return { mode: 'multi-slice', inputs, references, sigma, samples };
}

/** The acquisition `mode` of a volume with the mask drawn for it (3D: ny × nz; multi-slice: ny × nx). */
export function acquireVolume(
  mode: VolumeAcquisitionMode,
  volume: RealVolume,
  sampled: SampledMask,
  noise: NoiseSpec | undefined,
  noiseSeed: number,
): PlaneStack {
  const sigma = volumeSigma(volume.data, noise);
  return mode === '3d'
    ? acquire3d(volume, sampled, sigma, noiseSeed)
    : acquireSlices(volume, sampled, sigma, noiseSeed);
}

function planeInput(kspace: ComplexImage, sampled: SampledMask): ReconInput {
  return { kspace, mask: sampled.mask, ...(sampled.density ? { density: sampled.density } : {}) };
}
