import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { type BenchRow, median } from './timing.ts';

const coils = 8;
const [nx, ny, nz] = [64, 64, 32];
const size = `${coils} coils ${nx}×${ny}×${nz}`;

/**
 * 3D raw data: a fully sampled 8-coil 64×64×32 ISMRMRD file (2× readout oversampling, 4 noise
 * scans) written by tests/reference/generate_ismrmrd_3d_fixture.py --bench (Debian's python3-h5py),
 * read by readRawKspace in a fresh process (raw-import-probe.ts), and one 3D plan cell from it
 * (Poisson-disc R = 4 on the 64×32 ky–kz plane, zero-filled, 64 x-planes of 8 coils in one thread)
 * in another (raw-volume-cell-process.ts), each with its peak resident set.
 */
export async function benchRaw3d(): Promise<BenchRow[]> {
  const folder = mkdtempSync(join(tmpdir(), 'kspace-bench-raw-3d-'));
  try {
    const file = join(folder, 'volume-3d.h5');
    const script = fileURLToPath(new URL('../reference/generate_ismrmrd_3d_fixture.py', import.meta.url));
    execFileSync('/usr/bin/python3', [script, '--bench', file, ...[coils, nx, ny, nz].map(String)], {
      stdio: 'ignore',
    });
    const mib = `${(statSync(file).size / 2 ** 20).toFixed(1)} MiB file`;
    const node = (probe: string, args: string[]) => {
      const path = fileURLToPath(new URL(probe, import.meta.url));
      const out = execFileSync(process.execPath, ['--import', 'tsx', path, ...args], { encoding: 'utf8' });
      return JSON.parse(out.trim().split('\n').pop() as string);
    };
    const read = node('./raw-import-probe.ts', ['read', file]);
    const cell = node('./raw-volume-cell-process.ts', [file, JSON.stringify({ name: 'zero-filled' }), '3']);
    return [
      {
        name: `readRawKspace, 3D ${size} ISMRMRD`,
        medianMs: read.medianMs,
        note: `${mib}; peak RSS ${read.peakRssMiB.toFixed(0)} MiB (process at start ${read.baselineRssMiB.toFixed(0)} MiB)`,
      },
      {
        name: `3D cell from raw ${size}, zero-filled`,
        medianMs: median(cell.wallMs),
        note:
          `runs ${cell.wallMs.map((t: number) => t.toFixed(0)).join(', ')} ms after an import of ${cell.importMs.toFixed(0)} ms; ` +
          `peak RSS ${cell.peakRssMiB.toFixed(0)} MiB (process at start ${cell.baselineRssMiB.toFixed(0)} MiB); NRMSE ${cell.nrmse.toFixed(4)}`,
      },
    ];
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
}
