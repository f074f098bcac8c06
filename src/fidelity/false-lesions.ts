import { discOffsets } from './lesion.ts';

export interface FalseLesions {
  count: number;
  /** Each blob's strongest pixel (row, col). */
  positions: { row: number; col: number }[];
}

/**
 * Matched-filter map of a real image for a disc of `diameter` pixels: at each pixel the mean of the
 * image over the disc centred there (a correlation with the normalised disc, whose output on a
 * lesion of amplitude a is ≈ a). Centres whose disc leaves the image get NaN.
 */
export function discFilterMap(image: Float64Array, nx: number, ny: number, diameter: number): Float64Array {
  const offsets = discOffsets(diameter);
  const count = offsets.length / 2;
  const reach = Math.floor(diameter / 2);
  const out = new Float64Array(nx * ny).fill(Number.NaN);
  for (let row = reach; row < ny - reach; row++) {
    for (let col = reach; col < nx - reach; col++) {
      let s = 0;
      for (let k = 0; k < offsets.length; k += 2) s += image[(row + offsets[k]) * nx + col + offsets[k + 1]];
      out[row * nx + col] = s / count;
    }
  }
  return out;
}

/**
 * False lesions in a reconstruction of lesion-free data: blobs of the error map (signed,
 * |x̂| − |x_ref|) that a matched filter of the lesion's size calls a lesion at the threshold a true
 * lesion is called at. A pixel of `region` (the object, or where lesions may sit) is called when sign·filter ≥ threshold (sign of the
 * lesion contrast: a bright-lesion study counts bright blobs); called pixels that touch (8-neighbours)
 * form one blob, reported at its strongest pixel.
 */
export function countFalseLesions(
  errorMap: Float64Array,
  region: Uint8Array,
  nx: number,
  ny: number,
  diameter: number,
  threshold: number,
  sign: 1 | -1,
): FalseLesions {
  const filtered = discFilterMap(errorMap, nx, ny, diameter);
  const called = new Uint8Array(nx * ny);
  for (let i = 0; i < called.length; i++) {
    if (region[i] && sign * filtered[i] >= threshold) called[i] = 1;
  }
  const positions: { row: number; col: number }[] = [];
  const stack = new Int32Array(nx * ny);
  for (let start = 0; start < called.length; start++) {
    if (called[start] !== 1) continue;
    let top = 0;
    stack[top++] = start;
    called[start] = 2;
    let best = start;
    while (top > 0) {
      const p = stack[--top];
      if (sign * filtered[p] > sign * filtered[best]) best = p;
      const row = Math.floor(p / nx);
      const col = p - row * nx;
      for (let dr = -1; dr <= 1; dr++) {
        for (let dc = -1; dc <= 1; dc++) {
          const r = row + dr;
          const c = col + dc;
          if (r < 0 || r >= ny || c < 0 || c >= nx) continue;
          const q = r * nx + c;
          if (called[q] === 1) {
            called[q] = 2;
            stack[top++] = q;
          }
        }
      }
    }
    positions.push({ row: Math.floor(best / nx), col: best % nx });
  }
  return { count: positions.length, positions };
}
