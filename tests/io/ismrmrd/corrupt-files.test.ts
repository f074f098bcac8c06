import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { ValidationError } from '../../../src/core/errors.ts';
import { SeededRandom } from '../../../src/core/random.ts';
import { readRawKspace } from '../../../src/io/ismrmrd/read-raw-kspace.ts';

/**
 * Seeded damage to the generated ISMRMRD file (tests/reference/generate_ismrmrd_fixture.sh): every
 * damaged copy either imports or is refused with a ValidationError (never another error, a hang or
 * a broken HDF5 module), and the undamaged file still reads afterwards in the same thread.
 */
const original = new Uint8Array(
  readFileSync(new URL('../../fixtures/ismrmrd/shepp-logan-4coil.h5', import.meta.url)),
);

describe('damaged ISMRMRD files', () => {
  it('give an import or a ValidationError, and leave the reader working', async () => {
    const random = new SeededRandom(2017);
    const outcomes = { imported: 0, refused: 0 };
    for (let copy = 0; copy < 24; copy++) {
      const bytes = original.slice();
      const mode = copy % 3;
      if (mode === 0) {
        // Flip a few bytes anywhere past the signature.
        for (let k = 0; k < 16; k++) bytes[8 + Math.floor(random.uniform() * (bytes.length - 8))] ^= 0xff;
      } else if (mode === 1) {
        // Zero a 512-byte run somewhere in the first 16 KiB (superblock, object headers, B-trees).
        const start = 8 + Math.floor(random.uniform() * 16_384);
        bytes.fill(0, start, start + 512);
      }
      const input =
        mode === 2 ? bytes.slice(0, 8 + Math.floor(random.uniform() * (bytes.length - 8))) : bytes;
      const error = await readRawKspace(input).then(
        () => null,
        (e: unknown) => e,
      );
      if (error === null) outcomes.imported += 1;
      else {
        expect(error).toBeInstanceOf(ValidationError);
        outcomes.refused += 1;
      }
    }
    expect(outcomes.imported + outcomes.refused).toBe(24);
    expect(outcomes.refused).toBeGreaterThan(0);
    const raw = await readRawKspace(original);
    expect(raw.coils).toBe(4);
  });
});
