/**
 * Named scratch buffers reused across metric calls so the filters allocate nothing per call once
 * warmed up. A buffer grows to the largest length asked for and is returned as a view of exactly
 * `length` elements; its contents are undefined. Callers must not hold a view across another call
 * that asks for the same name (the metrics are synchronous, so within one call this is safe).
 */
const buffers = new Map<string, Float64Array>();

export function scratch(name: string, length: number): Float64Array {
  let b = buffers.get(name);
  if (!b || b.length < length) {
    b = new Float64Array(length);
    buffers.set(name, b);
  }
  return b.length === length ? b : b.subarray(0, length);
}
