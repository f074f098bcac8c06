import { describe, expect, it } from 'vitest';
import { parseOrThrow } from '../../src/core/zod-problems.ts';
import { targetSchema } from '../../src/plan/target-schema.ts';
import { caughtValidationError } from '../core/caught-validation-error.ts';

function problem(value: unknown) {
  return caughtValidationError(() => parseOrThrow(targetSchema, value, 'target')).problems[0];
}

// Metric directions per docs/design.md §3.6: SSIM and PSNR higher is better, NRMSE and HFEN lower is better.
describe('plan target', () => {
  it('accepts { ssim, atLeast } and { nrmse, atMost }', () => {
    expect(parseOrThrow(targetSchema, { metric: 'ssim', atLeast: 0.95 }, 'target')).toEqual({
      metric: 'ssim',
      atLeast: 0.95,
    });
    expect(parseOrThrow(targetSchema, { metric: 'nrmse', atMost: 0.1 }, 'target').atMost).toBe(0.1);
  });

  it('refuses a bound against the metric direction, naming the field', () => {
    expect(problem({ metric: 'ssim', atMost: 0.9 })).toMatchObject({
      field: 'target.atMost',
      allowed: 'atLeast for ssim',
    });
    expect(problem({ metric: 'hfen', atLeast: 0.2 })).toMatchObject({ field: 'target.atLeast' });
  });

  it('needs the bound and a known metric', () => {
    expect(problem({ metric: 'psnr' })).toMatchObject({ field: 'target.atLeast' });
    expect(problem({ metric: 'mse', atMost: 1 })).toMatchObject({
      field: 'target.metric',
      // The contract adds the task scores a plan with lesions can target, and the largest g-factor.
      allowed:
        'one of "nrmse", "psnr", "ssim", "hfen", "contrastRecovery", "falseLesions", "detectability", "resolvedFraction", "gFactorMax"',
    });
  });
});
