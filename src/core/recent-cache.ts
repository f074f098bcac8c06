/**
 * Keeps the values of the last `capacity` keys used (least recently used dropped first): for
 * deterministic results that cost far more to build than to keep a few of. A Map keeps insertion
 * order, so a hit is moved to the end and the first key is the least recently used.
 */
export class RecentCache<V> {
  private readonly entries = new Map<string, V>();

  constructor(private readonly capacity: number) {}

  /** The value kept for `key`, else `build()`'s, kept from now on. */
  get(key: string, build: () => V): V {
    const hit = this.entries.get(key);
    if (hit !== undefined) {
      this.entries.delete(key);
      this.entries.set(key, hit);
      return hit;
    }
    const value = build();
    this.entries.set(key, value);
    if (this.entries.size > this.capacity) this.entries.delete(this.entries.keys().next().value as string);
    return value;
  }
}
