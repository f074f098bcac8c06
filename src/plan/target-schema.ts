import { z } from 'zod';
import { higherIsBetter, metricNames } from './metric-direction.ts';
import { taskMetricNames, taskMetrics } from './task-metrics.ts';

/**
 * The noise-amplification target: a row's largest g over the object (mean over seeds); a row
 * without a g-factor does not meet it.
 */
export const G_FACTOR_MAX = 'gFactorMax';

/**
 * What a target may name: an image-quality metric, a task score (src/plan/task-metrics.ts) or the
 * largest g-factor.
 */
export const targetMetricNames = [...metricNames, ...taskMetricNames, G_FACTOR_MAX] as const;
export type TargetMetric = (typeof targetMetricNames)[number];

/** Whether higher values of a target's metric are better. */
export function targetHigherIsBetter(metric: TargetMetric): boolean {
  if (metric === G_FACTOR_MAX) return false;
  return metric in taskMetrics
    ? taskMetrics[metric as keyof typeof taskMetrics].higherIsBetter
    : higherIsBetter[metric as keyof typeof higherIsBetter];
}

/**
 * The image-quality target of a plan: `{ metric, atLeast }` for higher-is-better metrics (ssim,
 * psnr) or `{ metric, atMost }` for lower-is-better ones (nrmse, hfen). Exactly one bound.
 */
export const targetSchema = z
  .strictObject({
    metric: z
      .enum(targetMetricNames)
      .describe(
        'metric the recommendation and the Pareto front use; task scores need the plan to have lesions',
      ),
    atLeast: z
      .number()
      .optional()
      .describe(
        'lowest acceptable mean value (ssim, psnr, contrastRecovery, detectability, resolvedFraction)',
      ),
    atMost: z
      .number()
      .optional()
      .describe('highest acceptable mean value (nrmse, hfen, falseLesions, gFactorMax)'),
  })
  .superRefine((t, ctx) => {
    if (!targetMetricNames.includes(t.metric)) return; // already reported; zod refines invalid data too
    const wanted = targetHigherIsBetter(t.metric) ? 'atLeast' : 'atMost';
    const other = wanted === 'atLeast' ? 'atMost' : 'atLeast';
    if (t[other] !== undefined) {
      ctx.addIssue({
        code: 'custom',
        path: [other],
        message: `${t.metric} is ${wanted === 'atLeast' ? 'higher' : 'lower'}-is-better: give ${wanted}`,
        params: { allowed: `${wanted} for ${t.metric}` },
      });
    } else if (t.metric === G_FACTOR_MAX && t.atMost !== undefined && t.atMost < 1) {
      ctx.addIssue({
        code: 'custom',
        path: ['atMost'],
        message: `g ≥ 1 by definition: a bound of ${t.atMost} can never be met`,
        params: { allowed: 'atMost ≥ 1 for gFactorMax' },
      });
    } else if (t[wanted] === undefined) {
      ctx.addIssue({
        code: 'custom',
        path: [wanted],
        message: `a ${t.metric} target needs ${wanted}`,
        params: { allowed: `a number (${wanted} for ${t.metric})` },
      });
    }
  })
  .describe('Image-quality target, e.g. { "metric": "ssim", "atLeast": 0.95 }');

export type Target = z.output<typeof targetSchema>;

/** The bound of a validated target and whether values must lie above it. */
export function targetBound(target: Target): { threshold: number; atLeast: boolean } {
  return target.atLeast !== undefined
    ? { threshold: target.atLeast, atLeast: true }
    : { threshold: target.atMost as number, atLeast: false };
}
