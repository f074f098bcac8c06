import type { AcquiredUnit } from './acquired-unit.ts';
import type { PartialFourierBand } from './partial-fourier.ts';
import type { Trajectory } from './trajectories/trajectory.ts';

/**
 * A generated k-space sampling mask and its bookkeeping. The mask is ny×nx row-major (rows = phase
 * encode ky, columns = readout kx), 1 = acquired, with the k-space centre at (⌊ny/2⌋, ⌊nx/2⌋).
 */
export interface SampledMask {
  nx: number;
  ny: number;
  /** ny·nx, 1 = acquired (radial: the grid points nearest the spokes' samples). */
  mask: Uint8Array;
  pattern: string;
  /** R = total / acquired.count; requested is null for custom masks. */
  acceleration: { requested: number | null; actual: number };
  acquired: { count: number; unit: AcquiredUnit };
  /** Nyquist count in the same unit: ny lines, ny·nx points, or ⌈π/2·max(nx, ny)⌉ spokes. */
  total: number;
  /** Acquired grid points / (nx·ny). */
  fraction: number;
  acs: { lines?: number; size?: [number, number] } | null;
  /**
   * 'cartesian': the mask is the acquisition; '*-rasterised': trajectory samples moved to their
   * nearest grid points; 'non-cartesian': the samples are `trajectory`, the mask only its picture.
   */
  representation: 'cartesian' | 'radial-rasterised' | 'spiral-rasterised' | 'non-cartesian';
  /** The exact k-space points of a non-Cartesian acquisition. */
  trajectory?: Trajectory;
  /** Spoke angles in radians, measured from +kx towards +ky (radial only). */
  spokeAngles?: Float64Array;
  /** Per grid point sampling probability of the variable-density patterns (ny·nx), for density compensation. */
  density?: Float64Array;
  seed: number | null;
  /** Present when partial Fourier removed the rows before `firstRow` (sampling.partialFourier < 1). */
  partialFourier?: PartialFourierBand;
  /** Pattern-specific facts worth reporting (radius law and scale, acceleration basis, …). */
  details?: Record<string, number | string>;
}

/** What a Cartesian mask's bookkeeping is built from; R, the fraction and the representation follow. */
export interface CartesianMaskFacts {
  nx: number;
  ny: number;
  mask: Uint8Array;
  pattern: string;
  requested: number | null;
  acquired: { count: number; unit: AcquiredUnit };
  total: number;
  acs: SampledMask['acs'];
  seed: number | null;
  density?: Float64Array;
  details?: Record<string, number | string>;
}

/**
 * A Cartesian mask with its bookkeeping: R = total / acquired count and fraction = acquired count /
 * total, which is the share of grid points in either unit (a line counts nx points, total ny lines).
 */
export function cartesianSampledMask(facts: CartesianMaskFacts): SampledMask {
  const { nx, ny, mask, pattern, requested, acquired, total, acs, seed, density, details } = facts;
  return {
    nx,
    ny,
    mask,
    pattern,
    acceleration: { requested, actual: total / acquired.count },
    acquired,
    total,
    fraction: acquired.count / total,
    acs,
    representation: 'cartesian',
    ...(density ? { density } : {}),
    seed,
    ...(details ? { details } : {}),
  };
}

/** Number of acquired grid points. */
export function countSampled(mask: Uint8Array): number {
  let n = 0;
  for (let i = 0; i < mask.length; i++) if (mask[i] !== 0) n++;
  return n;
}

/**
 * First index of a centred block of `size` positions in a line of `n`, so that the centre
 * ⌊n/2⌋ lies inside it (positions ⌊n/2⌋ − ⌊size/2⌋ … ⌊n/2⌋ + ⌈size/2⌉ − 1). Requires size ≤ n.
 */
export function centredBlockStart(n: number, size: number): number {
  return Math.floor(n / 2) - Math.floor(size / 2);
}
