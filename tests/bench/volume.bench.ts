import { execFileSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { niftiFloat32Volumes } from '../../src/io/nifti-writer.ts';
import { type BenchRow, median, medianMs } from './timing.ts';

/**
 * A 3D plan cell on a 128³ volume (Poisson-disc R = 4 on the 128×128 ky–kz plane, 128 hybrid-space
 * x-planes reconstructed in one thread), each case in its own process so the peak RSS is the cell's:
 * zero-filled (acquisition, readout transform, scoring: the fixed cost of a volume) and cs-tv at
 * 20 iterations. Wall time is the median of the process's runs.
 */
export async function benchVolume(): Promise<BenchRow[]> {
  const script = fileURLToPath(new URL('./volume-cell-process.ts', import.meta.url));
  const cases = [
    { label: 'zero-filled', method: { name: 'zero-filled' }, runs: 3 },
    { label: 'cs-tv 20 it', method: { name: 'cs-tv', iterations: 20, tolerance: 0 }, runs: 1 },
  ];
  const rows: BenchRow[] = [];
  for (const c of cases) {
    const out = execFileSync(
      process.execPath,
      ['--import', 'tsx', script, JSON.stringify(c.method), String(c.runs)],
      {
        encoding: 'utf8',
        maxBuffer: 1 << 20,
      },
    );
    const { wallMs, baselineRssMiB, peakRssMiB, nrmse } = JSON.parse(out.trim().split('\n').pop() as string);
    rows.push({
      name: `3D cell 128³, ${c.label}`,
      medianMs: median(wallMs),
      note:
        `runs ${wallMs.map((t: number) => t.toFixed(0)).join(', ')} ms; peak RSS ${peakRssMiB.toFixed(0)} MiB ` +
        `(process before the cell ${baselineRssMiB.toFixed(0)} MiB); NRMSE ${nrmse.toFixed(4)}`,
    });
  }
  rows.push(await benchVolumeNifti());
  return rows;
}

/**
 * images.nii of a 128³ volume result: four float32 volumes (32 MiB) written with their rows flipped,
 * against one plain copy of the same bytes (the least any writer can do).
 */
export async function benchVolumeNifti(): Promise<BenchRow> {
  const n = 128;
  const volumes = Array.from({ length: 4 }, (_, t) => ({
    nx: n,
    ny: n,
    nz: n,
    data: Float32Array.from({ length: n ** 3 }, (_, i) => (i * (t + 1)) % 1000),
  }));
  const writerMs = await medianMs(() => niftiFloat32Volumes(volumes, 'bench'), 7, 1);
  const copyMs = await medianMs(
    () => {
      const out = new Float32Array(4 * n ** 3);
      volumes.forEach((v, t) => {
        out.set(v.data, t * n ** 3);
      });
      return out;
    },
    7,
    1,
  );
  return {
    name: 'images.nii of a 128³ volume result (4 × 8 MiB float32)',
    medianMs: writerMs,
    note: `${(writerMs / copyMs).toFixed(2)}× one plain copy of the same bytes (${copyMs.toFixed(1)} ms)`,
  };
}
