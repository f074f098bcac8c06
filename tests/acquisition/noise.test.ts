import { describe, expect, it } from 'vitest';
import { acquire } from '../../src/acquisition/acquire.ts';
import { fullKspaceFromImage } from '../../src/acquisition/image-source.ts';
import {
  meanObjectMagnitude,
  noiseSchema,
  OBJECT_THRESHOLD,
  objectMaskOf,
} from '../../src/acquisition/noise.ts';
import { magnitude } from '../../src/core/complex-image.ts';
import { ValidationError } from '../../src/core/errors.ts';
import type { RealImage } from '../../src/core/real-image.ts';
import { reconstruct } from '../../src/recon/index.ts';
import { riceMean, riceSquaredError } from './rician.ts';

// Sources: the noise model written down in DEVELOPERS.md and docs/design.md §3.5 (σ per real channel = mean
// |reference| over the object ÷ SNR, object = |reference| > 0.1·max; σ the same in k-space and image
// since the FFT is unitary, docs/references.md §7; noise drawn per k-space point from the request seed),
// Rician moments (Gudbjartsson & Patz 1995, docs/references.md §7), and the typed-error rule of docs/design.md §4.1.

/** A piecewise-constant test object on a zero background: disc of 1.0 holding a 0.3 square. */
function testObject(n: number): RealImage {
  const data = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const r = Math.hypot(i - n / 2, j - n / 2);
      if (r < 0.4 * n) data[i * n + j] = 1;
      if (Math.abs(i - n / 2) < 0.1 * n && Math.abs(j - 0.45 * n) < 0.15 * n) data[i * n + j] = 0.3;
    }
  }
  return { nx: n, ny: n, data };
}

const full128 = new Uint8Array(128 * 128).fill(1);

describe('Rician moments used as the noise prediction', () => {
  it('E|A + n|/σ matches the tabulated values (docs/references.md §7 [C])', () => {
    const table: [number, number][] = [
      [0, 1.25331],
      [1, 1.54857],
      [2, 2.27238],
      [3, 3.17258],
      [5, 5.10107],
      [10, 10.05013],
    ];
    // The table is rounded to 1e-5 (±5e-6) and the A&S 9.8 approximations add ≲ 2e-7 relative.
    for (const [a, expected] of table) {
      expect(Math.abs(riceMean(a, 1) - expected)).toBeLessThanOrEqual(5e-6 + 2e-7 * expected);
    }
    // A = 0 is the Rayleigh mean σ√(π/2) exactly (docs/references.md §7).
    expect(riceMean(0, 0.7)).toBeCloseTo(0.7 * Math.sqrt(Math.PI / 2), 15);
  });
});

describe('simulated acquisition', () => {
  const object = testObject(128);
  const full = fullKspaceFromImage(object);

  it(`finds the object as |reference| > ${OBJECT_THRESHOLD} of its maximum`, () => {
    const mask = objectMaskOf(full.reference);
    let inside = 0;
    for (let i = 0; i < mask.length; i++) {
      expect(mask[i]).toBe(object.data[i] > 0.1 ? 1 : 0);
      inside += mask[i];
    }
    expect(inside).toBeGreaterThan(0);
    expect(full.objectMask).toEqual(mask);
    expect(full.inverseCrime).toBe(true);
  });

  it('noiseless: y = M ⊙ y_full exactly, σ = 0', () => {
    const mask = new Uint8Array(128 * 128);
    for (let i = 0; i < mask.length; i += 3) mask[i] = 1;
    for (const noise of [undefined, { snr: 'none' as const }]) {
      const { kspace, sigma } = acquire(full, mask, noise, 1);
      expect(sigma).toBe(0);
      for (let i = 0; i < mask.length; i++) {
        expect(kspace.data[2 * i]).toBe(mask[i] ? full.kspace.data[2 * i] : 0);
        expect(kspace.data[2 * i + 1]).toBe(mask[i] ? full.kspace.data[2 * i + 1] : 0);
      }
    }
  });

  it('σ = mean_object |x| / SNR, and the per-channel std of the added noise is σ (orthonormal FFT keeps σ)', () => {
    const snr = 25;
    const { kspace, sigma } = acquire(full, full128, { snr }, 3);
    expect(sigma).toBeCloseTo(meanObjectMagnitude(full.reference, full.objectMask) / snr, 15);
    // Image-domain noise: reconstruct (zero-filled = F_cᴴ) and subtract the reference.
    const image = reconstruct({ kspace, mask: full128 }, { name: 'zero-filled' }).image;
    let s2 = 0;
    for (let i = 0; i < image.data.length; i++) s2 += (image.data[i] - full.reference.data[i]) ** 2;
    const measured = Math.sqrt(s2 / image.data.length);
    // 32768 real samples: the std estimate has relative spread ≈ 1/√(2·32768) ≈ 0.4 %.
    expect(Math.abs(measured / sigma - 1)).toBeLessThan(0.02);
    // The measured image SNR (mean object magnitude of the reference over the noise std).
    expect(Math.abs(meanObjectMagnitude(full.reference, full.objectMask) / measured / snr - 1)).toBeLessThan(
      0.02,
    );
  });

  it('fully sampled noisy image: NRMSE of the magnitude matches the Rician prediction (Gudbjartsson & Patz 1995)', () => {
    // Prediction: E‖|x + n| − |x|‖² = Σ_p [2A_p² + 2σ² − 2A_p E|A_p + n|], A_p = |x_p| — at high SNR
    // σ² per object pixel, 2σ² per background pixel (Rayleigh). The complex error instead is
    // exactly ‖n‖² ≈ 2σ²N, i.e. NRMSE_complex ≈ σ√2 / rms(x) over all N pixels.
    for (const [snr, seed] of [
      [10, 1],
      [40, 2],
    ]) {
      const { kspace, sigma } = acquire(full, full128, { snr }, seed);
      const image = reconstruct({ kspace, mask: full128 }, { name: 'zero-filled' }).image;
      const noisyMag = magnitude(image);
      const refMag = magnitude(full.reference);
      let err = 0;
      let ref = 0;
      let predicted = 0;
      let complexErr = 0;
      for (let i = 0; i < refMag.length; i++) {
        err += (noisyMag[i] - refMag[i]) ** 2;
        ref += refMag[i] ** 2;
        predicted += riceSquaredError(refMag[i], sigma);
        complexErr += (image.data[2 * i] - full.reference.data[2 * i]) ** 2;
        complexErr += (image.data[2 * i + 1] - full.reference.data[2 * i + 1]) ** 2;
      }
      const nrmse = Math.sqrt(err / ref);
      const prediction = Math.sqrt(predicted / ref);
      // Relative spread of the sum over 16384 pixels ≈ 1 %; tolerance 3 %.
      expect(Math.abs(nrmse / prediction - 1)).toBeLessThan(0.03);
      const rms = Math.sqrt(ref / refMag.length);
      expect(Math.abs(Math.sqrt(complexErr / ref) / ((sigma * Math.SQRT2) / rms) - 1)).toBeLessThan(0.02);
      // The magnitude error is smaller than the complex one (the phase part is discarded on the object).
      expect(nrmse).toBeLessThan(Math.sqrt(complexErr / ref));
    }
  });

  it('is seeded: same seed same bytes, other seed other noise; noise at a k-space point does not depend on the mask', () => {
    const a = acquire(full, full128, { snr: 30 }, 5).kspace.data;
    const b = acquire(full, full128, { snr: 30 }, 5).kspace.data;
    const c = acquire(full, full128, { snr: 30 }, 6).kspace.data;
    expect(Buffer.from(a.buffer).equals(Buffer.from(b.buffer))).toBe(true);
    expect(Buffer.from(a.buffer).equals(Buffer.from(c.buffer))).toBe(false);
    const half = new Uint8Array(128 * 128);
    for (let i = 0; i < half.length; i += 2) half[i] = 1;
    const d = acquire(full, half, { snr: 30 }, 5).kspace.data;
    for (let i = 0; i < half.length; i += 2) {
      expect(d[2 * i]).toBe(a[2 * i]);
      expect(d[2 * i + 1]).toBe(a[2 * i + 1]);
    }
  });

  it("rejects an SNR outside 0.1…1e6 or not 'none' with a ValidationError on noise.snr", () => {
    for (const snr of [0, -5, 1e-300, 0.09, Number.NaN, Number.POSITIVE_INFINITY, 'loud']) {
      try {
        acquire(full, full128, { snr } as never, 1);
        throw new Error('expected a ValidationError');
      } catch (error) {
        expect(error).toBeInstanceOf(ValidationError);
        expect((error as ValidationError).problems[0]).toMatchObject({
          field: 'noise.snr',
          allowed: "0.1 ≤ snr ≤ 1000000 | 'none'",
        });
      }
    }
    expect(noiseSchema.safeParse({ snr: 0 }).success).toBe(false);
    expect(noiseSchema.safeParse({ snr: 1e-300 }).success).toBe(false);
    expect(noiseSchema.safeParse({ snr: 0.1 }).success).toBe(true);
    expect(noiseSchema.safeParse({ snr: 'none' }).success).toBe(true);
    expect(noiseSchema.safeParse({ snr: 12.5 }).success).toBe(true);
  });

  it('rejects a mask of the wrong size', () => {
    expect(() => acquire(full, new Uint8Array(10), undefined, 1)).toThrow(ValidationError);
  });
});
