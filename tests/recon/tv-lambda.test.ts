import { describe, expect, it } from 'vitest';
import { generateMask } from '../../sampling/index.ts';
import { acquire } from '../../src/acquisition/acquire.ts';
import { fullKspaceFromPhantom } from '../../src/acquisition/phantom-source.ts';
import { ifft2c } from '../../src/core/centered-fft.ts';
import { defaultLimits } from '../../src/core/limits.ts';
import { getPhantom } from '../../src/phantoms/index.ts';
import { pinnedReconstruction } from '../../src/pipeline/pinned-method.ts';
import { reconstruct } from '../../src/recon/index.ts';
import { defaultTvLambda } from '../../src/recon/parameters.ts';
import { cartesianResidual, dataNoiseEnergy, discrepancySearch } from '../../src/recon/tv-lambda.ts';
import { relativeError } from '../error-measures.ts';
import { fullMask } from './helpers.ts';

describe('discrepancy search (Morozov 1966, docs/references.md §5.9)', () => {
  it('finds the root of a monotone residual worked by hand: r(λ) = 3λ², target 0.12 → λ = 0.2', () => {
    // 3λ² = 0.12 ⇔ λ = √0.04 = 0.2, from either side of the start.
    for (const start of [0.001, 5]) {
      const found = discrepancySearch((lambda) => 3 * lambda * lambda, 0.12, start);
      expect(found.lambda).toBeGreaterThan(0.2 * 0.97);
      expect(found.lambda).toBeLessThan(0.2 * 1.03);
      expect(found.trials).toBeLessThanOrEqual(11);
    }
  });

  it('returns the ceiling when no λ reaches the target (a residual bounded below it)', () => {
    const found = discrepancySearch((lambda) => 1 - 1 / (1 + lambda), 2, 0.01);
    expect(found.residual).toBeLessThan(2);
    expect(found.lambda).toBeGreaterThan(1);
  });
});

describe('cs-tv λ rules: explicit, discrepancy (σ > 0), anatomy default (σ = 0)', () => {
  const n = 64;
  const full = fullKspaceFromPhantom(getPhantom('shepp-logan-modified'), n, n, 'analytic');
  const reference = full.reference.data;

  it('noisy, fully sampled: the discrepancy λ brings the residual to 2σ²·N and the error below the noisy input', () => {
    // With every sample acquired cs-tv is ROF denoising (Rudin, Osher & Fatemi 1992); choosing its
    // weight so that ‖x − y‖² = E‖n‖² (the discrepancy principle) removes part of the noise.
    const mask = fullMask(n, n);
    const { kspace, sigma } = acquire(full, mask, { snr: 8 }, 5);
    const input = { kspace, mask, noiseSigma: sigma };
    expect(dataNoiseEnergy(input)).toBeCloseTo(2 * sigma * sigma * n * n, 10);
    const out = reconstruct(input, { name: 'cs-tv' }, { limits: defaultLimits });
    expect(out.info.lambdaRule).toBe('discrepancy');
    const noisy = ifft2c(kspace);
    const before = relativeError(noisy.data, reference);
    const after = relativeError(out.image.data, reference);
    // Measured at 64², SNR 8: 0.218 → 0.148 (λ 0.029, 10 trial solves).
    expect(after).toBeLessThan(0.75 * before);
    // The full run keeps the residual near the target the trial solves aimed at.
    const target = 2 * sigma * sigma * n * n;
    const residual = cartesianResidual(input, out.image);
    // Measured ratio 1.0005.
    expect(residual / target).toBeGreaterThan(0.9);
    expect(residual / target).toBeLessThan(1.1);
  });

  it('an explicit λ wins over the noise; σ = 0 uses the anatomy default of the acquired fraction', () => {
    const { mask, fraction } = generateMask(
      { nx: n, ny: n },
      { pattern: 'poisson-disc', acceleration: 4, seed: 3 },
    );
    const { kspace, sigma } = acquire(full, mask, { snr: 20 }, 6);
    const explicit = reconstruct(
      { kspace, mask, noiseSigma: sigma },
      { name: 'cs-tv', lambda: 0.0123, iterations: 5 },
      { limits: defaultLimits },
    );
    expect(explicit.info.lambda).toBe(0.0123);
    expect(explicit.info.lambdaRule).toBe('explicit');
    const noiseless = acquire(full, mask, undefined, 6).kspace;
    const plain = reconstruct(
      { kspace: noiseless, mask },
      { name: 'cs-tv', iterations: 5 },
      { limits: defaultLimits },
    );
    expect(plain.info.lambdaRule).toBe('anatomy-default');
    expect(plain.info.lambda).toBe(defaultTvLambda(fraction));
    expect(plain.info.lambda as number).toBeGreaterThan(0);
  });

  it('undersampled: high SNR keeps the anatomy default after one trial; low SNR raises λ above it and lowers the error', () => {
    const { mask, fraction } = generateMask(
      { nx: n, ny: n },
      { pattern: 'cartesian-random', acceleration: 4, acs: 8, seed: 2 },
    );
    const run = (snr: number, lambda?: number) => {
      const { kspace, sigma } = acquire(full, mask, { snr }, 9);
      const spec = lambda === undefined ? { name: 'cs-tv' as const } : { name: 'cs-tv' as const, lambda };
      return reconstruct({ kspace, mask, noiseSigma: sigma }, spec, { limits: defaultLimits });
    };
    // High SNR: the residual of the default already exceeds 2σ²m (aliasing, not noise), and the
    // residual grows with λ, so the discrepancy λ lies below the default: the default is kept.
    const high = run(200);
    expect(high.info.lambdaRule).toBe('anatomy-default');
    expect(high.info.lambda).toBe(defaultTvLambda(fraction));
    const check = high.info.discrepancy as { target: number; residual: number; trials: number };
    expect(check.trials).toBe(1);
    expect(check.residual).toBeGreaterThanOrEqual(check.target);
    // Low SNR: the noise asks for more than the default.
    const low = run(4);
    expect(low.info.lambdaRule).toBe('discrepancy');
    expect(low.info.lambda as number).toBeGreaterThan(defaultTvLambda(fraction));
    const atDefault = run(4, defaultTvLambda(fraction));
    const errorLow = relativeError(low.image.data, reference);
    const errorDefault = relativeError(atDefault.image.data, reference);
    // Measured at 64², lines R 4, SNR 4: λ 0.063, error 0.425 against 0.462 at the default.
    expect(errorLow).toBeLessThan(errorDefault);
  });

  it('paired runs and replicas reuse the base λ: the pinned run reproduces a discrepancy-chosen base run', () => {
    const { mask } = generateMask(
      { nx: n, ny: n },
      { pattern: 'cartesian-random', acceleration: 3, acs: 8, seed: 2 },
    );
    const { kspace, sigma } = acquire(full, mask, { snr: 15 }, 8);
    const input = { kspace, mask, noiseSigma: sigma };
    const spec = { name: 'cs-tv' as const, iterations: 60 };
    const base = reconstruct(input, spec, { limits: defaultLimits });
    expect(base.info.lambdaRule).toBe('discrepancy');
    const pinned = pinnedReconstruction(spec, base.info, { limits: defaultLimits });
    // Were the discrepancy search run again (on other data it would pick another λ) the images
    // would differ by far more than rounding.
    expect(relativeError(pinned.reconstruct(input).data, base.image.data)).toBeLessThan(1e-12);
  });
});
