import { z } from 'zod';

/**
 * Query pieces of the paged lists (GET /v1/plans, GET /v1/images): `limit` 1…100 (default 20) and an
 * opaque `cursor` taken from the previous page's `next`. Every bad value is a 422 naming the query
 * field, a number that is not one included (a text limit is a bad value, not a bad shape).
 */
export const listLimit = { min: 1, max: 100, default: 20 } as const;

const limitParam = z
  .string()
  .regex(/^\d{1,4}$/, 'must be a whole number')
  .transform(Number)
  .pipe(z.number().int().min(listLimit.min).max(listLimit.max))
  .optional()
  .describe(`items per page, ${listLimit.min}–${listLimit.max} (default ${listLimit.default})`);

/** A cursor is the base64url form of the last item's position; anything else is refused. */
const cursorParam = z
  .string()
  .max(64)
  .transform((text, ctx) => {
    const position = /^[A-Za-z0-9_-]+$/.test(text) ? Buffer.from(text, 'base64url').toString('latin1') : '';
    if (!/^[1-9]\d{0,14}$/.test(position)) {
      ctx.addIssue({
        code: 'custom',
        message: 'not a cursor this service gave out (use the `next` of a page)',
      });
      return z.NEVER;
    }
    return Number(position);
  })
  .optional()
  .describe('the `next` value of the previous page; omitted: the newest items');

export const listQuery = z.object({ limit: limitParam, cursor: cursorParam });

/** The cursor a page hands out for the items after position `after` (null: no more pages). */
export function cursorAfter(after: number | null): string | null {
  return after === null ? null : Buffer.from(String(after), 'latin1').toString('base64url');
}

/** The `{ items, next }` answer of a paged list, for the OpenAPI document and response checks. */
export function pageSchema<T extends z.ZodType>(item: T) {
  return z.object({
    items: z.array(item).describe('newest first'),
    next: z
      .string()
      .nullable()
      .describe(
        'cursor of the next page (pass as `cursor`); null on the last page. Items created after the first page was read do not shift later pages.',
      ),
  });
}
