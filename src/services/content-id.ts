import { createHash } from 'node:crypto';

/** JSON with object keys sorted at every level, so equal requests serialise equally. */
function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  if (value && typeof value === 'object') {
    const entries = Object.entries(value as Record<string, unknown>)
      .filter(([, v]) => v !== undefined)
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
  }
  return JSON.stringify(value);
}

/**
 * A result id derived from the (validated) request itself, for results that are a pure function of
 * it: the same request then gives the same id and the same bytes (docs/design.md §3.7: every random choice
 * takes a seed).
 */
export function contentId(prefix: string, request: unknown): string {
  return `${prefix}-${createHash('sha256').update(canonicalJson(request)).digest('hex').slice(0, 32)}`;
}
