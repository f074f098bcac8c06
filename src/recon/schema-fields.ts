import { z } from 'zod';
import { type NumberRule, TOLERANCE_RULE } from './parameters.ts';

// Request fields several method schemas share, each with the method's own description (its
// default). The ranges are the NumberRules the engines check again, so schema and engine agree.

/** An optional number inside `rule` (integer and exclusive ends as the rule says). */
export function rangeField(rule: NumberRule, description: string) {
  let field = z.number();
  if (rule.integer) field = field.int();
  field = rule.minExclusive ? field.gt(rule.min) : field.min(rule.min);
  field = rule.maxExclusive ? field.lt(rule.max) : field.max(rule.max);
  return field.optional().describe(description);
}

/** `tolerance`: an optional relative stopping tolerance, 0 ≤ tolerance < 1 (TOLERANCE_RULE). */
export function toleranceField(description: string) {
  return rangeField(TOLERANCE_RULE, description);
}

/** `iterations`: an optional positive integer cap (methodSchemaFor adds the configured maximum). */
export function iterationLimitField(description: string) {
  return z.number().int().min(1).optional().describe(description);
}
