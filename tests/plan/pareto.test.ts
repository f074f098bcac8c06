import { describe, expect, it } from 'vitest';
import { paretoFront } from '../../src/plan/pareto.ts';

// Pareto dominance (common practice, multi-objective optimisation): a point is on the front when no
// other point is at least as good in both objectives and strictly better in one.
describe('Pareto front of scan time versus a metric', () => {
  const points = [
    { scanSeconds: 128, value: 1 }, // fully sampled: longest, best
    { scanSeconds: 64, value: 0.95 },
    { scanSeconds: 64, value: 0.9 }, // same time, worse → dominated
    { scanSeconds: 32, value: 0.91 },
    { scanSeconds: 32, value: 0.7 }, // dominated
    { scanSeconds: 40, value: 0.9 }, // longer and worse than (32, 0.91) → dominated
  ];

  it('higher-is-better metric (SSIM): keeps the non-dominated rows', () => {
    expect(paretoFront(points, 'ssim')).toEqual([true, true, false, true, false, false]);
  });

  it('lower-is-better metric (NRMSE): the direction flips', () => {
    const errors = [
      { scanSeconds: 128, value: 0 },
      { scanSeconds: 64, value: 0.05 },
      { scanSeconds: 64, value: 0.1 },
      { scanSeconds: 32, value: 0.2 },
    ];
    expect(paretoFront(errors, 'nrmse')).toEqual([true, true, false, true]);
  });

  it('equal points are both on the front; +∞ (null) PSNR counts as best', () => {
    const same = [
      { scanSeconds: 10, value: 30 },
      { scanSeconds: 10, value: 30 },
      { scanSeconds: 20, value: null },
      { scanSeconds: 20, value: 35 },
    ];
    expect(paretoFront(same, 'psnr')).toEqual([true, true, true, false]);
  });
});
