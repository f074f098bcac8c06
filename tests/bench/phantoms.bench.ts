import { getPhantom, phantomGridKspace } from '../../src/phantoms/index.ts';
import { type BenchRow, medianMs } from './timing.ts';

/** Exact grid k-space of the analytic phantoms (the default acquisition source). */
export async function benchPhantoms(): Promise<BenchRow[]> {
  const rows: BenchRow[] = [];
  for (const name of ['shepp-logan-modified', 'resolution-contrast']) {
    const phantom = getPhantom(name);
    for (const n of [256, 512]) {
      rows.push({
        name: `phantomGridKspace ${name} ${n}×${n}`,
        medianMs: await medianMs(() => phantomGridKspace(phantom, n, n), 5, 1),
      });
    }
  }
  return rows;
}
