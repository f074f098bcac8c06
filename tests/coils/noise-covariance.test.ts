import { describe, expect, it } from 'vitest';
import { coilArrayNoise } from '../../src/coils/coil-array.ts';
import { CoilNoise, ringCorrelationRange, ringNoiseCovariance } from '../../src/coils/noise-covariance.ts';
import { adjoint, multiply, rowMajor } from '../../src/core/complex-matrix.ts';
import { ValidationError } from '../../src/core/errors.ts';
import { SeededRandom } from '../../src/core/random.ts';
import { createMultiCoilArray, type MultiCoilArray } from '../../src/encoding/multi-coil.ts';

/** Sample covariance Σ_i n_a,i·conj(n_b,i) / N as interleaved complex C×C: X·Xᴴ / N. */
function sampleCovariance(data: MultiCoilArray): Float64Array {
  const { coils } = data;
  const n = data.nx * data.ny;
  const x = rowMajor(data.data, n);
  return multiply(x, adjoint(x), coils, n, coils).map((v) => v / n);
}

describe('receiver noise correlated across coils', () => {
  it('ring covariance: unit diagonal, ρ between ring neighbours (wrapping), zero elsewhere', () => {
    const psi = ringNoiseCovariance(5, 0.2);
    const value = (a: number, b: number) => psi[2 * (a * 5 + b)];
    expect(value(0, 0)).toBe(1);
    expect(value(0, 1)).toBe(0.2);
    expect(value(0, 4)).toBe(0.2);
    expect(value(0, 2)).toBe(0);
    expect(value(3, 4)).toBe(0.2);
    expect(Array.from(ringNoiseCovariance(2, 0.3))).toEqual([1, 0, 0.3, 0, 0.3, 0, 1, 0]);
  });

  it('ρ range from the circulant eigenvalues 1 + 2ρ·cos(2πk/C) (common practice)', () => {
    expect(ringCorrelationRange(2)).toEqual([-1, 1]);
    expect(ringCorrelationRange(4)).toEqual([-0.5, 0.5]);
    expect(ringCorrelationRange(3)[1]).toBeCloseTo(1, 12);
    expect(() => CoilNoise.ring(4, 0.49)).not.toThrow();
    for (const bad of [0.5, -0.5, Number.NaN]) {
      try {
        CoilNoise.ring(4, bad);
        expect.unreachable('accepted bad ρ');
      } catch (error) {
        expect(error).toBeInstanceOf(ValidationError);
        expect((error as ValidationError).problems[0].field).toBe('coils.correlation');
      }
    }
  });

  it('an array spec carries its neighbour correlation (default 0: Ψ = I)', () => {
    const spec = { array: 'loops', count: 4, loopRadius: 0.35, ringRadius: 1.25 } as const;
    expect(Array.from(coilArrayNoise({ ...spec, correlation: 0.1 }).covariance)).toEqual(
      Array.from(ringNoiseCovariance(4, 0.1)),
    );
    expect(Array.from(coilArrayNoise(spec).lower)).toEqual(Array.from(ringNoiseCovariance(4, 0)));
    expect(coilArrayNoise({ array: 'uniform' }).coils).toBe(1);
    expect(() => coilArrayNoise({ ...spec, correlation: 0.6 })).toThrow(/coils.correlation/);
  });

  it('drawn noise has covariance 2σ²Ψ; prewhitening makes it 2σ²·I (within 5 standard errors)', () => {
    const coils = 4;
    const psi = ringNoiseCovariance(coils, 0.3);
    psi[2 * 1 + 1] = 0.1; // a complex entry, Hermitian: Ψ_01 = 0.3 + 0.1i, Ψ_10 = 0.3 − 0.1i
    psi[2 * (1 * coils) + 1] = -0.1;
    const noise = new CoilNoise(psi, coils);
    const data = createMultiCoilArray(coils, 128, 128);
    const sigma = 0.7;
    noise.addNoise(data, sigma, new SeededRandom(42));
    const samples = 128 * 128;
    // Each entry of a sample covariance of N complex Gaussian samples has standard error ≈ 2σ²/√N.
    const tolerance = (5 * 2 * sigma * sigma) / Math.sqrt(samples);
    const measured = sampleCovariance(data);
    for (let k = 0; k < psi.length; k++)
      expect(Math.abs(measured[k] - 2 * sigma * sigma * psi[k])).toBeLessThan(tolerance);
    noise.prewhiten(data);
    const white = sampleCovariance(data);
    for (let a = 0; a < coils; a++) {
      for (let b = 0; b < coils; b++) {
        const expected = a === b ? 2 * sigma * sigma : 0;
        expect(Math.abs(white[2 * (a * coils + b)] - expected)).toBeLessThan(tolerance);
        expect(Math.abs(white[2 * (a * coils + b) + 1])).toBeLessThan(tolerance);
      }
    }
  });

  it('the same seed gives the same noise; prewhitening inverts L exactly to rounding', () => {
    const noise = CoilNoise.ring(3, 0.25);
    const a = createMultiCoilArray(3, 6, 5);
    const b = createMultiCoilArray(3, 6, 5);
    noise.addNoise(a, 1, new SeededRandom(9));
    noise.addNoise(b, 1, new SeededRandom(9));
    expect(a.data).toEqual(b.data);
    // Whitening σ·L·z recovers σ·z, the raw normals in draw order.
    const white = createMultiCoilArray(3, 6, 5);
    white.data.set(a.data);
    noise.prewhiten(white);
    const random = new SeededRandom(9);
    for (let i = 0; i < 30; i++) {
      for (let c = 0; c < 3; c++) {
        expect(white.data[2 * (c * 30 + i)]).toBeCloseTo(random.normal(), 12);
        expect(white.data[2 * (c * 30 + i) + 1]).toBeCloseTo(random.normal(), 12);
      }
    }
  });

  it('refuses a covariance that is not Hermitian or not positive definite, naming the field', () => {
    const notHermitian = ringNoiseCovariance(3, 0.2);
    notHermitian[2 * 1] = 0.4;
    const indefinite = Float64Array.from([1, 0, 2, 0, 2, 0, 1, 0]);
    for (const [psi, pattern] of [
      [notHermitian, /Hermitian/],
      [indefinite, /positive definite/],
    ] as const) {
      try {
        new CoilNoise(psi, Math.round(Math.sqrt(psi.length / 2)));
        expect.unreachable('accepted a bad covariance');
      } catch (error) {
        expect(error).toBeInstanceOf(ValidationError);
        expect((error as ValidationError).problems[0].field).toMatch(/^coils\.noiseCovariance/);
        expect((error as ValidationError).message).toMatch(pattern);
      }
    }
  });
});
