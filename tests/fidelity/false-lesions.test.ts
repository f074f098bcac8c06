import { describe, expect, it } from 'vitest';
import { countFalseLesions, discFilterMap, discOffsets } from '../../src/fidelity/index.ts';

describe('false lesions: blobs a disc matched filter calls in a lesion-free error map', () => {
  const n = 48;
  const object = new Uint8Array(n * n).fill(1);
  function plant(map: Float64Array, row: number, col: number, value: number): void {
    const o = discOffsets(5);
    for (let k = 0; k < o.length; k += 2) map[(row + o[k]) * n + col + o[k + 1]] += value;
  }

  it('the filter is the disc mean: a planted disc of 0.1 reads 0.1 at its centre (definition)', () => {
    const map = new Float64Array(n * n);
    plant(map, 20, 20, 0.1);
    const filtered = discFilterMap(map, n, n, 5);
    expect(filtered[20 * n + 20]).toBeCloseTo(0.1, 15);
    expect(Number.isNaN(filtered[0])).toBe(true);
  });

  it('counts the two bright blobs above the threshold at their centres, not the faint one nor the dark one', () => {
    const map = new Float64Array(n * n);
    plant(map, 10, 12, 0.1);
    plant(map, 30, 35, 0.08);
    plant(map, 36, 10, 0.03);
    plant(map, 12, 36, -0.1);
    const bright = countFalseLesions(map, object, n, n, 5, 0.05, 1);
    expect(bright.count).toBe(2);
    expect(bright.positions).toEqual([
      { row: 10, col: 12 },
      { row: 30, col: 35 },
    ]);
    const dark = countFalseLesions(map, object, n, n, 5, 0.05, -1);
    expect(dark).toEqual({ count: 1, positions: [{ row: 12, col: 36 }] });
    // Outside the object nothing is called.
    const topHalf = new Uint8Array(n * n);
    topHalf.fill(1, 0, (n / 2) * n);
    expect(countFalseLesions(map, topHalf, n, n, 5, 0.05, 1).positions).toEqual([{ row: 10, col: 12 }]);
  });
});
