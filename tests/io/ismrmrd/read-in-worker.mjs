// Worker-thread task for tests/io/ismrmrd/worker.test.ts: loads TypeScript the way
// src/jobs/worker-entry.mjs does (tsx's ESM hooks registered in the thread), then imports the
// ISMRMRD reader. As a piscina task it reads the bytes it is given and returns the numbers.
import { register } from 'tsx/esm/api';

register();
const { readRawKspace } = await import('../../../src/io/ismrmrd/read-raw-kspace.ts');

export default async function readInWorker(bytes) {
  const raw = await readRawKspace(bytes);
  return { coils: raw.coils, nx: raw.kspace.nx, ny: raw.kspace.ny, first: raw.kspace.data[0] };
}
