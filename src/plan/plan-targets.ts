import { z } from 'zod';
import { type MetricName, metricNames } from './metric-direction.ts';
import type { PlanRow } from './plan-table.ts';
import { type Target, targetSchema } from './target-schema.ts';

/** A noise-amplification target: the row's largest g over the object (mean over seeds) at most this. */
export const gFactorTargetSchema = z
  .strictObject({
    metric: z.literal('gFactorMax'),
    atMost: z.number().min(1).describe('largest acceptable g (g ≥ 1 by definition)'),
  })
  .describe('{ "metric": "gFactorMax", "atMost": 1.5 }: rows without a g-factor do not meet it');

/** Task scores of lesion studies: their names are reserved, and refused until lesion studies exist. */
export const RESERVED_TARGET_METRICS = ['contrastRecovery', 'falseLesions'] as const;

const reservedTargetSchema = z
  .strictObject({
    metric: z.enum(RESERVED_TARGET_METRICS),
    atLeast: z.number().optional(),
    atMost: z.number().optional(),
  })
  .superRefine((t, ctx) => {
    ctx.addIssue({
      code: 'custom',
      path: ['metric'],
      message: `${t.metric} is a lesion-study score, reserved for plans with lesions: not available yet`,
      params: {
        allowed: `one of ${[...metricNames, 'gFactorMax'].map((m) => JSON.stringify(m)).join(', ')}`,
      },
    });
  });

/** One target of a plan: an image-quality metric, or gFactorMax. */
export const planTargetSchema = z
  .discriminatedUnion('metric', [targetSchema, gFactorTargetSchema, reservedTargetSchema])
  .describe('{ metric, atLeast | atMost }: an image-quality metric or gFactorMax');

export type GFactorTarget = z.output<typeof gFactorTargetSchema>;
/** A target that passed the schema (the reserved names never do). */
export type PlanTarget = Target | GFactorTarget;

/** The plan's targets: `target` (if any) first, then `targets`, all of which a row must meet. */
export function planTargets(plan: {
  target?: Target;
  targets?: readonly z.output<typeof planTargetSchema>[];
}): PlanTarget[] {
  const list: PlanTarget[] = plan.target ? [plan.target] : [];
  for (const t of plan.targets ?? []) if (isPlanTarget(t)) list.push(t);
  return list;
}

function isPlanTarget(t: { metric: string }): t is PlanTarget {
  return t.metric === 'gFactorMax' || (metricNames as readonly string[]).includes(t.metric);
}

export function isMetricTarget(t: PlanTarget): t is Target {
  return t.metric !== 'gFactorMax';
}

/** The first image-quality target's metric: the one the Pareto front and the ranking use (nrmse without). */
export function rankingMetric(targets: readonly PlanTarget[]): MetricName {
  return targets.find(isMetricTarget)?.metric ?? 'nrmse';
}

/** A row's mean of a target's quantity: metric means (null = +∞) or the mean largest g (null = none). */
export function targetValue(row: PlanRow, t: PlanTarget): number | null {
  return isMetricTarget(t) ? row.metrics[t.metric].mean : row.gFactorMax;
}
