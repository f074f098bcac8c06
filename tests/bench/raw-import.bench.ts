import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { BenchRow } from './timing.ts';

const coils = 32;
const side = 256;
const generator = '/usr/bin/ismrmrd_generate_cartesian_shepp_logan';

/**
 * Importing a 32-coil 256² ISMRMRD file: made by Debian's ismrmrd-tools (fully sampled Shepp–Logan,
 * 2× readout oversampling, one noise-calibration record), then read by readRawKspace in a fresh
 * process and posted to POST /v1/raw in another (raw-import-probe.ts), each reporting its median and
 * its peak resident set. Without ismrmrd-tools (apt-get install ismrmrd-tools) the group says so.
 */
export async function benchRawImport(): Promise<BenchRow[]> {
  if (!existsSync(generator)) {
    console.error(`(raw import: not run — ${generator} missing; apt-get install ismrmrd-tools)`);
    return [];
  }
  const folder = mkdtempSync(join(tmpdir(), 'kspace-bench-ismrmrd-'));
  try {
    const file = join(folder, 'shepp-logan-32coil.h5');
    execFileSync(generator, ['-m', String(side), '-c', String(coils), '-C', '-o', file], { stdio: 'ignore' });
    const size = `${(statSync(file).size / 2 ** 20).toFixed(1)} MiB file`;
    const probe = new URL('./raw-import-probe.ts', import.meta.url).pathname;
    const run = (mode: 'read' | 'post') => {
      const out = execFileSync(process.execPath, ['--import', 'tsx', probe, mode, file], {
        encoding: 'utf8',
      });
      return JSON.parse(out.trim().split('\n').pop()!) as {
        medianMs: number;
        peakRssMiB: number;
        baselineRssMiB: number;
      };
    };
    const read = run('read');
    const post = run('post');
    const rss = (r: typeof read) =>
      `peak RSS ${r.peakRssMiB.toFixed(0)} MiB (process at start ${r.baselineRssMiB.toFixed(0)} MiB)`;
    return [
      {
        name: `readRawKspace, ${coils}×${side}² ISMRMRD`,
        medianMs: read.medianMs,
        note: `${size}; ${rss(read)}`,
      },
      {
        name: `POST /v1/raw, ${coils}×${side}² ISMRMRD (one worker)`,
        medianMs: post.medianMs,
        note: `${size}; ${rss(post)}`,
      },
    ];
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
}
