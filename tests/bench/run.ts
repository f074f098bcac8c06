import { benchFft } from './fft.bench.ts';
import type { BenchRow } from './timing.ts';

/**
 * `npm run bench`: every benchmark group in turn, one table of medians from this one run.
 * Groups are optional modules so a missing engine only drops its rows.
 */
type Group = { title: string; run: () => Promise<BenchRow[]> };

async function optional(title: string, path: string, exportName: string): Promise<Group | null> {
  try {
    const mod = (await import(path)) as Record<string, () => Promise<BenchRow[]>>;
    const run = mod[exportName];
    return typeof run === 'function' ? { title, run } : null;
  } catch (error) {
    console.error(`(${title}: not run — ${(error as Error).message})`);
    return null;
  }
}

const groups: Group[] = [{ title: 'FFT', run: benchFft }];
for (const [title, path, name] of [
  ['phantoms', './phantoms.bench.ts', 'benchPhantoms'],
  ['metrics', './metrics.bench.ts', 'benchMetrics'],
  ['sampling', './sampling.bench.ts', 'benchSampling'],
  ['encoding', './encoding.bench.ts', 'benchEncoding'],
  ['parallel imaging', './parallel-imaging.bench.ts', 'benchParallelImaging'],
  ['nufft', './nufft.bench.ts', 'benchNufft'],
  ['reconstruction', './recon.bench.ts', 'benchRecon'],
  ['coil reconstruction', './coil-recon.bench.ts', 'benchCoilRecon'],
  ['fidelity', './fidelity.bench.ts', 'benchFidelity'],
  ['wavelets', './wavelet.bench.ts', 'benchWavelet'],
  ['solver speed', './solver-speed.bench.ts', 'benchSolverSpeed'],
  ['cs-tv speed', './cs-tv-speed.bench.ts', 'benchCsTvSpeed'],
  ['planning', './plan.bench.ts', 'benchPlan'],
  ['service', './service.bench.ts', 'benchService'],
  ['coil maps', './coil-maps.bench.ts', 'benchCoilMaps'],
  ['raw import', './raw-import.bench.ts', 'benchRawImport'],
  ['job queue', './queue.bench.ts', 'benchQueue'],
  ['volumes', './volume.bench.ts', 'benchVolume'],
  ['3D raw data', './raw-3d.bench.ts', 'benchRaw3d'],
] as const) {
  const group = await optional(title, path, name);
  if (group) groups.push(group);
}

console.log(`k-space planner benchmarks — node ${process.version}, ${new Date().toISOString()}`);
console.log('| group | benchmark | median ms | note |');
console.log('|---|---|---|---|');
for (const group of groups) {
  const rows = await group.run();
  for (const row of rows) {
    console.log(`| ${group.title} | ${row.name} | ${row.medianMs.toFixed(2)} | ${row.note ?? ''} |`);
  }
}
