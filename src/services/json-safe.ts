type TypedArray =
  | Int8Array
  | Uint8Array
  | Uint8ClampedArray
  | Int16Array
  | Uint16Array
  | Int32Array
  | Uint32Array
  | Float32Array
  | Float64Array
  | BigInt64Array
  | BigUint64Array;

/** Every ArrayBuffer view except DataView is one of the typed arrays. */
function isTypedArray(value: unknown): value is TypedArray {
  return ArrayBuffer.isView(value) && !(value instanceof DataView);
}

/**
 * Engine info objects may hold typed arrays and ±∞/NaN, which JSON cannot carry: typed arrays
 * become arrays, non-finite numbers null (documented as "null = not finite").
 */
export function jsonSafe(value: unknown): unknown {
  if (typeof value === 'number') return Number.isFinite(value) ? value : null;
  if (isTypedArray(value)) return Array.from<number | bigint, unknown>(value, (v) => jsonSafe(v));
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
