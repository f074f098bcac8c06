import { describe, expect, it } from 'vitest';
import { coilArrayMaps } from '../../src/coils/coil-array.ts';
import { CoilNoise } from '../../src/coils/noise-covariance.ts';
import { SenseFoldSolver, senseGFactorMap, summariseGFactor } from '../../src/coils/sense-g-factor.ts';
import { ValidationError } from '../../src/core/errors.ts';
import { createMultiCoilArray } from '../../src/encoding/multi-coil.ts';
import { coilFixture, gaussianArrayMaps } from './fixture.ts';

/** Real C×R matrix (rows = coils) as interleaved complex. */
function complexMatrix(rows: number[][]): Float64Array {
  const out = new Float64Array(2 * rows.length * rows[0].length);
  rows.flat().forEach((v, k) => {
    out[2 * k] = v;
  });
  return out;
}

describe('SENSE g-factor of one fold (Pruessmann, Weiger, Scheidegger & Boesiger 1999)', () => {
  it('two-coil worked example: g = 1.047551 for both pixels (numpy fixture: 1.0475508425951507)', () => {
    const g = new Float64Array(2);
    expect(new SenseFoldSolver(2, 2).gFactors(complexMatrix(coilFixture.sense_two_coils.S), g)).toBe(true);
    for (let k = 0; k < 2; k++) {
      expect(Math.abs(g[k] - coilFixture.sense_two_coils.g[k])).toBeLessThan(1e-14);
      expect(g[k]).toBeCloseTo(1.047551, 6);
    }
    // Transposed (rows = pixels) gives the other published value, 1.046437.
    const S = coilFixture.sense_two_coils.S;
    new SenseFoldSolver(2, 2).gFactors(
      complexMatrix([S[0].map((_, k) => S[k][0]), S[0].map((_, k) => S[k][1])]),
      g,
    );
    expect(Math.abs(g[0] - coilFixture.sense_two_coils.g_rows_as_pixels[0])).toBeLessThan(1e-14);
  });

  it('orthogonal sensitivities S = I give g = 1 exactly', () => {
    const g = new Float64Array(2);
    new SenseFoldSolver(2, 2).gFactors(
      complexMatrix([
        [1, 0],
        [0, 1],
      ]),
      g,
    );
    expect(Array.from(g)).toEqual([1, 1]);
  });

  it('identical (or proportional) sensitivities are singular', () => {
    const g = new Float64Array(2);
    expect(
      new SenseFoldSolver(2, 2).gFactors(
        complexMatrix([
          [0.7, 0.7],
          [0.3, 0.3],
        ]),
        g,
      ),
    ).toBe(false);
    expect(
      new SenseFoldSolver(3, 2).gFactors(
        complexMatrix([
          [0.5, 1],
          [0.25, 0.5],
          [1, 2],
        ]),
        g,
      ),
    ).toBe(false);
  });

  it('g ≥ 1 for random complex folds, with and without a noise covariance', () => {
    const noise = CoilNoise.ring(5, 0.3);
    const g = new Float64Array(3);
    const s = new Float64Array(2 * 5 * 3);
    let seed = 1;
    const next = () => {
      seed = (seed * 16807) % 2147483647;
      return seed / 2147483647 - 0.5;
    };
    for (let trial = 0; trial < 50; trial++) {
      for (let k = 0; k < s.length; k++) s[k] = next();
      for (const solver of [new SenseFoldSolver(5, 3), new SenseFoldSolver(5, 3, noise.lower)]) {
        expect(solver.gFactors(s, g)).toBe(true);
        for (const v of g) expect(v).toBeGreaterThanOrEqual(1 - 1e-12);
      }
    }
  });
});

describe('SENSE g-factor maps for uniform Cartesian undersampling', () => {
  const f = coilFixture.gaussian_array;
  const maps = gaussianArrayMaps();
  const disc = Uint8Array.from(f.disc);

  for (const [label, noise, expected, summary] of [
    ['Ψ = I', undefined, f.gWhite, f.summaryWhite],
    [`ring Ψ, ρ = ${f.correlation}`, CoilNoise.ring(f.count, f.correlation), f.gRing, f.summaryRing],
  ] as const) {
    it(`4 Gaussian coils, 32², R = 2, ${label}: map and summary equal numpy to 1e-10`, () => {
      const g = senseGFactorMap(maps, f.acceleration, { noiseLower: noise?.lower });
      let worst = 0;
      for (let i = 0; i < g.length; i++) worst = Math.max(worst, Math.abs(g[i] - expected[i]));
      expect(worst).toBeLessThan(1e-10); // measured 7.5e-15 (Ψ = I), 2.1e-14 (ring Ψ)
      const s = summariseGFactor(g, disc);
      expect(Math.abs(s.mean - summary.mean)).toBeLessThan(1e-10);
      expect(Math.abs(s.p95 - summary.p95)).toBeLessThan(1e-10);
      expect(Math.abs(s.max - summary.max)).toBeLessThan(1e-10);
      expect(s.max).toBeGreaterThan(1.3); // the fixture's 1.356 / 1.363: the map is not trivially 1
    });
  }

  it('R = 1 gives g = 1 exactly everywhere', () => {
    const g = senseGFactorMap(maps, 1);
    expect(g.every((v) => v === 1)).toBe(true);
    const loops = coilArrayMaps({ array: 'loops', count: 3, loopRadius: 0.4, ringRadius: 1.2 }, 12, 12);
    expect(
      senseGFactorMap(loops, 1, { noiseLower: CoilNoise.ring(3, 0.2).lower }).every((v) => v === 1),
    ).toBe(true);
  });

  it('g grows with R for an 8-loop array (mean over the disc, R = 2 < R = 4)', () => {
    const loops = coilArrayMaps({ array: 'loops', count: 8, loopRadius: 0.35, ringRadius: 1.25 }, 32, 32);
    const s2 = summariseGFactor(senseGFactorMap(loops, 2), disc);
    const s4 = summariseGFactor(senseGFactorMap(loops, 4), disc);
    expect(s2.mean).toBeGreaterThanOrEqual(1);
    expect(s4.mean).toBeGreaterThan(s2.mean);
    expect(s4.max).toBeGreaterThan(s2.max);
  });

  it('pixels outside the support leave their folds and get g = 0; a fold of one pixel has g = 1', () => {
    const support = new Uint8Array(f.nx * f.ny);
    for (let i = 0; i < f.ny / 2; i++) support.fill(1, i * f.nx, (i + 1) * f.nx); // top half only
    const g = senseGFactorMap(maps, 2, { support });
    for (let i = 0; i < g.length; i++) expect(g[i]).toBe(i < (f.nx * f.ny) / 2 ? 1 : 0);
  });

  it('identical maps are refused with a clear error naming the field', () => {
    const same = createMultiCoilArray(2, 8, 8);
    for (let c = 0; c < 2; c++) for (let i = 0; i < 64; i++) same.data[2 * (c * 64 + i)] = 0.5 + i / 128;
    try {
      senseGFactorMap(same, 2);
      expect.unreachable('accepted identical maps');
    } catch (error) {
      expect(error).toBeInstanceOf(ValidationError);
      const problem = (error as ValidationError).problems[0];
      expect(problem.field).toBe('coils');
      expect(problem.message).toMatch(/linearly dependent.*singular/);
    }
  });

  it('refuses R that does not divide ny or exceeds the coil count', () => {
    for (const R of [3, 5, 1.5, 0]) {
      try {
        senseGFactorMap(maps, R);
        expect.unreachable(`accepted R = ${R}`);
      } catch (error) {
        expect(error).toBeInstanceOf(ValidationError);
        expect((error as ValidationError).problems[0].field).toBe('sampling.acceleration');
      }
    }
  });

  it('summary: numpy-style linear percentile, empty mask refused', () => {
    const g = Float64Array.from([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11]);
    const s = summariseGFactor(g, new Uint8Array(11).fill(1));
    // numpy.percentile([1..11], 95) = 10.5 (rank 0.95·10 = 9.5) — common practice.
    expect(s).toEqual({ mean: 6, p95: 10.5, max: 11 });
    expect(() => summariseGFactor(g, new Uint8Array(11))).toThrow(ValidationError);
  });
});
