import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { DecodeError } from '../../src/core/errors.ts';
import { decodeImage } from '../../src/io/decode-image.ts';
import { at, sum } from './debian-files.ts';

/**
 * PNG/JPEG/TIFF through sharp against facts that skimage, imageio, tifffile and Pillow computed from the
 * same files (tests/reference/io_raster_facts.py wrote both the files in tests/fixtures/io and
 * tests/reference/fixtures/io-raster.json).
 */
interface RasterFacts {
  file: string;
  note: string;
  frame: number;
  nx: number;
  ny: number;
  sum: number;
  min: number;
  max: number;
  pixels: Array<[number, number, number]>;
}

const fixture = JSON.parse(
  readFileSync(new URL('../reference/fixtures/io-raster.json', import.meta.url), 'utf8'),
) as {
  images: RasterFacts[];
};
const fixtureFile = (name: string) => readFileSync(new URL(`../fixtures/io/${name}`, import.meta.url));

describe('raster decoders against skimage/tifffile/Pillow facts', () => {
  for (const facts of fixture.images) {
    // JPEG: Pillow's and libvips' libjpeg builds may round the IDCT differently (±1 per channel, so
    // ±1 after the luminance weights, which sum to 1). Measured here: identical to 1e-12.
    const jpeg = facts.file.endsWith('.jpg');
    it(`${facts.file}: ${facts.note}`, async () => {
      const { image, meta, notes } = await decodeImage(fixtureFile(facts.file), { frame: facts.frame });
      expect([image.nx, image.ny]).toEqual([facts.nx, facts.ny]);
      const pixels = facts.nx * facts.ny;
      if (jpeg) {
        expect(Math.abs(sum(image.data) - facts.sum) / pixels).toBeLessThan(1);
        for (const [row, col, value] of facts.pixels)
          expect(Math.abs(at(image, row, col) - value)).toBeLessThanOrEqual(1);
      } else {
        expect(sum(image.data)).toBeCloseTo(facts.sum, 6);
        expect(Math.min(...image.data)).toBeCloseTo(facts.min, 9);
        expect(Math.max(...image.data)).toBeCloseTo(facts.max, 9);
        for (const [row, col, value] of facts.pixels) expect(at(image, row, col)).toBeCloseTo(value, 9);
      }
      if (meta.colour) expect(notes.join(' ')).toMatch(/luminance/);
    });
  }

  it('16-bit files keep their stored values (ramp16.png max 65246 = 34·1919, not rescaled to 8 bits)', async () => {
    const { image, meta } = await decodeImage(fixtureFile('ramp16.png'));
    expect(meta.bitsPerSample).toBe(16);
    expect(Math.max(...image.data)).toBe(65246);
  });

  it('a truncated PNG is a DecodeError (415), never a crash', async () => {
    await expect(decodeImage(fixtureFile('truncated.png'))).rejects.toBeInstanceOf(DecodeError);
  });

  it('bytes of no known format are a DecodeError naming the accepted formats', async () => {
    await expect(decodeImage(Buffer.from('hello, this is not an image at all'))).rejects.toThrow(
      /PNG, JPEG, TIFF, DICOM/,
    );
  });
});
