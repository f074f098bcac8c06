import type { SampledMask } from '../../sampling/index.ts';
import {
  acquireRawLines,
  addComplexNoise,
  type NoiseSpec,
  type RawKspace,
  whitenedRawKspace,
} from '../acquisition/index.ts';
import { magnitude } from '../core/complex-image.ts';
import type { RealImage } from '../core/real-image.ts';
import type { MultiCoilKspace } from '../encoding/index.ts';
import type { ReconInput } from '../recon/index.ts';
import { readoutTransform } from '../volume/readout-transform.ts';
import { type PlaneStack, volumeSigma } from '../volume/volume-acquisition.ts';
import { rawCoilInput, rawReference } from './raw-acquisition.ts';

/**
 * The x-planes of a 3D raw acquisition (docs/design.md §2.5, §4.8): the prewhitened coil k-space
 * (coils × nz × ny × nx) goes to hybrid space by the exact inverse readout transform of every
 * coil, and x-plane i of every coil is a multi-coil 2D k-space (ky rows × kz columns). Each plane
 * is then treated exactly as a 2D raw request treats its slice (src/pipeline/raw-acquisition.ts):
 * reference = root-sum-of-squares of its fully sampled coil images, the ky–kz mask (the same for
 * every x) selects the acquired points, and rawCoilInput makes the method's input. With `noise`,
 * σ = mean |reference| over the volume's object / SNR per real channel is added to every coil
 * sample in hybrid space (the readout transform is orthonormal, so this is white k-space noise of
 * the same σ). `samples`: every coil's acquired (ky, kz) lines, their nx kx values, z outer then y.
 */
export function acquireRawVolume(
  raw: RawKspace,
  sampled: SampledMask,
  noise: NoiseSpec | undefined,
  noiseSeed: number,
): PlaneStack {
  const full = whitenedRawKspace(raw);
  const { coils, nx, ny } = full;
  const nz = raw.nz ?? 1;
  if (sampled.nx !== nz || sampled.ny !== ny) throw new RangeError('the ky–kz mask must be ny × nz');
  const perCoil = 2 * nx * ny * nz;
  const hybrid = full.data;
  for (let c = 0; c < coils; c++) {
    readoutTransform(hybrid.subarray(c * perCoil, (c + 1) * perCoil), nx, ny, nz, 1);
  }
  const planeOf = (x: number): MultiCoilKspace => {
    const data = new Float64Array(2 * coils * ny * nz);
    for (let c = 0; c < coils; c++) {
      for (let y = 0; y < ny; y++) {
        for (let z = 0; z < nz; z++) {
          const from = c * perCoil + 2 * ((z * ny + y) * nx + x);
          const to = 2 * (c * ny * nz + y * nz + z);
          data[to] = hybrid[from];
          data[to + 1] = hybrid[from + 1];
        }
      }
    }
    return { coils, nx: nz, ny, data };
  };
  const references: RealImage[] = [];
  const voxels = new Float64Array(nx * ny * nz);
  for (let x = 0; x < nx; x++) {
    const reference = magnitude(rawReference(planeOf(x)));
    references.push({ nx: nz, ny, data: reference });
    voxels.set(reference, x * ny * nz);
  }
  const sigma = volumeSigma(voxels, noise);
  if (sigma > 0) addComplexNoise(hybrid, sigma, noiseSeed);
  const inputs: ReconInput[] = [];
  for (let x = 0; x < nx; x++) {
    inputs.push(rawCoilInput(acquireRawLines(planeOf(x), sampled.mask, 0, 0), sampled).input);
  }
  return {
    mode: '3d',
    inputs,
    references,
    sigma,
    samples: acquiredLines(hybrid, sampled.mask, coils, nx, ny, nz),
  };
}

/**
 * The acquired k-space lines the planes were cut from, for the acquisition export: the forward
 * readout transform back to kx (line by line, so unacquired lines do not matter), then every
 * coil's acquired lines (nx values each), z outer then y. `hybrid` is overwritten.
 */
function acquiredLines(
  hybrid: Float64Array,
  mask: Uint8Array,
  coils: number,
  nx: number,
  ny: number,
  nz: number,
): Float32Array {
  const perCoil = 2 * nx * ny * nz;
  let lines = 0;
  for (const m of mask) if (m) lines++;
  const samples = new Float32Array(2 * nx * lines * coils);
  let at = 0;
  for (let c = 0; c < coils; c++) {
    const coil = hybrid.subarray(c * perCoil, (c + 1) * perCoil);
    readoutTransform(coil, nx, ny, nz, -1);
    for (let z = 0; z < nz; z++) {
      for (let y = 0; y < ny; y++) {
        if (!mask[y * nz + z]) continue;
        const line = 2 * (z * ny + y) * nx;
        samples.set(coil.subarray(line, line + 2 * nx), at);
        at += 2 * nx;
      }
    }
  }
  return samples;
}
