/**
 * One process per measurement, so its peak RSS is the cell's own: runs a 3D plan cell on a 128³
 * volume `runs` times and prints JSON { wallMs[], baselineRssMiB, peakRssMiB }.
 * Usage: tsx tests/bench/volume-cell-process.ts <method-json> <runs>
 * The volume: the 32³ test volume (Debian mricron-data inia19-t1-brain, tests/volume/fixture.ts)
 * resampled trilinearly to 128³ — smoother than a real 128³ scan, the same work.
 */
import { planCells, validatePlan } from '../../src/plan/index.ts';
import { resampleTrilinear } from '../../src/volume/resample-volume.ts';
import { fixtureVolume } from '../volume/fixture.ts';
import { timedCellRuns } from './cell-runs.ts';

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
const { wallMs, peakRssMiB, nrmse } = await timedCellRuns(plan, cell, ctx, runs);
console.log(JSON.stringify({ wallMs, baselineRssMiB, peakRssMiB, nrmse }));
