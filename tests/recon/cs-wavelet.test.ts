import { describe, expect, it } from 'vitest';
import { generateMask } from '../../sampling/index.ts';
import { acquire } from '../../src/acquisition/acquire.ts';
import { fullKspaceFromPhantom } from '../../src/acquisition/phantom-source.ts';
import { fft2c, ifft2c } from '../../src/core/centered-fft.ts';
import { type ComplexImage, magnitude } from '../../src/core/complex-image.ts';
import { ValidationError } from '../../src/core/errors.ts';
import { getPhantom } from '../../src/phantoms/index.ts';
import { runReconstruction } from '../../src/pipeline/run-reconstruction.ts';
import { type MethodSpec, reconstruct } from '../../src/recon/index.ts';
import { defaultCsWaveletLambda } from '../../src/recon/parameters.ts';
import { dwt2, idwt2 } from '../../src/wavelets/dwt2.ts';
import { softThresholdDetails } from '../../src/wavelets/soft-threshold.ts';
import { maxAbsDifference, relativeError } from '../error-measures.ts';
import { coilInput, lineMask, loopCoilProblem, magnitudeNrmse } from './coil-problem.ts';
import { fullMask, randomComplexImage } from './helpers.ts';

/**
 * With E unitary on the image (full mask, single coil; or maps with Σ_c|S_c|² = 1), the minimiser of
 * ½‖Ex − y‖² + λ‖Ψx‖₁ with Ψ an orthonormal transform restricted to the detail bands is
 * Wᴴ soft(W Eᴴy, λ) (Donoho 1995: soft-thresholding is the prox of the ℓ1 norm; the problem
 * separates per coefficient). Built here from the public transforms.
 */
function closedForm(backProjection: ComplexImage, lambdaAbs: number, wavelet: string, levels: number) {
  const c = dwt2(backProjection, wavelet, levels);
  softThresholdDetails(c.data, c.nx, c.ny, levels, lambdaAbs);
  return idwt2(c, wavelet, levels);
}

describe('cs-wavelet at full sampling: the soft-threshold closed form (Donoho 1995)', () => {
  const nx = 32;
  const ny = 32;

  it('single coil, default λ: the default rule gives λ = 0 at f = 1, so the data come back to 1e-12', () => {
    const image = randomComplexImage(nx, ny, 1);
    const out = reconstruct({ kspace: fft2c(image), mask: fullMask(nx, ny) }, { name: 'cs-wavelet' });
    expect(out.info.lambda).toBe(0);
    expect(out.info.lambdaRule).toBe('anatomy-default');
    expect(relativeError(out.image.data, image.data)).toBeLessThan(1e-12);
  });

  it('single coil, λ = 0.05, no shifts: Wᴴ soft(W x, λ_abs) to 1e-12 (FISTA with L = 1 reaches it in one step)', () => {
    const image = randomComplexImage(nx, ny, 2);
    const out = reconstruct(
      { kspace: fft2c(image), mask: fullMask(nx, ny) },
      { name: 'cs-wavelet', lambda: 0.05, wavelet: 'db2', levels: 3, shiftInvariance: 'none' },
    );
    const expected = closedForm(image, out.info.lambdaAbsolute as number, 'db2', 3);
    expect(maxAbsDifference(out.image.data, expected.data)).toBeLessThan(1e-12);
    // Step 2 repeats step 1 exactly: the iterate and the objective stop changing, and the stop says so.
    expect(out.info).toMatchObject({ converged: true, wavelet: 'db2', levels: 3, shiftInvariance: 'none' });
    expect(out.info.iterations as number).toBeLessThanOrEqual(3);
  });

  it('8 loop coils with Σ|S_c|² = 1 (EᴴE = I): the operator path gives the same closed form to 1e-10', () => {
    const n = 64;
    const mask = fullMask(n, n);
    const { truth, maps, kspace, operator } = loopCoilProblem(n, mask);
    const out = reconstruct(coilInput(mask, kspace, maps), {
      name: 'cs-wavelet',
      lambda: 0.01,
      shiftInvariance: 'none',
    });
    expect(String(out.info.solver)).toContain('multi-coil');
    // L = max Σ|S_c|² = 1 (to rounding) for normalised maps.
    expect(String(out.info.solver)).toContain('L = 1.000');
    const expected = closedForm(operator.adjoint(kspace), out.info.lambdaAbsolute as number, 'db4', 4);
    expect(relativeError(out.image.data, expected.data)).toBeLessThan(1e-10);
    // And that is near the truth: each detail coefficient moves by at most λ_abs (measured 0.0295).
    expect(relativeError(out.image.data, truth.data)).toBeLessThan(0.035);
    expect(out.info).toMatchObject({ coils: 8, maps: 'given', converged: true });
  });
});

// Measured with the anatomy-tuned default λ; the phantom rule 0.00025·(1/f − 1) it replaced gave 0.0933
// and 0.212 (piecewise-constant phantoms want a stronger λ than anatomy, docs/design.md §3.12).
const MEASURED = { poissonDisc: 0.1163, radial: 0.2359 };

describe('cs-wavelet undersampled, analytic k-space of the modified Shepp–Logan (default λ, db4, 4 levels, cycle spinning)', () => {
  it('single coil, 128², R = 4 Poisson-disc: beats zero-filled (measured NRMSE 0.116 against 0.446)', () => {
    // Sampling as tests/recon/cs-wavelet-solver.test.ts (ACS 12, seed 1, noiseless); default λ
    // 0.00011·(1/f − 1)^1.2 from the acquired fraction, tuned on anatomy, not on phantoms.
    const n = 128;
    const full = fullKspaceFromPhantom(getPhantom('shepp-logan-modified'), n, n, 'analytic');
    const reference = magnitude(full.reference);
    const sampled = generateMask(
      { nx: n, ny: n },
      { pattern: 'poisson-disc', acceleration: 4, acs: 12, seed: 1 },
    );
    const { kspace } = acquire(full, sampled.mask, undefined, 1);
    const zeroFilled = relativeError(magnitude(ifft2c(kspace)), reference);
    const out = reconstruct({ kspace, mask: sampled.mask }, { name: 'cs-wavelet', iterations: 150 });
    const error = relativeError(magnitude(out.image), reference);
    expect(zeroFilled).toBeGreaterThan(0.4);
    expect(error).toBeLessThan(MEASURED.poissonDisc * 1.15);
    expect(error).toBeLessThan(0.5 * zeroFilled);
    expect(out.info.shiftInvariance).toBe('cycle-spinning');
  });

  it('8 loop coils, 64², R = 4 random lines: beats the multi-coil zero-filled image (measured 0.242 against 0.612)', () => {
    const n = 64;
    const mask = lineMask(n, 'cartesian-random', 4, 0);
    const { truth, maps, kspace, operator } = loopCoilProblem(n, mask);
    const zeroFilled = magnitudeNrmse(operator.adjoint(kspace), truth);
    const out = reconstruct(coilInput(mask, kspace, maps), { name: 'cs-wavelet', iterations: 150 });
    const error = magnitudeNrmse(out.image, truth);
    expect(zeroFilled).toBeGreaterThan(0.55);
    expect(error).toBeLessThan(0.242 * 1.15);
    expect(error).toBeLessThan(0.5 * zeroFilled);
  });

  it('golden-angle radial R = 4, 64², through the NUFFT: beats gridding (measured 0.236 against 0.468)', async () => {
    const run = (method: MethodSpec) =>
      runReconstruction(
        {
          source: { phantom: 'shepp-logan-modified' },
          matrix: { nx: 64, ny: 64 },
          sampling: { pattern: 'radial', acceleration: 4, angles: 'golden' },
          method,
        },
        undefined,
      );
    const gridded = await run({ name: 'zero-filled' });
    const wavelet = await run({ name: 'cs-wavelet', iterations: 100 });
    expect(wavelet.metrics.nrmse).toBeLessThan(MEASURED.radial * 1.15);
    // 0.50× of gridding with the phantom rule's λ, 0.504× with the weaker anatomy default.
    expect(wavelet.metrics.nrmse).toBeLessThan(0.6 * gridded.metrics.nrmse);
    expect(String(wavelet.info.solver)).toContain('NUFFT');
  });
});

describe('cs-wavelet parameters (typed errors naming the field)', () => {
  const image = randomComplexImage(24, 24, 3);
  const input = { kspace: fft2c(image), mask: fullMask(24, 24) };
  const refused = (spec: Record<string, unknown>, field: string) => {
    try {
      reconstruct(input, { name: 'cs-wavelet', ...spec } as MethodSpec);
    } catch (error) {
      expect(error).toBeInstanceOf(ValidationError);
      expect((error as ValidationError).problems.map((p) => p.field)).toContain(field);
      return;
    }
    throw new Error(`expected a ValidationError on ${field}`);
  };

  it('levels beyond what the matrix allows (24 = 8·3: at most 3) → method.levels; the default drops to 3', () => {
    refused({ levels: 4 }, 'method.levels');
    expect(reconstruct(input, { name: 'cs-wavelet', iterations: 2 }).info.levels).toBe(3);
  });

  it('cycle spinning with a TV term → method.shiftInvariance; with TV the default is no shifts', () => {
    refused({ tvLambda: 0.01, shiftInvariance: 'cycle-spinning' }, 'method.shiftInvariance');
    const out = reconstruct(input, { name: 'cs-wavelet', tvLambda: 0.01, iterations: 2 });
    expect(out.info.shiftInvariance).toBe('none');
    expect(String(out.info.solver)).toContain('Chambolle–Pock');
  });

  it('λ out of range → method.lambda, method.tvLambda', () => {
    refused({ lambda: -1 }, 'method.lambda');
    refused({ tvLambda: 11 }, 'method.tvLambda');
  });

  // The documented anatomy rule (docs/design.md §3.12) worked by hand: f = ¼ → 0.00011·3^1.2 =
  // 0.00011·3.73719 = 0.000411091; f = 1/8 → 0.00011·7^1.2 = 0.00011·10.3304 = 0.00113634; f = 0.001 →
  // 0.00011·999^1.2 ≈ 0.447, capped at 0.02.
  it('the default λ rule: 0 at full sampling, 0.000411 at f = ¼, 0.00114 at f = ⅛, capped at 0.02', () => {
    expect(defaultCsWaveletLambda(1)).toBe(0);
    expect(defaultCsWaveletLambda(0.25)).toBeCloseTo(0.000411091, 8);
    expect(defaultCsWaveletLambda(0.125)).toBeCloseTo(0.00113634, 7);
    expect(defaultCsWaveletLambda(0.001)).toBe(0.02);
  });
});
