import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { generateMask } from '../../sampling/index.ts';
import type { RealImage } from '../../src/core/real-image.ts';
import { greyPng, maskPng } from '../../src/render/png.ts';

// Source: the rendering rules are the project's own (docs/design.md §4.2: PNG images; src/render/png.ts
// documents the scaling); what is checked is that an outside decoder (sharp) reads back exactly
// the values those rules give.

/** Decodes a PNG with sharp (an outside decoder) to one grey channel at its own bit depth. */
async function decode(
  png: Buffer,
): Promise<{ width: number; height: number; bits: number; values: number[] }> {
  const meta = await sharp(png).metadata();
  expect(meta.format).toBe('png');
  const sixteen = meta.depth === 'ushort';
  const { data, info } = await sharp(png)
    .toColourspace(sixteen ? 'grey16' : 'b-w')
    .raw(sixteen ? { depth: 'ushort' } : undefined)
    .toBuffer({ resolveWithObject: true });
  expect(info.channels).toBe(1);
  const copy = Uint8Array.from(data);
  const values = sixteen ? Array.from(new Uint16Array(copy.buffer)) : Array.from(copy);
  return { width: info.width, height: info.height, bits: sixteen ? 16 : 8, values };
}

const ramp: RealImage = { nx: 4, ny: 2, data: Float64Array.from([0, 1, 2, 3, 4, 5, 6, 8]) };

describe('greyPng', () => {
  it('8-bit linear: round(255·v/max), row 0 of the image is the top row of the picture', async () => {
    const png = await greyPng(ramp);
    const { width, height, bits, values } = await decode(png);
    expect([width, height, bits]).toEqual([4, 2, 8]);
    expect(values).toEqual(Array.from(ramp.data, (v) => Math.round((255 * v) / 8)));
    expect((await sharp(png).metadata()).channels).toBe(1);
  });

  it('16-bit linear with a given max: values above it clip to white, negatives and NaN to black', async () => {
    const image: RealImage = { nx: 3, ny: 2, data: Float64Array.from([-1, 0, 1, 2, 4, Number.NaN]) };
    const { bits, values } = await decode(await greyPng(image, { bits: 16, max: 2 }));
    expect(bits).toBe(16);
    expect(values).toEqual([0, 0, 32768, 65535, 65535, 0]);
  });

  it('log scale: 1 + log10(v/max)/decades, 3 decades by default (max white, max/1000 and below black)', async () => {
    const image: RealImage = { nx: 5, ny: 1, data: Float64Array.from([1, 0.1, 0.01, 0.001, 0.0001]) };
    const { values } = await decode(await greyPng(image, { scale: 'log', bits: 16 }));
    expect(values).toEqual([65535, Math.round((65535 * 2) / 3), Math.round(65535 / 3), 0, 0]);
    const two = await decode(await greyPng(image, { scale: 'log', decades: 2 }));
    expect(two.values).toEqual([255, 128, 0, 0, 0]);
  });

  it('an all-zero image is black, not NaN', async () => {
    const { values } = await decode(await greyPng({ nx: 2, ny: 2, data: new Float64Array(4) }));
    expect(values).toEqual([0, 0, 0, 0]);
  });

  it('bad options and inconsistent images are ValidationErrors', async () => {
    await expect(greyPng(ramp, { bits: 12 as 8 })).rejects.toMatchObject({
      problems: [{ field: 'png.bits' }],
    });
    await expect(greyPng({ nx: 3, ny: 3, data: new Float64Array(8) })).rejects.toMatchObject({
      problems: [{ field: 'image' }],
    });
  });
});

describe('maskPng', () => {
  it('ny rows × nx columns, 255 where acquired and 0 elsewhere', async () => {
    const m = generateMask(
      { nx: 40, ny: 24 },
      { pattern: 'cartesian-random', acceleration: 3, seed: 8, acs: 4 },
    );
    const { width, height, bits, values } = await decode(await maskPng(m));
    expect([width, height, bits]).toEqual([40, 24, 8]);
    expect(values).toEqual(Array.from(m.mask, (v) => (v ? 255 : 0)));
  });
});
