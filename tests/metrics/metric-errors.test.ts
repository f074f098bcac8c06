import { describe, expect, it } from 'vitest';
import { ValidationError } from '../../src/core/errors.ts';
import type { RealImage } from '../../src/core/real-image.ts';
import { hfen, nrmse, psnr, scoreAll, ssim } from '../../src/metrics/index.ts';

// Bad input must come back as a ValidationError naming the argument (DEVELOPERS.md conventions).
function fieldOf(run: () => unknown): string | undefined {
  try {
    run();
  } catch (error) {
    if (error instanceof ValidationError) return error.problems[0].field;
    throw error;
  }
  return undefined;
}

function ramp(nx: number, ny: number): RealImage {
  return { nx, ny, data: Float64Array.from({ length: nx * ny }, (_, i) => 1 + (i % 7) + Math.floor(i / nx)) };
}

const metrics = {
  nrmse: (e: RealImage, r: RealImage, m?: Uint8Array) => nrmse(e, r, m),
  psnr: (e: RealImage, r: RealImage, m?: Uint8Array) => psnr(e, r, m),
  ssim: (e: RealImage, r: RealImage, m?: Uint8Array) => ssim(e, r, { mask: m }),
  hfen: (e: RealImage, r: RealImage, m?: Uint8Array) => hfen(e, r, m),
  scoreAll: (e: RealImage, r: RealImage, m?: Uint8Array) => scoreAll(e, r, m),
};

describe('metric input errors', () => {
  const reference = ramp(16, 12);
  for (const [name, metric] of Object.entries(metrics)) {
    it(`${name}: size mismatch names estimate`, () => {
      expect(fieldOf(() => metric(ramp(12, 16), reference))).toBe('estimate');
    });
    it(`${name}: mask of the wrong length names mask`, () => {
      expect(fieldOf(() => metric(reference, reference, new Uint8Array(16 * 12 - 1)))).toBe('mask');
    });
    it(`${name}: an empty mask names mask`, () => {
      expect(fieldOf(() => metric(reference, reference, new Uint8Array(16 * 12)))).toBe('mask');
    });
    it(`${name}: a NaN pixel names estimate.data`, () => {
      const bad = { nx: 16, ny: 12, data: reference.data.slice() };
      bad.data[40] = Number.NaN;
      expect(fieldOf(() => metric(bad, reference))).toBe('estimate.data');
    });
    it(`${name}: data shorter than nx·ny names reference.data`, () => {
      const short = { nx: 16, ny: 12, data: new Float64Array(100) };
      expect(fieldOf(() => metric(short, short))).toBe('reference.data');
    });
  }

  it('ssim: non-finite or non-positive dataRange names dataRange', () => {
    for (const dataRange of [Number.NaN, Number.POSITIVE_INFINITY, 0, -1]) {
      expect(fieldOf(() => ssim(reference, reference, { dataRange }))).toBe('dataRange');
    }
  });

  it('ssim: a constant reference without dataRange names reference (L would be 0)', () => {
    const flat = { nx: 12, ny: 12, data: new Float64Array(144).fill(2) };
    expect(fieldOf(() => ssim(flat, flat))).toBe('reference');
  });

  it('ssim: images smaller than the 11×11 window name reference', () => {
    expect(fieldOf(() => ssim(ramp(10, 20), ramp(10, 20)))).toBe('reference');
  });

  it('ssim: a mask that selects only border pixels (no full window) names mask', () => {
    const mask = new Uint8Array(16 * 12);
    mask[0] = 1;
    mask[16 * 12 - 1] = 1;
    expect(fieldOf(() => ssim(reference, reference, { mask }))).toBe('mask');
  });

  it('nrmse, psnr, hfen: an all-zero reference names reference', () => {
    const zero = { nx: 16, ny: 12, data: new Float64Array(192) };
    expect(fieldOf(() => nrmse(reference, zero))).toBe('reference');
    expect(fieldOf(() => psnr(reference, zero))).toBe('reference');
    expect(fieldOf(() => hfen(reference, zero))).toBe('reference');
  });

  it('well-formed input is scored (the checks above are not blanket refusals)', () => {
    const estimate = { nx: 16, ny: 12, data: reference.data.map((v, i) => v + (i % 3) * 0.1) };
    const m = scoreAll(estimate, reference);
    for (const value of Object.values(m)) expect(Number.isFinite(value)).toBe(true);
    expect(m.ssim).toBeLessThan(1);
  });
});
