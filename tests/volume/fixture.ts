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

/** A plan body on the 32³ volume: Poisson-disc R = 4, zero-filled, TR 10 ms, 3D and multi-slice. */
export function volumePlanBody(imageId: string) {
  return {
    source: { imageId },
    matrix: { nx: 32, ny: 32, nz: 32 },
    protocol: { trMs: 10 },
    patterns: [{ pattern: 'poisson-disc' }],
    accelerations: [4],
    methods: [{ name: 'zero-filled' }],
    seeds: 1,
    acquisitions: ['3d', 'multi-slice'],
  };
}
