/** `values` as little-endian float32 bytes in padded base64 (RFC 4648 §4): one coil-map plane. */
export function float32Base64(values: ArrayLike<number>): string {
  const bytes = Buffer.alloc(4 * values.length);
  for (let i = 0; i < values.length; i++) bytes.writeFloatLE(values[i], 4 * i);
  return bytes.toString('base64');
}
