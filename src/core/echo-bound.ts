import type { FieldProblem } from './errors.ts';

/**
 * Problem details echo parts of the request (names, ids, unknown keys). Unbounded, a 7 MiB name came
 * back twice in one answer and was stored with a failed plan, so every echoed text is cut to a bound.
 */
export const MAX_ECHO_CHARS = 200;
/** `detail` may join several field messages, so it gets a wider bound than one field. */
export const MAX_DETAIL_CHARS = 1000;
/** More field problems than this are summarised in one last entry. */
export const MAX_FIELD_PROBLEMS = 50;

/** `text` cut to `max` characters (code points), the cut marked with an ellipsis. */
export function boundEcho(text: string, max = MAX_ECHO_CHARS): string {
  if (text.length <= max) return text;
  // Cut on code points so a surrogate pair is never split into invalid UTF-16. 2(max + 1) UTF-16
  // units hold at least max + 1 code points, so whether the text is longer than max is decided here.
  const points = Array.from(text.slice(0, 2 * (max + 1)));
  return points.length <= max ? text : `${points.slice(0, max - 1).join('')}…`;
}

/** Every text of every field problem bounded, and at most MAX_FIELD_PROBLEMS entries. */
export function boundFieldProblems(problems: readonly FieldProblem[]): FieldProblem[] {
  const bounded = (p: FieldProblem): FieldProblem =>
    p.allowed === undefined
      ? { field: boundEcho(p.field), message: boundEcho(p.message) }
      : { field: boundEcho(p.field), message: boundEcho(p.message), allowed: boundEcho(p.allowed) };
  if (problems.length <= MAX_FIELD_PROBLEMS) return problems.map(bounded);
  const kept = problems.slice(0, MAX_FIELD_PROBLEMS - 1).map(bounded);
  const rest = problems.length - kept.length;
  kept.push({ field: 'body', message: `${rest} more problems not listed` });
  return kept;
}
