/**
 * One process per measurement, so its peak RSS is the cell's own: runs a 3D plan cell on a 128³
 * volume `runs` times and prints JSON { wallMs[], baselineRssMiB, peakRssMiB }.
 * Usage: tsx tests/bench/volume-cell-process.ts <method-json> <runs>
 * The volume: the 32³ test volume (Debian mricron-data inia19-t1-brain, tests/volume/fixture.ts)
 * resampled trilinearly to 128³ — smoother than a real 128³ scan, the same work.
 */
import { planCells, runCell, validatePlan } from '../../src/plan/index.ts';
import { resampleTrilinear } from '../../src/volume/resample-volume.ts';
import { fixtureVolume } from '../volume/fixture.ts';

const method = JSON.parse(process.argv[2] ?? '{"name":"zero-filled"}');
const runs = Number(process.argv[3] ?? 3);
const n = 128;
const volume = resampleTrilinear(await fixtureVolume(), n, n, n);
const plan = validatePlan(
  {
    source: { imageId: 'brain' },
    matrix: { nx: n, ny: n, nz: n },
    protocol: { trMs: 8 },
    patterns: [{ pattern: 'poisson-disc' }],
    accelerations: [4],
    methods: [method],
    seeds: 1,
    acquisitions: ['3d'],
  },
  { checkMasks: false },
);
const cell = planCells(plan).find((c) => !c.reference);
if (!cell) throw new Error('no 3D cell');
const ctx = { loadVolume: async () => volume };
const baselineRssMiB = process.memoryUsage().rss / 2 ** 20;
const wallMs: number[] = [];
let nrmse = 0;
for (let i = 0; i < runs; i++) {
  const t0 = performance.now();
  const result = await runCell(plan, cell, ctx);
  wallMs.push(performance.now() - t0);
  nrmse = result.metrics.nrmse ?? Number.NaN;
}
// maxRSS is in KiB (Node's process.resourceUsage).
const peakRssMiB = process.resourceUsage().maxRSS / 1024;
console.log(JSON.stringify({ wallMs, baselineRssMiB, peakRssMiB, nrmse }));
