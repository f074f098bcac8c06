import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Piscina } from 'piscina';
import { describe, expect, it } from 'vitest';
import { readRawKspace } from '../../../src/io/ismrmrd/read-raw-kspace.ts';

/**
 * The service decodes uploads on piscina worker threads (src/jobs): h5wasm's WebAssembly module
 * must load and read inside a worker thread as it does on the main thread. Same file, same numbers,
 * and a second task in the same thread still works (the module and its memory file system are reused).
 */
describe('ISMRMRD reader on a piscina worker thread', () => {
  it('reads the generated file in the worker with the same result as here', async () => {
    const bytes = new Uint8Array(
      readFileSync(new URL('../../fixtures/ismrmrd/shepp-logan-4coil.h5', import.meta.url)),
    );
    const here = await readRawKspace(bytes);
    const pool = new Piscina({
      filename: fileURLToPath(new URL('./read-in-worker.mjs', import.meta.url)),
      minThreads: 1,
      maxThreads: 1,
    });
    try {
      const first = await pool.run(bytes);
      const second = await pool.run(bytes);
      const expected = { coils: 4, nx: 64, ny: 64, first: here.kspace.data[0] };
      expect(first).toEqual(expected);
      expect(second).toEqual(expected);
    } finally {
      await pool.destroy();
    }
  });
});
