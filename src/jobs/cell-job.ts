import type { Limits } from '../core/limits.ts';
import type { Plan, PlanCell } from '../plan/index.ts';

/**
 * What a queued cell carries: its typed spec as JSON (the worker parses the plan with the service's
 * schema) and the ids of the uploads it needs, never their pixels (workers fetch those once per
 * plan from the service).
 */
export interface CellJobSpec {
  plan: Plan;
  cell: PlanCell;
  limits: Limits;
  keepOutcome?: boolean;
  imageId?: string;
  coilMapIds?: string[];
}

/** The job's data in Redis: the plan id in the clear (for cancel), the spec as wire JSON. */
export interface CellJobData {
  planId: string;
  spec: string;
}
