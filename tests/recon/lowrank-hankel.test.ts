import { describe, expect, it } from 'vitest';
import { fft2c, ifft2c } from '../../src/core/centered-fft.ts';
import { createComplexImage } from '../../src/core/complex-image.ts';
import { CancelledError, LimitError, ValidationError } from '../../src/core/errors.ts';
import { defaultLimits } from '../../src/core/limits.ts';
import { parseOrThrow } from '../../src/core/zod-problems.ts';
import { methodSchemaFor, reconstruct } from '../../src/recon/index.ts';
import { solveLowrankHankel } from '../../src/recon/lowrank-hankel.ts';
import { relativeError } from '../error-measures.ts';
import {
  friSignal1d,
  fullMask,
  POINT_SOURCES,
  pointSourceKspace,
  randomComplexImage,
  randomPointMask,
  randomProblem,
} from './helpers.ts';

describe('lowrank-hankel completion', () => {
  it('recovers the k-space of K = 4 point sources from 20 % of a 32×32 grid to NRMSE < 1e-6 (finite rate of innovation, Vetterli et al. 2002)', () => {
    // 20 % random points: 5× below Nyquist on the grid; 4 sources carry 12 real degrees of freedom.
    const nx = 32;
    const ny = 32;
    const truth = pointSourceKspace(nx, ny, POINT_SOURCES);
    const mask = randomPointMask(nx, ny, 0.2, 5);
    let count = 0;
    for (const m of mask) count += m;
    expect(count / (nx * ny)).toBeLessThan(0.21);
    const kspace = createComplexImage(nx, ny);
    for (let i = 0; i < nx * ny; i++) {
      if (mask[i]) {
        kspace.data[2 * i] = truth.data[2 * i];
        kspace.data[2 * i + 1] = truth.data[2 * i + 1];
      }
    }
    const out = reconstruct(
      { kspace, mask },
      { name: 'lowrank-hankel', kernel: 6, rank: 4, weighting: 'none', iterations: 600, tolerance: 1e-13 },
    );
    expect(out.info.rankRule).toBe('explicit');
    expect(out.info.rank).toBe(4);
    const reference = ifft2c(truth);
    expect(relativeError(out.image.data, reference.data)).toBeLessThan(1e-6);
    // Not vacuous: the zero-filled image from the same samples is far off.
    expect(relativeError(ifft2c(kspace).data, reference.data)).toBeGreaterThan(0.8);
  });

  it('1-D: 27 of 64 samples, window 32, rank 3 — error 2.6e-9 after 200 iterations, < 1e-13 after 500 (docs/references.md §5.3 [C])', () => {
    const m = 64;
    const x = friSignal1d();
    const mask = new Uint8Array(m);
    for (let j = 0; j < 8; j++) mask[j] = 1;
    for (let j = 0; j < m; j += 3) mask[j] = 1;
    expect(mask.reduce((s, v) => s + v, 0)).toBe(27);
    const y = new Float64Array(2 * m);
    for (let j = 0; j < m; j++) {
      if (mask[j]) {
        y[2 * j] = x[2 * j];
        y[2 * j + 1] = x[2 * j + 1];
      }
    }
    const run = (iterations: number) =>
      solveLowrankHankel(
        { kspace: { nx: m, ny: 1, data: y }, mask },
        { kernel: [1, 32], rank: 3, energy: 0.5, weighting: 'none', iterations, tolerance: 0 },
      );
    const at200 = relativeError(run(200).kspace, x);
    expect(at200).toBeGreaterThan(1e-9);
    expect(at200).toBeLessThan(5e-9);
    expect(relativeError(run(500).kspace, x)).toBeLessThan(1e-13);
  });

  it('full sampling returns the reference: full rank to 1e-12, and any rank (data consistency keeps every sample)', () => {
    const nx = 20;
    const ny = 18;
    const image = randomComplexImage(nx, ny, 3);
    const input = { kspace: fft2c(image), mask: fullMask(nx, ny) };
    for (const weighting of ['none', 'gradient'] as const) {
      const full = reconstruct(input, {
        name: 'lowrank-hankel',
        kernel: 5,
        rank: 25,
        weighting,
        iterations: 5,
      });
      expect(relativeError(full.image.data, image.data)).toBeLessThan(1e-12);
      const low = reconstruct(input, {
        name: 'lowrank-hankel',
        kernel: 5,
        rank: 3,
        weighting,
        iterations: 5,
      });
      expect(relativeError(low.image.data, image.data)).toBeLessThan(1e-12);
    }
  });

  it('full rank on an undersampled grid leaves the zero-filled k-space unchanged (Π = I)', () => {
    const nx = 16;
    const ny = 16;
    const { mask, kspace: k } = randomProblem(nx, ny, 8, 0.5, 2);
    const out = reconstruct(
      { kspace: k, mask },
      { name: 'lowrank-hankel', kernel: [3, 4], rank: 12, weighting: 'none', iterations: 3, tolerance: 0 },
    );
    expect(relativeError(out.image.data, ifft2c(k).data)).toBeLessThan(1e-12);
  });

  it('energy rule picks the rank from the spectrum and says so', () => {
    const nx = 32;
    const ny = 32;
    const truth = pointSourceKspace(nx, ny, POINT_SOURCES.slice(0, 3));
    const out = reconstruct(
      { kspace: truth, mask: fullMask(nx, ny) },
      { name: 'lowrank-hankel', kernel: 6, energy: 0.999999, weighting: 'none', iterations: 2 },
    );
    expect(out.info.rankRule).toBe('energy');
    expect(out.info.rank).toBe(3);
    expect(out.info.energyKept as number).toBeGreaterThan(0.999999);
  });

  it('without rank or energy uses 0.65 × window area from f ≥ 0.3, else half of it, and reports rankRule fraction-default', () => {
    // The rank rule of src/recon/hankel-rank.ts (tuned on anatomy, docs/design.md §3.12), worked
    // by hand for 7×7 = 49: round(0.65·49) = round(31.85) = 32 at full sampling; round(24.5) = 25 at f = ¼.
    const nx = 16;
    const ny = 16;
    const kspace = fft2c(randomComplexImage(nx, ny, 4));
    const full = reconstruct({ kspace, mask: fullMask(nx, ny) }, { name: 'lowrank-hankel', iterations: 1 });
    expect(full.info).toMatchObject({
      rankRule: 'fraction-default',
      rank: 32,
      kernel: [7, 7],
      weighting: 'gradient',
    });
    const quarter = new Uint8Array(nx * ny);
    for (let i = 0; i < nx * ny; i += 4) quarter[i] = 1;
    const sparse = reconstruct({ kspace, mask: quarter }, { name: 'lowrank-hankel', iterations: 1 });
    expect(sparse.info).toMatchObject({ rankRule: 'fraction-default', rank: 25 });
  });
});

describe('lowrank-hankel parameters (docs/design.md §4.1: typed errors naming the field and range; configured limits)', () => {
  const nx = 16;
  const ny = 12;
  const input = { kspace: fft2c(randomComplexImage(nx, ny, 1)), mask: fullMask(nx, ny) };
  function problem(spec: Record<string, unknown>, limits = defaultLimits, viaSchema = false) {
    try {
      const method = { name: 'lowrank-hankel', ...spec };
      reconstruct(
        input,
        viaSchema ? parseOrThrow(methodSchemaFor(limits), method, 'method') : (method as never),
        { limits },
      );
    } catch (error) {
      if (error instanceof ValidationError) return { ...error.problems[0], type: error.name };
      throw error;
    }
    throw new Error('expected a ValidationError');
  }

  it('names the field and the allowed range', () => {
    expect(problem({ kernel: 0 })).toMatchObject({
      field: 'method.kernel',
      allowed: 'integer 1 ≤ kernel ≤ 64',
    });
    expect(problem({ kernel: 1 })).toMatchObject({
      field: 'method.kernel',
      allowed: '2 ≤ rows·columns ≤ 121',
    });
    expect(problem({ kernel: 12 })).toMatchObject({
      field: 'method.kernel',
      allowed: '2 ≤ rows·columns ≤ 121',
    });
    expect(problem({ kernel: [13, 3] })).toMatchObject({
      field: 'method.kernel',
      allowed: 'rows ≤ 12, columns ≤ 16',
    });
    expect(problem({ kernel: [3, 3, 3] })).toMatchObject({ field: 'method.kernel' });
    expect(problem({ kernel: 5, rank: 26 })).toMatchObject({
      field: 'method.rank',
      allowed: 'integer 1 ≤ rank ≤ 25',
    });
    expect(problem({ energy: 1 })).toMatchObject({ field: 'method.energy', allowed: '0 < energy < 1' });
    expect(problem({ energy: 0.9, rank: 3 })).toMatchObject({
      field: 'method.energy',
      allowed: 'rank | energy',
    });
    expect(problem({ weighting: 'laplacian' })).toMatchObject({
      field: 'method.weighting',
      allowed: 'none | gradient',
    });
    // Iteration counts are the method schema's (checked once at the edge, methodSchemaFor).
    expect(problem({ iterations: -3 }, defaultLimits, true)).toMatchObject({
      field: 'method.iterations',
      type: 'ValidationError',
    });
    expect(problem({ tolerance: -1 })).toMatchObject({ field: 'method.tolerance' });
  });

  it('refuses iterations beyond the limit with a LimitError and honours cancellation', () => {
    expect(problem({ iterations: 11 }, { ...defaultLimits, maxIterations: 10 }, true)).toMatchObject({
      field: 'method.iterations',
      type: 'LimitError',
      allowed: '1 ≤ iterations ≤ 10',
    });
    expect(() =>
      parseOrThrow(
        methodSchemaFor({ ...defaultLimits, maxIterations: 10 }),
        { name: 'lowrank-hankel', iterations: 11 },
        'method',
      ),
    ).toThrow(LimitError);
    // Past the edge, a count beyond the limit can only be a programming mistake.
    expect(() =>
      reconstruct(
        input,
        { name: 'lowrank-hankel', iterations: 11 },
        { limits: { ...defaultLimits, maxIterations: 10 } },
      ),
    ).toThrow(RangeError);
    const controller = new AbortController();
    controller.abort();
    expect(() => reconstruct(input, { name: 'lowrank-hankel' }, { signal: controller.signal })).toThrow(
      CancelledError,
    );
  });
});
