import { readFileSync } from 'node:fs';
import type { RealVolume } from '../../src/core/real-volume.ts';
import { decodeImage } from '../../src/io/decode-image.ts';

/**
 * A 32³ brain volume cut from Debian's mricron-data (inia19-t1-brain.nii.gz, the INIA19 primate
 * template; 4×4×4 block means of its central 128³), made by tests/reference/generate_volume_fixture.py.
 */
export const VOLUME_FIXTURE = new URL('../fixtures/volumes/inia19-t1-32.nii.gz', import.meta.url);

export async function fixtureVolume(): Promise<RealVolume> {
  const decoded = await decodeImage(readFileSync(VOLUME_FIXTURE), { wholeVolume: true });
  if (!decoded.volume) throw new Error('the fixture decoded without its volume');
  return decoded.volume;
}
