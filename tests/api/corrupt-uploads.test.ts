import { readFileSync } from 'node:fs';
import { gunzipSync, gzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { SeededRandom } from '../../src/core/random.ts';
import { debianFile } from '../io/debian-files.ts';
import { sharedTestApp, uploadFile } from './helpers.ts';

/**
 * Seeded corruption of real files: every damaged upload must end in a 2xx or a 4xx problem+json
 * (RFC 9457), never a 5xx. Sources: the Debian pydicom and nibabel test files (tests/io/debian-files.ts)
 * and the small raster fixtures of tests/fixtures/io.
 */
const fixture = (name: string) => readFileSync(new URL(`../fixtures/io/${name}`, import.meta.url));

const sources: Array<{ name: string; bytes: () => Buffer; gzip?: boolean }> = [
  { name: 'MR_small.dcm', bytes: () => debianFile('pydicom', 'MR_small.dcm') },
  { name: 'MR_small_RLE.dcm', bytes: () => debianFile('pydicom', 'MR_small_RLE.dcm') },
  { name: 'MR_small_bigendian.dcm', bytes: () => debianFile('pydicom', 'MR_small_bigendian.dcm') },
  { name: 'image_dfl.dcm', bytes: () => debianFile('pydicom', 'image_dfl.dcm') },
  { name: 'SC_rgb_rle_16bit_2frame.dcm', bytes: () => debianFile('pydicom', 'SC_rgb_rle_16bit_2frame.dcm') },
  { name: 'CT_small.dcm', bytes: () => debianFile('pydicom', 'CT_small.dcm') },
  { name: 'anatomical.nii', bytes: () => debianFile('nibabel', 'anatomical.nii') },
  { name: 'functional.nii', bytes: () => debianFile('nibabel', 'functional.nii') },
  { name: 'example_nifti2.nii.gz', bytes: () => debianFile('nibabel', 'example_nifti2.nii.gz'), gzip: true },
  { name: 'camera64.png', bytes: () => fixture('camera64.png') },
  { name: 'ramp16.png', bytes: () => fixture('ramp16.png') },
  { name: 'astronaut64.png', bytes: () => fixture('astronaut64.png') },
  { name: 'rocket64.jpg', bytes: () => fixture('rocket64.jpg') },
  { name: 'ramp16-le.tif', bytes: () => fixture('ramp16-le.tif') },
  { name: 'pages.tif', bytes: () => fixture('pages.tif') },
];

type Mutation = { label: string; apply: (bytes: Buffer) => Buffer };

/** Cut at a random length, or flip 1–8 random bytes in the first kilobyte (headers) or anywhere. */
function mutations(random: SeededRandom, count: number, gzip: boolean): Mutation[] {
  const out: Mutation[] = [];
  for (let m = 0; m < count; m++) {
    const kind = m % 3;
    const fraction = random.uniform();
    const flips = Array.from({ length: 1 + random.integer(8) }, () => ({
      at: random.uniform(),
      xor: 1 + random.integer(255),
    }));
    if (kind === 0) {
      out.push({
        label: `cut at ${(100 * fraction).toFixed(1)} %`,
        apply: (bytes) => bytes.subarray(0, Math.floor(fraction * bytes.length)),
      });
      continue;
    }
    const flip = (bytes: Buffer, span: number): Buffer => {
      const copy = Buffer.from(bytes);
      for (const { at, xor } of flips) copy[Math.floor(at * Math.min(span, copy.length))] ^= xor;
      return copy;
    };
    const span = kind === 1 ? 1024 : Number.POSITIVE_INFINITY;
    const where = kind === 1 ? 'first kilobyte' : 'anywhere';
    out.push(
      gzip
        ? // Damage the NIfTI inside the gzip as well as the gzip itself.
          m % 2 === 0
          ? { label: `${flips.length} flips in the gzip, ${where}`, apply: (bytes) => flip(bytes, span) }
          : {
              label: `${flips.length} flips in the NIfTI, ${where}, re-gzipped`,
              apply: (bytes) => gzipSync(flip(gunzipSync(bytes), span)),
            }
        : { label: `${flips.length} flips, ${where}`, apply: (bytes) => flip(bytes, span) },
    );
  }
  return out;
}

describe('seeded corrupt uploads (15 files × 14 mutations, seed 2026): no 5xx, every 4xx is problem+json', () => {
  const t = sharedTestApp({ limits: { maxMatrixSide: 1024 } });

  for (const [index, source] of sources.entries()) {
    it(`${source.name}`, async () => {
      const random = new SeededRandom(2026 + index);
      const original = source.bytes();
      const seen: Record<number, number> = {};
      for (const mutation of mutations(random, 14, source.gzip === true)) {
        const bytes = mutation.apply(original);
        const res = await uploadFile(t, bytes, 'upload.bin');
        seen[res.status] = (seen[res.status] ?? 0) + 1;
        const context = `${source.name}, ${mutation.label}: ${res.status} ${res.text.slice(0, 300)}`;
        expect(res.status, context).toBeLessThan(500);
        if (res.status >= 400) {
          expect(res.headers['content-type'], context).toMatch(/^application\/problem\+json/);
          const problem = JSON.parse(res.text);
          expect(problem.status, context).toBe(res.status);
          expect(problem.errors.length, context).toBeGreaterThan(0);
          expect(problem.errors[0].field, context).toMatch(/^(file|body|frame|slice|volume)/);
        }
      }
      // The mutations must actually break files: at least one refusal per source.
      expect(
        Object.keys(seen).some((status) => Number(status) >= 400),
        JSON.stringify(seen),
      ).toBe(true);
    });
  }
});
