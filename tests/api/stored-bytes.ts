import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';

/**
 * Looking for stored values in the files of a data folder: the check that deletion and secure
 * deletion leave no copy behind, and that uploads are stored as sent.
 */

/** Consecutive runs of `width` bytes (a trailing shorter run dropped): the needles to look for. */
export function byteRuns(bytes: Buffer, width: number): Buffer[] {
  const out: Buffer[] = [];
  for (let offset = 0; offset + width <= bytes.length; offset += width) {
    out.push(bytes.subarray(offset, offset + width));
  }
  return out;
}

/** How many needles occur in any file of the data folder (db, -wal, -shm). */
export function foundInDataDir(dataDir: string, needles: Buffer[]): number {
  const files = readdirSync(dataDir).map((name) => readFileSync(join(dataDir, name)));
  return needles.filter((needle) => files.some((file) => file.includes(needle))).length;
}
