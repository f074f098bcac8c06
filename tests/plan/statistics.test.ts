import { describe, expect, it } from 'vitest';
import { mean, sampleStandardDeviation, summarize } from '../../src/plan/statistics.ts';

describe('summaries over seeds', () => {
  it('sample standard deviation uses n − 1 (textbook data 2,4,4,4,5,5,7,9: population SD 2, sample √(32/7); from memory)', () => {
    const xs = [2, 4, 4, 4, 5, 5, 7, 9];
    expect(mean(xs)).toBe(5);
    expect(sampleStandardDeviation(xs)).toBeCloseTo(Math.sqrt(32 / 7), 14);
  });

  it('one seed has standard deviation 0 (common practice: no spread from a single draw)', () => {
    expect(summarize([0.42])).toEqual({ mean: 0.42, sd: 0 });
  });

  it('equal values give exactly that mean (a naive Σ/n turns 3 × 0.1 into 0.10000000000000002)', () => {
    expect((0.1 + 0.1 + 0.1) / 3).not.toBe(0.1);
    expect(summarize([0.1, 0.1, 0.1])).toEqual({ mean: 0.1, sd: 0 });
  });

  it('+∞ (null, e.g. PSNR of an exact reconstruction) gives an infinite mean and no spread', () => {
    expect(summarize([null, null])).toEqual({ mean: null, sd: null });
    expect(summarize([40, null])).toEqual({ mean: null, sd: null });
  });

  it('rejects an empty list', () => {
    expect(() => summarize([])).toThrow(RangeError);
  });
});
