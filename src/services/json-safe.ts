/**
 * Engine info objects may hold typed arrays and ±∞/NaN, which JSON cannot carry: typed arrays
 * become arrays, non-finite numbers null (documented as "null = not finite").
 */
export function jsonSafe(value: unknown): unknown {
  if (typeof value === 'number') return Number.isFinite(value) ? value : null;
  if (ArrayBuffer.isView(value) && !(value instanceof DataView)) {
    return Array.from(value as unknown as ArrayLike<number>, (v) => jsonSafe(v));
  }
  if (Array.isArray(value)) return value.map(jsonSafe);
  if (value !== null && typeof value === 'object') {
    const out: Record<string, unknown> = {};
    for (const [key, item] of Object.entries(value)) if (item !== undefined) out[key] = jsonSafe(item);
    return out;
  }
  if (typeof value === 'bigint') return Number(value);
  return value;
}

/** A finite number, or null for ±∞ and NaN (e.g. PSNR of an exact reconstruction). */
export function finiteOrNull(value: number): number | null {
  return Number.isFinite(value) ? value : null;
}
