import type { ReconInput } from '../recon/index.ts';
import type { VolumeAcquisitionMode } from '../volume/volume-schema.ts';

/**
 * The data a reconstruction method was given, kept with the result so a user's own pipeline can
 * reconstruct exactly what the planner simulated (GET /v1/results/{id}/acquisition.nii|.json,
 * docs/design.md §4.11). Compact: Cartesian data keep only the acquired grid points (the mask says
 * where), so a result at R = 4 stores a quarter of the grid.
 */
export interface AcquiredData {
  geometry: 'cartesian' | 'non-cartesian';
  nx: number;
  ny: number;
  coils: number;
  /**
   * complex64 samples, interleaved re/im, coil-major. Cartesian: the acquired grid points of each
   * coil in row-major order (row 0 = the top row, ky = ⌊ny/2⌋ − row); non-Cartesian: the
   * trajectory's points in readout order.
   */
  samples: Float32Array;
  /** Cartesian: ny·nx, 1 = acquired (after partial Fourier). */
  mask?: Uint8Array;
  /** Non-Cartesian: the readouts (their points are the mask's sample table, in the same order). */
  trajectory?: { readouts: number; samplesPerReadout: number };
  /**
   * Volumes (docs/design.md §2.5), one coil: 3D keeps the nx kx values of every acquired (ky, kz)
   * line, the mask being the ny × nz ky–kz plane; multi-slice the acquired ky–kx points of every
   * z-slice, the mask (ny × nx) shared by the slices. Samples z outer, then row-major.
   */
  volume?: { nz: number; acquisition: VolumeAcquisitionMode };
  /** The noise the data carry, as the method saw it (after prewhitening). */
  noise: AcquiredNoise;
}

export interface AcquiredNoise {
  /** Whether the coil data were multiplied by L⁻¹ (Ψ = L·Lᴴ) before the method saw them. */
  prewhitened: boolean;
  /**
   * E|n|² per complex sample in every coil, coils independent (covariance = variance · I), or null
   * when unknown (raw data without noise scans carry their own, unmeasured noise).
   */
  variance: number | null;
  /** The seed of the added noise (noiseSeedFor of the request's seed). */
  seed: number;
}

/** The acquired samples of `input` (the method's own input), compacted to float32. */
export function acquiredDataOf(input: ReconInput, noise: AcquiredNoise): AcquiredData {
  const { nx, ny } = input.kspace;
  if (input.trajectory) {
    const { trajectory, samples } = input.trajectory;
    return {
      geometry: 'non-cartesian',
      nx,
      ny,
      coils: samples.coils,
      samples: Float32Array.from(samples.data),
      trajectory: {
        readouts: trajectory.readouts,
        samplesPerReadout: trajectory.samplesPerReadout,
      },
      noise,
    };
  }
  const { mask } = input;
  const grid = input.coils ? input.coils.kspace : { coils: 1, data: input.kspace.data };
  const n = nx * ny;
  let acquired = 0;
  for (let i = 0; i < n; i++) if (mask[i]) acquired++;
  const samples = new Float32Array(2 * acquired * grid.coils);
  let at = 0;
  for (let c = 0; c < grid.coils; c++) {
    const base = 2 * c * n;
    for (let i = 0; i < n; i++) {
      if (!mask[i]) continue;
      samples[at++] = grid.data[base + 2 * i];
      samples[at++] = grid.data[base + 2 * i + 1];
    }
  }
  return { geometry: 'cartesian', nx, ny, coils: grid.coils, samples, mask: mask.slice(), noise };
}
