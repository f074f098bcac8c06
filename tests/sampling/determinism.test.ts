import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { generateMask, type SamplingSpec } from '../../sampling/index.ts';

const requests: SamplingSpec[] = [
  { pattern: 'cartesian-uniform', acceleration: 3.5, acs: 12 },
  { pattern: 'cartesian-random', acceleration: 4, acs: 16, seed: 7, density: { power: 3 } },
  { pattern: 'poisson-disc', acceleration: 6, acs: 10, seed: 7 },
  { pattern: 'radial', acceleration: 5, angles: 'golden' },
];
const matrix = { nx: 96, ny: 112 };

function fingerprint(spec: SamplingSpec): string {
  const m = generateMask(matrix, spec);
  const hash = createHash('sha256').update(m.mask);
  if (m.density) hash.update(new Uint8Array(m.density.buffer));
  if (m.spokeAngles) hash.update(new Uint8Array(m.spokeAngles.buffer));
  return hash.digest('hex');
}

describe('determinism: the same request gives the same bytes (docs/design.md §3.7)', () => {
  it('within one process, request after request', () => {
    for (const spec of requests) expect(fingerprint(spec)).toBe(fingerprint(structuredClone(spec)));
  });

  it('across processes: a fresh Node process produces identical masks, densities and angles', () => {
    const indexUrl = new URL('../../sampling/index.ts', import.meta.url).href;
    const script = `
      import { createHash } from 'node:crypto';
      const { generateMask } = await import(${JSON.stringify(indexUrl)});
      const requests = ${JSON.stringify(requests)};
      const out = requests.map((spec) => {
        const m = generateMask(${JSON.stringify(matrix)}, spec);
        const hash = createHash('sha256').update(m.mask);
        if (m.density) hash.update(new Uint8Array(m.density.buffer));
        if (m.spokeAngles) hash.update(new Uint8Array(m.spokeAngles.buffer));
        return hash.digest('hex');
      });
      process.stdout.write(JSON.stringify(out));
    `;
    const stdout = execFileSync(process.execPath, ['--import', 'tsx', '--input-type=module', '-e', script], {
      cwd: fileURLToPath(new URL('../..', import.meta.url)),
      encoding: 'utf8',
    });
    expect(JSON.parse(stdout)).toEqual(requests.map(fingerprint));
  });
});
