import { describe, expect, it } from 'vitest';
import { ValidationError } from '../../src/core/errors.ts';
import { loadFromContext } from '../../src/pipeline/context-loader.ts';

describe('loaders of the pipeline context', () => {
  const unavailable = { field: 'source.rawId', message: 'raw data are not available here' };

  it('hands the id to the loader and returns what it loaded', async () => {
    const seen: string[] = [];
    const value = await loadFromContext(
      async (id) => {
        seen.push(id);
        return id.length;
      },
      'abcd',
      unavailable,
    );
    expect(value).toBe(4);
    expect(seen).toEqual(['abcd']);
  });

  it('without a loader: a ValidationError naming the field (docs/design.md §4.1 typed errors)', async () => {
    const error = await loadFromContext(undefined, 'abcd', unavailable).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ValidationError);
    expect((error as ValidationError).problems).toEqual([unavailable]);
  });
});
