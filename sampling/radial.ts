import { ValidationError } from '../src/core/errors.ts';
import type { Matrix } from '../src/core/matrix.ts';
import { DEFAULT_RADIAL_OVERSAMPLING, trajectoryOf } from './non-cartesian.ts';
import { rasteriseTrajectory } from './rasterise-trajectory.ts';
import { countSampled, type SampledMask } from './sampled-mask.ts';
import type { RadialSpec } from './schema.ts';
import type { RadialTrajectory } from './trajectories/radial-trajectory.ts';

/** Golden ratio φ = (1 + √5)/2. */
export const GOLDEN_RATIO = (1 + Math.sqrt(5)) / 2;
/** Golden-angle increment for full spokes, ψ = 180°/φ ≈ 111.246° (Winkelmann et al. 2007), in radians. */
export const GOLDEN_ANGLE = Math.PI / GOLDEN_RATIO;

/**
 * Radial Nyquist spoke count for full spokes of N readout samples over 180°: the azimuthal gap at
 * the edge of k-space must not exceed Δk, so N_spokes = ⌈π/2 · N⌉ (docs/references.md §3.5; docs/design.md §3.4).
 * N is the larger matrix side, N = max(nx, ny), so the spokes cover the whole grid.
 */
export function nyquistSpokes(matrix: Matrix): number {
  return Math.ceil((Math.PI / 2) * Math.max(matrix.nx, matrix.ny));
}

/**
 * Spoke angles in radians in [0, π): uniform j·π/n, or golden j·ψ mod π, computed as π·frac(j/φ)
 * so that the rounding error stays at one ulp of π for any j.
 */
export function spokeAngles(count: number, angles: 'uniform' | 'golden'): Float64Array {
  const theta = new Float64Array(count);
  const inverseGolden = GOLDEN_RATIO - 1; // 1/φ = φ − 1
  for (let j = 0; j < count; j++) {
    if (angles === 'uniform') theta[j] = (j * Math.PI) / count;
    else {
      const turns = j * inverseGolden;
      theta[j] = Math.PI * (turns - Math.floor(turns));
    }
  }
  return theta;
}

/**
 * Marks on the ny×nx grid the point nearest each readout sample of each spoke. A spoke at angle θ
 * through the k-space centre (⌊ny/2⌋, ⌊nx/2⌋) carries N = max(nx, ny) samples at t = j − ⌊N/2⌋
 * (j = 0 … N − 1) grid steps: column ⌊nx/2⌋ + round(t·cos θ), row ⌊ny/2⌋ − round(t·sin θ)
 * (rows run against ky, DEVELOPERS.md). Samples off the grid (non-square matrices) are dropped.
 */
export function rasteriseSpokes(matrix: Matrix, theta: Float64Array): Uint8Array {
  const { nx, ny } = matrix;
  const n = Math.max(nx, ny);
  const cx = Math.floor(nx / 2);
  const cy = Math.floor(ny / 2);
  const half = Math.floor(n / 2);
  const mask = new Uint8Array(nx * ny);
  for (let s = 0; s < theta.length; s++) {
    const c = Math.cos(theta[s]);
    const sn = Math.sin(theta[s]);
    for (let j = 0; j < n; j++) {
      const t = j - half;
      const u = cx + Math.round(t * c);
      const v = cy - Math.round(t * sn);
      if (u >= 0 && u < nx && v >= 0 && v < ny) mask[v * nx + u] = 1;
    }
  }
  return mask;
}

/**
 * Radial sampling: ⌈N_Nyquist / R⌉ full spokes through the centre, at uniform angles or golden-angle
 * increments. The acceleration is counted in spokes (docs/design.md §3.4); the mask is the rasterised
 * representation, and the exact angles are kept for a non-Cartesian path.
 */
export function radialMask(matrix: Matrix, spec: RadialSpec): SampledMask {
  const total = nyquistSpokes(matrix);
  const R = spec.acceleration;
  if (R > total) {
    throw new ValidationError({
      field: 'sampling.acceleration',
      message: `${R} leaves less than one of the ${total} Nyquist spokes`,
      allowed: `1 ≤ acceleration ≤ ${total} (⌈π/2 · max(nx, ny)⌉ spokes)`,
    });
  }
  const count = Math.ceil(total / R);
  const angles = spec.angles ?? 'uniform';
  const nonCartesian = (spec.trajectory ?? 'non-cartesian') === 'non-cartesian';
  if (nonCartesian || angles === 'tiny-golden') {
    const trajectory = trajectoryOf(matrix, spec, count);
    const mask = nonCartesian
      ? rasteriseTrajectory(matrix, trajectory)
      : rasteriseSpokes(matrix, (trajectory as RadialTrajectory).angles);
    return {
      ...radialFacts(matrix, spec, total, count, mask),
      representation: nonCartesian ? 'non-cartesian' : 'radial-rasterised',
      spokeAngles: (trajectory as RadialTrajectory).angles,
      ...(nonCartesian ? { trajectory } : {}),
      details: {
        angles,
        samplesPerSpoke: trajectory.samplesPerReadout,
        readoutOversampling: spec.readoutOversampling ?? DEFAULT_RADIAL_OVERSAMPLING,
        ...(angles === 'tiny-golden' ? { tinyN: spec.tinyN ?? 7 } : {}),
      },
    };
  }
  const theta = spokeAngles(count, angles as 'uniform' | 'golden');
  const mask = rasteriseSpokes(matrix, theta);
  return {
    ...radialFacts(matrix, spec, total, count, mask),
    representation: 'radial-rasterised',
    spokeAngles: theta,
    details: { angles, samplesPerSpoke: Math.max(matrix.nx, matrix.ny) },
  };
}

function radialFacts(matrix: Matrix, spec: RadialSpec, total: number, count: number, mask: Uint8Array) {
  return {
    nx: matrix.nx,
    ny: matrix.ny,
    mask,
    pattern: 'radial',
    acceleration: { requested: spec.acceleration, actual: total / count },
    acquired: { count, unit: 'spokes' },
    total,
    fraction: countSampled(mask) / (matrix.nx * matrix.ny),
    acs: null,
    seed: null,
  } satisfies Partial<SampledMask>;
}
