import { describe, expect, it } from 'vitest';
import { RecentCache } from '../../src/core/recent-cache.ts';

describe('RecentCache (least-recently-used eviction, common practice)', () => {
  it('builds a key once while it is kept, and drops the least recently used one beyond capacity', () => {
    const cache = new RecentCache<string>(2);
    const built: string[] = [];
    const get = (key: string) =>
      cache.get(key, () => {
        built.push(key);
        return `value of ${key}`;
      });
    expect(get('a')).toBe('value of a');
    get('b');
    expect(get('a')).toBe('value of a'); // a hit: a is now the most recent
    get('c'); // three keys for two places: b, the least recently used, goes
    expect(built).toEqual(['a', 'b', 'c']);
    get('a');
    expect(built).toEqual(['a', 'b', 'c']);
    get('b');
    expect(built).toEqual(['a', 'b', 'c', 'b']);
  });
});
