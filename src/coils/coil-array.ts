import { ValidationError } from '../core/errors.ts';
import { type CoilMaps, createMultiCoilArray } from '../encoding/index.ts';
import { gaussianArrayMaps } from './gaussian-array.ts';
import { loopArrayMaps } from './loop-array.ts';
import { CoilNoise } from './noise-covariance.ts';
import { normaliseSumOfSquares } from './normalise.ts';

/** One coil with S = 1 everywhere: today's single-coil acquisition. */
export interface UniformArraySpec {
  array: 'uniform';
}

/** Circular surface loops on a ring around the object (phantom-frame units). */
export interface LoopArraySpec {
  array: 'loops';
  count: number;
  loopRadius: number;
  /** Distance of the loop centres from the FOV centre, or the ring's semi-axes [x, y]. */
  ringRadius: number | readonly [number, number];
  /** Out-of-plane tilt of every loop axis, degrees (default 0: axes point at the FOV centre). */
  tiltDeg?: number;
  /** Angle of coil 0 on the ring, counter-clockwise from +x, degrees (default 90: the top). */
  startAngleDeg?: number;
  /** Biot–Savart integration steps per loop (default 128, even). */
  segments?: number;
  /** Noise correlation ρ between ring neighbours (default 0: independent coils). */
  correlation?: number;
}

/** Gaussian sensitivity profiles centred on a ring. */
export interface GaussianArraySpec {
  array: 'gaussian';
  count: number;
  width: number;
  ringRadius: number | readonly [number, number];
  startAngleDeg?: number;
  /** Noise correlation ρ between ring neighbours (default 0: independent coils). */
  correlation?: number;
}

export type CoilArraySpec = UniformArraySpec | LoopArraySpec | GaussianArraySpec;

export const COIL_LIMITS = {
  maxCoils: 32,
  loopRadius: [0.05, 2],
  loopRing: [1, 4],
  gaussianRing: [0, 4],
  width: [0.1, 4],
  tiltDeg: [-80, 80],
  segments: [16, 4096],
} as const;

/**
 * Sensitivity maps of an array on the ny×nx grid, normalised so that Σ_c |S_c|² = 1 at every pixel
 * (see normalise.ts); `uniform` gives one coil with S = 1. `field` prefixes the field names in errors.
 */
export function coilArrayMaps(spec: CoilArraySpec, nx: number, ny: number, field = 'coils'): CoilMaps {
  switch (spec.array) {
    case 'uniform': {
      const maps = createMultiCoilArray(1, nx, ny);
      for (let i = 0; i < nx * ny; i++) maps.data[2 * i] = 1;
      return maps;
    }
    case 'loops': {
      checkCount(spec.count, field);
      checkRange(spec.loopRadius, COIL_LIMITS.loopRadius, `${field}.loopRadius`);
      const ringRadius = checkRing(spec.ringRadius, COIL_LIMITS.loopRing, `${field}.ringRadius`);
      const tiltDeg = spec.tiltDeg ?? 0;
      checkRange(tiltDeg, COIL_LIMITS.tiltDeg, `${field}.tiltDeg`);
      const startAngleDeg = checkAngle(spec.startAngleDeg, `${field}.startAngleDeg`);
      const segments = spec.segments ?? 128;
      const [minSegments, maxSegments] = COIL_LIMITS.segments;
      if (
        !Number.isInteger(segments) ||
        segments % 2 !== 0 ||
        segments < minSegments ||
        segments > maxSegments
      ) {
        throw new ValidationError({
          field: `${field}.segments`,
          message: `must be an even integer, got ${segments}`,
          allowed: `even integers ${minSegments}–${maxSegments}`,
        });
      }
      const maps = loopArrayMaps(
        { count: spec.count, loopRadius: spec.loopRadius, ringRadius, tiltDeg, startAngleDeg, segments },
        nx,
        ny,
      );
      return normaliseSumOfSquares(maps);
    }
    case 'gaussian': {
      checkCount(spec.count, field);
      checkRange(spec.width, COIL_LIMITS.width, `${field}.width`);
      const ringRadius = checkRing(spec.ringRadius, COIL_LIMITS.gaussianRing, `${field}.ringRadius`);
      const startAngleDeg = checkAngle(spec.startAngleDeg, `${field}.startAngleDeg`);
      const maps = gaussianArrayMaps(
        { count: spec.count, width: spec.width, ringRadius, startAngleDeg },
        nx,
        ny,
      );
      return normaliseSumOfSquares(maps);
    }
    default:
      throw new ValidationError({
        field: `${field}.array`,
        message: `unknown array ${JSON.stringify((spec as { array?: unknown }).array)}`,
        allowed: 'uniform | loops | gaussian',
      });
  }
}

/** The receiver noise model of an array: Ψ with ρ between ring neighbours (Ψ = I for `uniform` and ρ = 0). */
export function coilArrayNoise(spec: CoilArraySpec, field = 'coils'): CoilNoise {
  if (spec.array === 'uniform') return CoilNoise.ring(1, 0, `${field}.correlation`);
  checkCount(spec.count, field);
  return CoilNoise.ring(spec.count, spec.correlation ?? 0, `${field}.correlation`);
}

function checkCount(count: number, field: string): void {
  if (!Number.isInteger(count) || count < 1 || count > COIL_LIMITS.maxCoils) {
    throw new ValidationError({
      field: `${field}.count`,
      message: `must be an integer from 1 to ${COIL_LIMITS.maxCoils}, got ${count}`,
      allowed: `1 ≤ count ≤ ${COIL_LIMITS.maxCoils}`,
    });
  }
}

function checkRange(value: number, [low, high]: readonly [number, number], field: string): void {
  if (!Number.isFinite(value) || value < low || value > high) {
    throw new ValidationError({
      field,
      message: `must be from ${low} to ${high}, got ${value}`,
      allowed: `${low} ≤ ${field.split('.').pop()} ≤ ${high}`,
    });
  }
}

function checkRing(
  ring: number | readonly [number, number],
  range: readonly [number, number],
  field: string,
): number | readonly [number, number] {
  if (typeof ring === 'number') {
    checkRange(ring, range, field);
    return ring;
  }
  if (!Array.isArray(ring) || ring.length !== 2) {
    throw new ValidationError({
      field,
      message: 'must be a number or two semi-axes [x, y]',
      allowed: 'r or [rx, ry]',
    });
  }
  checkRange(ring[0], range, `${field}.0`);
  checkRange(ring[1], range, `${field}.1`);
  return [ring[0], ring[1]];
}

function checkAngle(angle: number | undefined, field: string): number {
  const value = angle ?? 90;
  if (!Number.isFinite(value)) {
    throw new ValidationError({
      field,
      message: `must be a finite number of degrees, got ${value}`,
      allowed: 'degrees',
    });
  }
  return value;
}
