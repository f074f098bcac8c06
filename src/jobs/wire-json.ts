/**
 * JSON that keeps what a cell's answer holds and plain JSON drops: typed arrays (images, masks,
 * coil maps) travel as base64 of their bytes, ±∞ and NaN (the PSNR of an exact reconstruction) as
 * tagged strings. Used for cells and results on the job queue; both ends run this same code.
 */
const typedArrays = {
  Int8Array,
  Uint8Array,
  Uint8ClampedArray,
  Int16Array,
  Uint16Array,
  Int32Array,
  Uint32Array,
  Float32Array,
  Float64Array,
} as const;

type TypedArrayName = keyof typeof typedArrays;

const TYPED = '$typed';
const NUMBER = '$number';

function isTypedArrayName(name: unknown): name is TypedArrayName {
  return typeof name === 'string' && Object.hasOwn(typedArrays, name);
}

export function toWireJson(value: unknown): string {
  return JSON.stringify(value, function replace(this: Record<string, unknown>, key: string, item: unknown) {
    // `this[key]` is the value before any toJSON; typed arrays have none, so `item` is it already.
    const raw = key === '' ? item : this[key];
    if (typeof raw === 'number' && !Number.isFinite(raw)) return { [NUMBER]: String(raw) };
    if (ArrayBuffer.isView(raw) && !(raw instanceof DataView)) {
      const name = raw.constructor.name;
      if (!isTypedArrayName(name)) throw new TypeError(`cannot send a ${name} on the queue`);
      return {
        [TYPED]: name,
        b64: Buffer.from(raw.buffer, raw.byteOffset, raw.byteLength).toString('base64'),
      };
    }
    return item;
  });
}

export function fromWireJson<T>(text: string): T {
  return JSON.parse(text, (_key, item: unknown) => {
    if (item === null || typeof item !== 'object' || Array.isArray(item)) return item;
    const tagged = item as Record<string, unknown>;
    if (typeof tagged[NUMBER] === 'string' && Object.keys(tagged).length === 1) return Number(tagged[NUMBER]);
    if (isTypedArrayName(tagged[TYPED]) && typeof tagged.b64 === 'string') {
      // A fresh, aligned buffer: Buffer.from may share an unaligned pool slab.
      const bytes = new Uint8Array(Buffer.from(tagged.b64, 'base64'));
      const Kind = typedArrays[tagged[TYPED]];
      return new Kind(bytes.buffer, 0, bytes.byteLength / Kind.BYTES_PER_ELEMENT);
    }
    return item;
  }) as T;
}
