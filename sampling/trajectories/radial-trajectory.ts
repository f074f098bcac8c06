import { ValidationError } from '../../src/core/errors.ts';
import { type RadialOrdering, radialAngles } from './radial-angles.ts';
import { checkTrajectorySize, type Trajectory } from './trajectory.ts';

export interface RadialTrajectorySpec {
  /** Readout matrix N: samples per spoke before readout oversampling (usually max(nx, ny)). */
  side: number;
  /** Number of full spokes; default the Nyquist count ⌈π/2·N⌉. */
  spokes?: number;
  ordering?: RadialOrdering;
  /** N of the tiny golden angle ψ_N = 180°/(φ + N − 1); default 7 (Wundrak et al. 2016). */
  tinyGoldenIndex?: number;
  /** Integer readout oversampling: os·N samples per spoke, spacing 1/os cycles per FOV. */
  readoutOversampling?: number;
}

export interface RadialTrajectory extends Trajectory {
  readonly kind: 'radial';
  /** Spoke angles in [0, π), radians, counter-clockwise from +kx. */
  readonly angles: Float64Array;
  readonly ordering: RadialOrdering;
  /** Sample spacing along a spoke, cycles per FOV (1/os). */
  readonly readoutSpacing: number;
}

/**
 * Radial Nyquist spoke count for full spokes of N samples over 180°: the azimuthal gap at the
 * edge, π·(N/2)/spokes, must not exceed one cycle per FOV, so ⌈π/2·N⌉ (common practice; e.g.
 * Bernstein, King & Zhou 2004, from memory).
 */
export function nyquistSpokeCount(side: number): number {
  return Math.ceil((Math.PI / 2) * side);
}

function positiveInteger(value: number, field: string, max: number): void {
  if (!Number.isInteger(value) || value < 1 || value > max) {
    throw new ValidationError({
      field,
      message: `must be an integer from 1 to ${max}, got ${value}`,
      allowed: `integer, 1 ≤ ${field.split('.').pop()} ≤ ${max}`,
    });
  }
}

/**
 * Full spokes through the centre: spoke s at angle θ_s carries M = os·N samples at
 * t_j = (j − ⌊M/2⌋)/os cycles per FOV (j = 0 … M − 1), kx = t·cos θ, ky = t·sin θ; the centre is
 * sample ⌊M/2⌋ of every spoke.
 */
export function radialTrajectory(spec: RadialTrajectorySpec): RadialTrajectory {
  positiveInteger(spec.side, 'trajectory.side', 4096);
  const os = spec.readoutOversampling ?? 1;
  positiveInteger(os, 'trajectory.readoutOversampling', 8);
  const nyquist = nyquistSpokeCount(spec.side);
  const spokes = spec.spokes ?? nyquist;
  positiveInteger(spokes, 'trajectory.spokes', 16 * nyquist);
  const ordering = spec.ordering ?? 'uniform';
  const tinyGoldenIndex = spec.tinyGoldenIndex ?? 7;
  positiveInteger(tinyGoldenIndex, 'trajectory.tinyGoldenIndex', 100);
  const samples = os * spec.side;
  checkTrajectorySize(spokes, samples, 'trajectory.spokes');
  const angles = radialAngles(spokes, ordering, tinyGoldenIndex);
  const kx = new Float64Array(spokes * samples);
  const ky = new Float64Array(spokes * samples);
  const centre = Math.floor(samples / 2);
  for (let s = 0; s < spokes; s++) {
    const c = Math.cos(angles[s]);
    const sn = Math.sin(angles[s]);
    for (let j = 0; j < samples; j++) {
      const t = (j - centre) / os;
      kx[s * samples + j] = t * c;
      ky[s * samples + j] = t * sn;
    }
  }
  return {
    kind: 'radial',
    kx,
    ky,
    readouts: spokes,
    samplesPerReadout: samples,
    nyquistReadouts: nyquist,
    acceleration: nyquist / spokes,
    angles,
    ordering,
    readoutSpacing: 1 / os,
  };
}
