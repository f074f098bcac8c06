import { CoilNoise } from '../coils/index.ts';
import { SeededRandom } from '../core/random.ts';
import type { MultiCoilKspace } from '../encoding/index.ts';

/**
 * An imported raw acquisition (POST /v1/raw): fully sampled coil k-space and, when measured, Ψ.
 * A 3D acquisition (nz > 1) keeps nz partitions per coil in `kspace.data`, coil-major, then
 * partition, row, column (2·coils·nz·ny·nx numbers); the 2D pieces below refuse it (rawAcquisition).
 */
export interface RawKspace {
  kspace: MultiCoilKspace;
  /** Partitions (kz) of a 3D acquisition; absent or 1: one 2D slice. */
  nz?: number;
  /** Noise covariance across coils from the file's noise scans (interleaved complex C×C), or null. */
  noiseCovariance: Float64Array | null;
}

/**
 * The raw k-space prewhitened with its measured noise covariance (Ψ = L·Lᴴ, data multiplied by
 * L⁻¹: Pruessmann et al. 1999, Roemer et al. 1990), so every coil's noise is white with unit
 * variance per complex sample and independent of the others; a copy as it is when Ψ is unknown.
 */
export function whitenedRawKspace(raw: RawKspace): MultiCoilKspace {
  const { kspace, noiseCovariance } = raw;
  const out = { ...kspace, data: kspace.data.slice() };
  // Prewhitening mixes coils sample by sample: a volume's partitions are rows of a taller plane.
  const planes = { ...out, ny: out.ny * (raw.nz ?? 1) };
  if (noiseCovariance) new CoilNoise(noiseCovariance, kspace.coils, 'source.rawId').prewhiten(planes);
  return out;
}

/**
 * y_c = M ⊙ (y_full,c + n_c): the acquired lines of the (prewhitened) raw coil k-space, with white
 * complex Gaussian noise σ per real channel added to every coil when σ > 0 (the data's own noise
 * stays in either case). Noise is drawn from SeededRandom(seed) coil by coil over the whole grid, so a
 * seed gives the same noise at a point whatever the mask.
 */
export function acquireRawLines(
  full: MultiCoilKspace,
  mask: Uint8Array,
  sigma: number,
  seed: number,
): MultiCoilKspace {
  const { coils, nx, ny } = full;
  const n = nx * ny;
  if (mask.length !== n) throw new RangeError(`mask has ${mask.length} entries for a ${ny}×${nx} matrix`);
  const random = sigma > 0 ? new SeededRandom(seed) : undefined;
  const data = new Float64Array(full.data.length);
  for (let c = 0; c < coils; c++) {
    for (let i = 0; i < n; i++) {
      const at = 2 * (c * n + i);
      const re = random ? sigma * random.normal() : 0;
      const im = random ? sigma * random.normal() : 0;
      if (!mask[i]) continue;
      data[at] = full.data[at] + re;
      data[at + 1] = full.data[at + 1] + im;
    }
  }
  return { coils, nx, ny, data };
}
