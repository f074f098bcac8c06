import { ValidationError } from '../../src/core/errors.ts';
import { checkTrajectorySize, type Trajectory } from './trajectory.ts';

export interface SpiralTrajectorySpec {
  /** Matrix N: the spiral reaches kmax = N/2 cycles per FOV. */
  side: number;
  /** Number of interleaves, rotated by 2π/interleaves from one another. */
  interleaves: number;
  /** Outermost combined turn spacing in cycles per FOV (1 = Nyquist); default 1. */
  acceleration?: number;
  /** 'uniform': Archimedean; 'variable': k ∝ τ^power (Kim, Adalsteinsson & Spielman 2003). */
  density?: 'uniform' | 'variable';
  /** The exponent of the variable-density design (> 1 samples the centre more densely); default 2. */
  power?: number;
  /** Samples per interleaf, equally spaced in arc length; default: spacing ≤ ½ cycle per FOV. */
  samplesPerInterleaf?: number;
}

export interface SpiralTrajectory extends Trajectory {
  readonly kind: 'spiral';
  readonly density: 'uniform' | 'variable';
  /** Exponent of k ∝ τ^power (1 for the Archimedean spiral). */
  readonly power: number;
  /** Turns of one interleaf from the centre to kmax. */
  readonly turnsPerInterleaf: number;
  /** Radial gap between successive turns of the combined interleaves at kmax, cycles per FOV. */
  readonly outermostTurnSpacing: number;
  readonly kmax: number;
}

/** Fine parameter samples per turn for the arc-length table (far below one sample's spacing). */
const TABLE_STEPS_PER_TURN = 2048;
/** Cap on that table (32 MB); even then a turn gets ≥ 256 steps for every spiral the limits allow. */
const MAX_TABLE_STEPS = 2 ** 22;

function fail(field: string, message: string, allowed: string): never {
  throw new ValidationError({ field, message, allowed });
}

/**
 * Spiral interleaves k(τ) = kmax·τ^a·e^(i(2π·turns·τ + 2πm/interleaves)), τ ∈ [0, 1], m the
 * interleaf. With a = 1 this is the Archimedean spiral k(θ) = (interleaves·R/(2π·FOV))·θ: each
 * interleaf's turns lie interleaves·R/FOV apart, so the combined interleaves are R/FOV apart
 * everywhere (R = 1 is Nyquist). With a > 1 it is the variable-density design of Kim,
 * Adalsteinsson & Spielman 2003 (k = λτ^α e^(iωτ), form from memory): the turn spacing of the
 * combined interleaves grows from 0 at the centre to a·kmax/(turns·interleaves) at kmax, which the
 * design sets to R. Turns per interleaf = a·kmax/(interleaves·R).
 *
 * Samples are equally spaced in arc length (constant readout speed). Gradient amplitude and slew
 * limits are not modelled, so this is a k-space pattern, not a gradient waveform.
 */
export function spiralTrajectory(spec: SpiralTrajectorySpec): SpiralTrajectory {
  const { side, interleaves } = spec;
  if (!Number.isInteger(side) || side < 2 || side > 4096) {
    fail('trajectory.side', `must be an integer from 2 to 4096, got ${side}`, 'integer, 2 ≤ side ≤ 4096');
  }
  if (!Number.isInteger(interleaves) || interleaves < 1 || interleaves > 4 * side) {
    fail(
      'trajectory.interleaves',
      `must be an integer from 1 to ${4 * side}, got ${interleaves}`,
      `integer, 1 ≤ interleaves ≤ ${4 * side}`,
    );
  }
  const acceleration = spec.acceleration ?? 1;
  if (!Number.isFinite(acceleration) || acceleration < 1 || acceleration > side) {
    fail(
      'trajectory.acceleration',
      `must be from 1 to ${side}, got ${acceleration}`,
      `1 ≤ acceleration ≤ ${side}`,
    );
  }
  const density = spec.density ?? 'uniform';
  const power = density === 'uniform' ? 1 : (spec.power ?? 2);
  if (density === 'variable' && (!Number.isFinite(power) || power <= 1 || power > 8)) {
    fail('trajectory.power', `must be above 1 and at most 8, got ${power}`, '1 < power ≤ 8');
  }
  const kmax = side / 2;
  const turns = (power * kmax) / (interleaves * acceleration);
  const thetaMax = 2 * Math.PI * turns;

  // Arc length s(τ) by the trapezoid rule on a fine τ grid; |dk/dτ| = kmax·√((aτ^(a−1))² + (θmax τ^a)²).
  const steps = Math.min(MAX_TABLE_STEPS, Math.max(4096, Math.ceil(TABLE_STEPS_PER_TURN * turns)));
  const arc = new Float64Array(steps + 1);
  const speed = (tau: number) => kmax * Math.hypot(power * tau ** (power - 1), thetaMax * tau ** power);
  let previous = speed(0);
  for (let i = 1; i <= steps; i++) {
    const current = speed(i / steps);
    arc[i] = arc[i - 1] + (previous + current) / 2 / steps;
    previous = current;
  }
  const length = arc[steps];
  const samples = spec.samplesPerInterleaf ?? Math.ceil(2 * length) + 1;
  if (!Number.isInteger(samples) || samples < 2 || samples > 1_000_000) {
    const given = spec.samplesPerInterleaf !== undefined;
    fail(
      'trajectory.samplesPerInterleaf',
      given
        ? `must be an integer from 2 to 1000000, got ${samples}`
        : `the default spacing of ½ cycle/FOV would need ${samples} samples per interleaf; use more interleaves`,
      'integer, 2 ≤ samplesPerInterleaf ≤ 1000000',
    );
  }
  checkTrajectorySize(interleaves, samples, 'trajectory.interleaves');

  // τ at equal arc-length steps, by inverting the table with linear interpolation.
  const tau = new Float64Array(samples);
  for (let j = 0, i = 0; j < samples; j++) {
    const target = (j * length) / (samples - 1);
    while (i < steps - 1 && arc[i + 1] < target) i++;
    const span = arc[i + 1] - arc[i];
    const f = span > 0 ? Math.min(1, Math.max(0, (target - arc[i]) / span)) : 0;
    tau[j] = (i + f) / steps;
  }

  const count = interleaves * samples;
  const kx = new Float64Array(count);
  const ky = new Float64Array(count);
  for (let m = 0; m < interleaves; m++) {
    const rotation = (2 * Math.PI * m) / interleaves;
    for (let j = 0; j < samples; j++) {
      const r = kmax * tau[j] ** power;
      const angle = thetaMax * tau[j] + rotation;
      kx[m * samples + j] = r * Math.cos(angle);
      ky[m * samples + j] = r * Math.sin(angle);
    }
  }
  const spacing = (power * kmax) / (turns * interleaves);
  const nyquistExact = (power * kmax) / turns;
  return {
    kind: 'spiral',
    kx,
    ky,
    readouts: interleaves,
    samplesPerReadout: samples,
    nyquistReadouts: Math.ceil(nyquistExact - 1e-9),
    acceleration: spacing,
    density,
    power,
    turnsPerInterleaf: turns,
    outermostTurnSpacing: spacing,
    kmax,
  };
}

/**
 * Interleaves a uniform-density (Archimedean) spiral of the given turns per interleaf needs so that
 * the outermost combined turn spacing is at most one cycle per FOV: ⌈kmax/turns⌉ (common practice).
 */
export function nyquistSpiralInterleaves(side: number, turnsPerInterleaf: number, power = 1): number {
  return Math.ceil((power * side) / 2 / turnsPerInterleaf - 1e-9);
}
