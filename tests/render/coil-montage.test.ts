import { describe, expect, it } from 'vitest';
import { createMultiCoilArray } from '../../src/encoding/index.ts';
import { coilMagnitudeMontage } from '../../src/render/coil-montage.ts';

// The coil-maps montage: ⌈√C⌉ tiles across, row by row, each tile |S_c| of one coil (layout by hand).

describe('coilMagnitudeMontage', () => {
  it('5 coils of 3×2: 3 tiles across, 2 down, |S_c| in place, the unused tile 0', () => {
    const nx = 2;
    const ny = 3;
    const maps = createMultiCoilArray(5, nx, ny);
    for (let c = 0; c < 5; c++) {
      for (let i = 0; i < nx * ny; i++) {
        maps.data[2 * (c * nx * ny + i)] = 3 * (c + 1);
        maps.data[2 * (c * nx * ny + i) + 1] = 4 * (c + 1); // |S_c| = 5·(c + 1)
      }
    }
    const montage = coilMagnitudeMontage(maps);
    expect([montage.nx, montage.ny]).toEqual([6, 6]);
    const at = (row: number, col: number) => montage.data[row * montage.nx + col];
    expect(at(0, 0)).toBeCloseTo(5, 14); // coil 0, top left
    expect(at(2, 5)).toBeCloseTo(15, 14); // coil 2, top right tile, its last pixel
    expect(at(3, 0)).toBeCloseTo(20, 14); // coil 3, second row of tiles
    expect(at(5, 3)).toBeCloseTo(25, 14); // coil 4
    expect(at(5, 5)).toBe(0); // no sixth coil
  });
});
