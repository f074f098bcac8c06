import { describe, expect, it } from 'vitest';
import { radialAngles, tinyGoldenAngle } from '../../sampling/trajectories/radial-angles.ts';
import { nyquistSpokeCount, radialTrajectory } from '../../sampling/trajectories/radial-trajectory.ts';
import { nyquistSpiralInterleaves, spiralTrajectory } from '../../sampling/trajectories/spiral-trajectory.ts';
import { LimitError } from '../../src/core/errors.ts';
import { validationFieldOf } from '../core/caught-validation-error.ts';
import { nufftFixture } from '../nufft/nufft-fixture.ts';

const degrees = (radians: number) => (radians * 180) / Math.PI;

describe('radial angles', () => {
  it('golden angle 180°/φ = 111.24611797…° (Winkelmann et al. 2007) and tiny golden angles 180°/(φ + N − 1) (Wundrak et al. 2016)', () => {
    // The numpy fixture evaluates the formula independently; 1e-9 degrees.
    for (const { n, degrees: expected } of nufftFixture.goldenAngles) {
      expect(Math.abs(degrees(tinyGoldenAngle(n)) - expected)).toBeLessThan(1e-9);
    }
    // Values as published (Wundrak et al. 2016), 4 decimals: N = 2 … 7.
    const published = [68.7539, 49.7508, 38.9776, 32.0397, 27.1984, 23.6281];
    published.forEach((value, i) => {
      expect(degrees(tinyGoldenAngle(i + 2))).toBeCloseTo(value, 4);
    });
    expect(degrees(tinyGoldenAngle(1))).toBeCloseTo(111.24611797, 8);
  });

  it('orderings: uniform j·180°/S, golden and tiny-golden increments modulo 180°', () => {
    const uniform = radialAngles(8, 'uniform');
    uniform.forEach((t, j) => {
      expect(t).toBeCloseTo((j * Math.PI) / 8, 15);
    });
    for (const [ordering, n] of [
      ['golden', 1],
      ['tiny-golden', 7],
      ['tiny-golden', 3],
    ] as const) {
      const theta = radialAngles(500, ordering, n);
      const step = tinyGoldenAngle(n);
      for (let j = 1; j < theta.length; j++) {
        let d = theta[j] - theta[j - 1] - step;
        d -= Math.PI * Math.round(d / Math.PI);
        expect(Math.abs(d)).toBeLessThan(1e-12);
        expect(theta[j]).toBeGreaterThanOrEqual(0);
        expect(theta[j]).toBeLessThan(Math.PI);
      }
    }
  });
});

describe('radial trajectory', () => {
  it('Nyquist spokes ⌈π/2·N⌉ (common practice; numpy fixture: 64 → 101, 256 → 403)', () => {
    for (const { side, spokes } of nufftFixture.nyquistSpokes) expect(nyquistSpokeCount(side)).toBe(spokes);
  });

  it('full spokes through the centre, readout oversampling, R against the Nyquist count', () => {
    const t = radialTrajectory({ side: 16, spokes: 13, ordering: 'golden', readoutOversampling: 2 });
    expect(t.samplesPerReadout).toBe(32);
    expect(t.kx.length).toBe(13 * 32);
    expect(t.nyquistReadouts).toBe(26);
    expect(t.acceleration).toBe(2);
    expect(t.readoutSpacing).toBe(0.5);
    for (let s = 0; s < 13; s++) {
      // Sample ⌊M/2⌋ is the centre; the first reaches −N/2 along the spoke direction.
      expect(Math.abs(t.kx[s * 32 + 16])).toBe(0);
      expect(Math.abs(t.ky[s * 32 + 16])).toBe(0);
      expect(Math.hypot(t.kx[s * 32], t.ky[s * 32])).toBeCloseTo(8, 12);
      expect(Math.atan2(-t.ky[s * 32], -t.kx[s * 32])).toBeCloseTo(t.angles[s], 12);
      // Consecutive samples are Δk = 1/os apart.
      expect(Math.hypot(t.kx[s * 32 + 1] - t.kx[s * 32], t.ky[s * 32 + 1] - t.ky[s * 32])).toBeCloseTo(
        0.5,
        12,
      );
    }
  });

  it('bad specs name their field', () => {
    const field = validationFieldOf;
    expect(field(() => radialTrajectory({ side: 0 }))).toBe('trajectory.side');
    expect(field(() => radialTrajectory({ side: 16, spokes: 2.5 }))).toBe('trajectory.spokes');
    expect(field(() => radialTrajectory({ side: 16, readoutOversampling: 0 }))).toBe(
      'trajectory.readoutOversampling',
    );
    expect(field(() => spiralTrajectory({ side: 64, interleaves: 0 }))).toBe('trajectory.interleaves');
    expect(field(() => spiralTrajectory({ side: 64, interleaves: 8, acceleration: 0.5 }))).toBe(
      'trajectory.acceleration',
    );
    expect(field(() => radialTrajectory({ side: 4096, spokes: 6000, readoutOversampling: 2 }))).toBe(
      'trajectory.spokes',
    );
    expect(() => radialTrajectory({ side: 4096, spokes: 6000, readoutOversampling: 2 })).toThrow(LimitError);
    expect(field(() => spiralTrajectory({ side: 4096, interleaves: 1 }))).toBe(
      'trajectory.samplesPerInterleaf',
    );
    expect(field(() => spiralTrajectory({ side: 64, interleaves: 8, density: 'variable', power: 1 }))).toBe(
      'trajectory.power',
    );
  });
});

/**
 * Radii where the combined interleaves cross the ray at angle φ, found from the samples alone
 * (linear interpolation between consecutive samples whose angles straddle φ), so the check does
 * not reuse the design formula.
 */
function crossingRadii(kx: Float64Array, ky: Float64Array, perInterleaf: number, phi: number): number[] {
  const radii: number[] = [];
  for (let start = 0; start < kx.length; start += perInterleaf) {
    for (let j = start + 1; j < start + perInterleaf; j++) {
      const a = Math.atan2(ky[j - 1], kx[j - 1]) - phi;
      const b = Math.atan2(ky[j], kx[j]) - phi;
      const wa = a - 2 * Math.PI * Math.round(a / (2 * Math.PI));
      const wb = b - 2 * Math.PI * Math.round(b / (2 * Math.PI));
      if (wa <= 0 && wb > 0 && wb - wa < Math.PI) {
        const f = -wa / (wb - wa);
        radii.push(Math.hypot(kx[j - 1] + f * (kx[j] - kx[j - 1]), ky[j - 1] + f * (ky[j] - ky[j - 1])));
      }
    }
  }
  return radii.sort((x, y) => x - y);
}

function largestGap(radii: number[], upTo: number): number {
  let gap = 0;
  for (let i = 1; i < radii.length && radii[i] <= upTo; i++) gap = Math.max(gap, radii[i] - radii[i - 1]);
  return gap;
}

describe('spiral trajectory', () => {
  it('Archimedean, Nyquist interleaves: successive turns ≤ 1/FOV apart everywhere (common practice)', () => {
    // 16× the default samples, so the linear interpolation between samples is close to the curve
    // (chord vs arc error below 1e-3 even on the tight inner turns).
    const coarse = spiralTrajectory({ side: 64, interleaves: 8 });
    const t = spiralTrajectory({
      side: 64,
      interleaves: 8,
      samplesPerInterleaf: 16 * coarse.samplesPerReadout,
    });
    expect(t.turnsPerInterleaf).toBe(4);
    expect(t.nyquistReadouts).toBe(8);
    expect(t.acceleration).toBe(1);
    expect(nyquistSpiralInterleaves(64, t.turnsPerInterleaf)).toBe(8);
    for (const phi of [0.1, 1, 2.5, 4]) {
      const radii = crossingRadii(t.kx, t.ky, t.samplesPerReadout, phi);
      // From the samples: gap 1.000 ± the linear-interpolation error (chord vs arc, < 1e-3);
      // measured 1.000012 … 1.000025.
      expect(largestGap(radii, 0.98 * t.kmax)).toBeLessThanOrEqual(1 + 1e-3);
      expect(largestGap(radii, 0.98 * t.kmax)).toBeGreaterThan(0.99);
    }
  });

  it('k(θ) = (N_int/(2π·FOV))·θ for one interleaf of the uniform design', () => {
    const t = spiralTrajectory({ side: 48, interleaves: 6 });
    for (let j = 1; j < t.samplesPerReadout; j += 97) {
      const r = Math.hypot(t.kx[j], t.ky[j]);
      // Inverting k = N_int·θ/(2π·FOV) with N_int = 6, FOV = 1: the sample's polar angle is 2π·r/6.
      const theta = (2 * Math.PI * r) / 6;
      expect(Math.cos(theta)).toBeCloseTo(t.kx[j] / r, 9);
      expect(Math.sin(theta)).toBeCloseTo(t.ky[j] / r, 9);
    }
  });

  it('R = 2: the gap doubles and the Nyquist count is twice the interleaves', () => {
    const t = spiralTrajectory({ side: 64, interleaves: 8, acceleration: 2, samplesPerInterleaf: 20000 });
    expect(t.nyquistReadouts).toBe(16);
    expect(t.acceleration).toBe(2);
    const gap = largestGap(crossingRadii(t.kx, t.ky, t.samplesPerReadout, 0.7), 0.98 * t.kmax);
    expect(gap).toBeGreaterThan(1.98); // measured 2.0000016
    expect(gap).toBeLessThanOrEqual(2 + 2e-3);
  });

  it('variable density (Kim et al. 2003, k ∝ τ^a): gap grows outwards and meets 1/FOV at kmax', () => {
    const t = spiralTrajectory({
      side: 64,
      interleaves: 8,
      density: 'variable',
      power: 2,
      samplesPerInterleaf: 20000,
    });
    expect(t.nyquistReadouts).toBe(8);
    const radii = crossingRadii(t.kx, t.ky, t.samplesPerReadout, 1.3);
    expect(largestGap(radii, t.kmax)).toBeLessThanOrEqual(1 + 2e-3); // measured 0.987
    // Centre denser than the edge: the innermost gaps are well below the outermost.
    expect(radii[1] - radii[0]).toBeLessThan(0.5); // measured 0.0039
  });

  it('samples are equally spaced along each interleaf, ≤ ½ cycle/FOV by default', () => {
    const t = spiralTrajectory({ side: 32, interleaves: 4 });
    let min = Infinity;
    let max = 0;
    for (let j = 1; j < t.samplesPerReadout; j++) {
      // Chords are shorter than the arc steps where the curve bends tightly (radius of curvature ≈ r);
      // beyond r = 4 the chord of a ½ step is within 0.1 % of the arc.
      if (Math.hypot(t.kx[j - 1], t.ky[j - 1]) < 4) continue;
      const d = Math.hypot(t.kx[j] - t.kx[j - 1], t.ky[j] - t.ky[j - 1]);
      min = Math.min(min, d);
      max = Math.max(max, d);
    }
    expect(max).toBeLessThanOrEqual(0.5);
    expect(min / max).toBeGreaterThan(0.99); // measured max 0.49990, min/max 0.99941
  });
});
