import { describe, expect, it } from 'vitest';
import { generateMask } from '../../sampling/index.ts';
import { ifft2c } from '../../src/core/centered-fft.ts';
import { type ComplexImage, createComplexImage } from '../../src/core/complex-image.ts';
import { SeededRandom } from '../../src/core/random.ts';
import {
  discOffsets,
  lesionCnr,
  npwDetectability,
  observerOutput,
  replicaVariance,
  roseResolved,
  zeroFilledVariance,
} from '../../src/fidelity/index.ts';

const n = 32;

/** A flat disc of diameter 5 px centred on pixel (16, 16): 21 pixel centres with r ≤ 2.5. */
function discSignal(contrast: number): ComplexImage {
  const s = createComplexImage(n, n);
  const offsets = discOffsets(5);
  for (let k = 0; k < offsets.length; k += 2)
    s.data[2 * ((16 + offsets[k]) * n + 16 + offsets[k + 1])] = contrast;
  return s;
}

function whiteNoise(sigma: number, rng: SeededRandom): ComplexImage {
  const x = createComplexImage(n, n);
  for (let i = 0; i < x.data.length; i++) x.data[i] = sigma * rng.normal();
  return x;
}

describe('detectability of a known signal', () => {
  it('a 5-px disc centred on a pixel covers 21 pixel centres (r ≤ 2.5, counted by hand)', () => {
    expect(discOffsets(5).length / 2).toBe(21);
  });

  it("non-prewhitening matched filter in white noise: d' from 2000 replicas equals ‖s‖/σ = 0.05·√21/0.01 = 22.9129 within 3 Monte-Carlo standard errors", () => {
    // Barrett & Myers 2004, ch. 13–14 (from memory): d'² = (sᵀs)²/(sᵀKs); K = σ²I gives ‖s‖/σ.
    const s = discSignal(0.05);
    const sigma = 0.01;
    const replicas = 2000;
    const rng = new SeededRandom(42);
    const noise = Array.from({ length: replicas }, () => whiteNoise(sigma, rng));
    const energy = observerOutput(s, s);
    expect(Math.abs(energy - 0.05 ** 2 * 21)).toBeLessThan(1e-15);
    const d = npwDetectability(energy, replicaVariance(s, noise));
    // The sample variance of M replicas has relative SE √(2/(M − 1)), so d' ∝ 1/√variance has
    // ≈ 1/√(2(M − 1)) = 1.58 % at M = 2000, i.e. 0.362 in d'. Measured d' = 23.19 (+1.2 %, 0.8 SE).
    const expected = (0.05 * Math.sqrt(21)) / 0.01;
    expect(expected).toBeCloseTo(22.9129, 4);
    const standardError = expected / Math.sqrt(2 * (replicas - 1));
    expect(Math.abs(d - expected)).toBeLessThan(3 * standardError);
  });

  it('Rose criterion, worked example: the 21-pixel disc at σ = 0.01 has CNR = c·√21/σ, resolved at c = 0.02 (9.17 ≥ 5), not at c = 0.01 (4.58 < 5)', () => {
    // Rose 1948 (k = 5, the usual citation, from memory). Noise of the disc sum: the known-σ path
    // with a full mask, σ²·‖F w‖² = σ²·21 (Parseval).
    const full = new Uint8Array(n * n).fill(1);
    const w = discSignal(1);
    const variance = zeroFilledVariance(w, full, 0.01);
    expect(Math.abs(variance - 0.01 ** 2 * 21)).toBeLessThan(1e-15);
    const strong = lesionCnr(0.02 * 21, variance, 0.02);
    const weak = lesionCnr(0.01 * 21, variance, 0.01);
    expect(strong).toBeCloseTo(9.16515, 4);
    expect(weak).toBeCloseTo(4.58258, 4);
    expect(roseResolved(strong)).toBe(true);
    expect(roseResolved(weak)).toBe(false);
    // A dark lesion reconstructed dark is resolved too; one reconstructed bright is not.
    expect(roseResolved(lesionCnr(-0.02 * 21, variance, -0.02))).toBe(true);
    expect(roseResolved(lesionCnr(0.02 * 21, variance, -0.02))).toBe(false);
  });

  it('zero-filled: the known-σ variance σ²‖M F w‖² equals the replica variance on a random-lines mask within Monte-Carlo error', () => {
    const sampled = generateMask(
      { nx: n, ny: n },
      { pattern: 'cartesian-random', acceleration: 3, acs: 6, seed: 5 },
    );
    const sigma = 0.02;
    const w = discSignal(1);
    const exact = zeroFilledVariance(w, sampled.mask, sigma);
    const rng = new SeededRandom(9);
    const replicas = 1000;
    const images: ComplexImage[] = [];
    for (let m = 0; m < replicas; m++) {
      const k = whiteNoise(sigma, rng);
      for (let i = 0; i < sampled.mask.length; i++) {
        if (sampled.mask[i]) continue;
        k.data[2 * i] = 0;
        k.data[2 * i + 1] = 0;
      }
      images.push(ifft2c(k));
    }
    const estimated = replicaVariance(w, images);
    // Relative SE of a sample variance √(2/(M − 1)) = 4.5 % at M = 1000; measured ratio 0.950 (1.1 SE).
    expect(Math.abs(estimated / exact - 1)).toBeLessThan(3 * Math.sqrt(2 / (replicas - 1)));
    // The disc's energy sits at low frequencies, which the 6 ACS rows keep: its noise variance is
    // 0.83 of the fully sampled σ²·21, far above the acquired fraction 0.34 that white image noise
    // scaled by the sampled fraction would give (measured).
    let fraction = 0;
    for (const v of sampled.mask) fraction += v;
    fraction /= sampled.mask.length;
    expect(exact).toBeLessThan(sigma ** 2 * 21);
    expect(exact).toBeGreaterThan(sigma ** 2 * 21 * fraction);
  });
});
