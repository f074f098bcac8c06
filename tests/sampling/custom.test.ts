import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { customMaskFromArray, generateMask, resolveSampling } from '../../sampling/index.ts';
import { ValidationError } from '../../src/core/errors.ts';
import { maskPng } from '../../src/render/png.ts';

// Source: the custom pattern of docs/design.md §4.3 ("base64 PNG, ny×nx, non-zero = sampled"), R counted per
// DEVELOPERS.md (lines when every sampled row is full, points otherwise); PNGs written by sharp.

/** A PNG written by sharp (an outside encoder) from raw samples; channels 1 = grey, 3 = RGB, 4 = RGBA. */
async function pngOf(
  samples: Uint8Array | Uint16Array,
  width: number,
  height: number,
  channels: 1 | 3 | 4,
): Promise<string> {
  let image = sharp(samples, { raw: { width, height, channels } });
  if (samples instanceof Uint16Array) image = image.toColourspace('grey16');
  else if (channels === 1) image = image.toColourspace('b-w');
  return (await image.png().toBuffer()).toString('base64');
}

describe('custom masks from a base64 PNG (non-zero = sampled)', () => {
  it('round trip: a generated line mask written as PNG reads back bit for bit, R counted in lines', async () => {
    const original = generateMask(
      { nx: 48, ny: 64 },
      { pattern: 'cartesian-random', acceleration: 3, acs: 8, seed: 4 },
    );
    const png = (await maskPng(original)).toString('base64');
    const m = await resolveSampling({ nx: 48, ny: 64 }, { pattern: 'custom', maskPng: png });
    expect(Buffer.from(m.mask).equals(Buffer.from(original.mask))).toBe(true);
    expect(m.acquired).toEqual(original.acquired);
    expect(m.acceleration).toEqual({ requested: null, actual: original.acceleration.actual });
    expect(m.total).toBe(64);
    expect(m.details?.accelerationBasis).toMatch(/^lines/);
    expect(m.pattern).toBe('custom');
  });

  it('partial rows make it a point mask: R = nx·ny / points', async () => {
    const nx = 8;
    const ny = 4;
    const grey = new Uint8Array(nx * ny);
    grey.fill(255, 0, nx); // row 0 full
    grey[2 * nx + 3] = 1; // a single faint point in row 2
    const m = await resolveSampling({ nx, ny }, { pattern: 'custom', maskPng: await pngOf(grey, nx, ny, 1) });
    expect(m.acquired).toEqual({ count: 9, unit: 'points' });
    expect(m.total).toBe(32);
    expect(m.acceleration.actual).toBeCloseTo(32 / 9, 12);
    expect(m.fraction).toBeCloseTo(9 / 32, 12);
    expect(m.mask[2 * nx + 3]).toBe(1);
    expect(m.details?.accelerationBasis).toMatch(/^points/);
  });

  it('16-bit grey: a sample value of 1 still counts as sampled; row 0 of the picture is mask row 0', async () => {
    const nx = 5;
    const ny = 3;
    const samples = new Uint16Array(nx * ny);
    samples[0] = 1;
    samples[nx * ny - 1] = 65535;
    const m = await resolveSampling(
      { nx, ny },
      { pattern: 'custom', maskPng: await pngOf(samples, nx, ny, 1) },
    );
    expect(Array.from(m.mask)).toEqual(Array.from(samples, (v) => (v ? 1 : 0)));
  });

  it('colour PNGs: any non-zero colour channel samples, alpha is ignored', async () => {
    const rgb = Uint8Array.from([0, 0, 0, 0, 0, 1, 1, 0, 0, 0, 0, 0]);
    const m = await resolveSampling(
      { nx: 2, ny: 2 },
      { pattern: 'custom', maskPng: await pngOf(rgb, 2, 2, 3) },
    );
    expect(Array.from(m.mask)).toEqual([0, 1, 1, 0]);
    const rgba = Uint8Array.from([0, 0, 0, 255, 0, 2, 0, 0, 0, 0, 0, 0, 9, 9, 9, 255]);
    const a = await resolveSampling(
      { nx: 2, ny: 2 },
      { pattern: 'custom', maskPng: await pngOf(rgba, 2, 2, 4) },
    );
    expect(Array.from(a.mask)).toEqual([0, 1, 0, 1]);
  });

  it('a PNG of the wrong size names sampling.maskPng and the expected size', async () => {
    const png = await pngOf(new Uint8Array(20).fill(255), 5, 4, 1);
    await expect(
      resolveSampling({ nx: 4, ny: 5 }, { pattern: 'custom', maskPng: png }),
    ).rejects.toMatchObject({
      problems: [{ field: 'sampling.maskPng', allowed: 'exactly 4×5 (width × height) pixels' }],
    });
  });

  it('an empty mask or a truncated PNG is a ValidationError, not a crash', async () => {
    const empty = await pngOf(new Uint8Array(16), 4, 4, 1);
    await expect(
      resolveSampling({ nx: 4, ny: 4 }, { pattern: 'custom', maskPng: empty }),
    ).rejects.toBeInstanceOf(ValidationError);
    const full = Buffer.from(await pngOf(new Uint8Array(64 * 64).fill(255), 64, 64, 1), 'base64');
    const truncated = full.subarray(0, Math.floor(full.length / 2)).toString('base64');
    await expect(
      resolveSampling({ nx: 64, ny: 64 }, { pattern: 'custom', maskPng: truncated }),
    ).rejects.toMatchObject({ problems: [{ field: 'sampling.maskPng' }] });
  });

  it('customMaskFromArray checks the length against the matrix', () => {
    expect(() => customMaskFromArray({ nx: 3, ny: 3 }, new Uint8Array(8))).toThrow(ValidationError);
  });
});
