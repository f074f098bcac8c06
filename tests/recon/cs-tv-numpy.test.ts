import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { solveCsTv } from '../../src/recon/cs-tv.ts';
import { solveCsTvPreconditioned } from '../../src/recon/cs-tv-preconditioned.ts';
import { relativeError } from '../error-measures.ts';

interface IterationsFixture {
  nx: number;
  ny: number;
  kspace: number[];
  mask: number[];
  lambda: number;
  iterations: number;
  plain: { objective: number; image: number[] };
  preconditioned: { sigma: number; delta: number; relaxation: number; objective: number; image: number[] };
}

// Fixture: tests/reference/cs_tv_reference.py (Debian python3-numpy, numpy.fft), the same two
// iterations written independently with numpy arrays: the plain Chambolle–Pock 2011 scheme with the
// exact k-space data prox, and the Fourier-preconditioned, relaxed one (Pock & Chambolle 2011).
// After a fixed number of iterations (not converged) the iterates must agree to rounding: the
// FFTs differ (fft.js against pocketfft), so 1e-10 relative, not bit for bit.
const fixture = JSON.parse(
  readFileSync(new URL('../reference/fixtures/cs-tv-iterations.json', import.meta.url), 'utf8'),
) as IterationsFixture;
const input = {
  kspace: { nx: fixture.nx, ny: fixture.ny, data: Float64Array.from(fixture.kspace) },
  mask: Uint8Array.from(fixture.mask),
};

describe('cs-tv single-coil solvers against the numpy reference (tests/reference/cs_tv_reference.py)', () => {
  it(`plain Chambolle–Pock: the same image and objective after ${fixture.iterations} iterations`, () => {
    const out = solveCsTv(input, fixture.lambda, fixture.iterations, 0);
    expect(out.iterations).toBe(fixture.iterations);
    expect(Math.abs(out.objective - fixture.plain.objective) / fixture.plain.objective).toBeLessThan(1e-10);
    expect(relativeError(out.image.data, Float64Array.from(fixture.plain.image))).toBeLessThan(1e-10);
  });

  it(`Fourier-preconditioned and relaxed: the same image and objective after ${fixture.iterations} iterations`, () => {
    const { sigma, relaxation, objective, image } = fixture.preconditioned;
    expect(fixture.preconditioned.delta).toBeCloseTo(sigma * 1e-3, 15); // the solver's δ = 1e-3·σ
    const out = solveCsTvPreconditioned(input, fixture.lambda, fixture.iterations, 0, { sigma, relaxation });
    expect(out.iterations).toBe(fixture.iterations);
    expect(Math.abs(out.objective - objective) / objective).toBeLessThan(1e-10);
    expect(relativeError(out.image.data, Float64Array.from(image))).toBeLessThan(1e-10);
    // Not converged yet: the two schemes are at different points (the check is not trivial).
    expect(relativeError(out.image.data, Float64Array.from(fixture.plain.image))).toBeGreaterThan(1e-6);
  });
});
