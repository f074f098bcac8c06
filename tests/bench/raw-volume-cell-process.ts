/**
 * One process per measurement, so its peak RSS is the cell's own: imports a 3D ISMRMRD file
 * (importRawKspace, as POST /v1/raw does on a worker) and runs one 3D plan cell on it `runs` times
 * (Poisson-disc R = 4 on the ky–kz plane, every hybrid-space x-plane in this thread). Prints JSON
 * { importMs, wallMs[], baselineRssMiB, peakRssMiB, nrmse }.
 * Usage: tsx tests/bench/raw-volume-cell-process.ts FILE <method-json> <runs>
 */
import { readFileSync } from 'node:fs';
import { defaultLimits } from '../../src/core/limits.ts';
import { importRawKspace } from '../../src/io/ismrmrd/import-raw-kspace.ts';
import { planCells, validatePlan } from '../../src/plan/index.ts';
import { timedCellRuns } from './cell-runs.ts';

const [path, methodJson, runsText] = process.argv.slice(2);
const method = JSON.parse(methodJson ?? '{"name":"zero-filled"}');
const runs = Number(runsText ?? 3);
const bytes = new Uint8Array(readFileSync(path));
const baselineRssMiB = process.memoryUsage().rss / 2 ** 20;
const t0 = performance.now();
const raw = await importRawKspace(bytes, { ...defaultLimits, maxUploadBytes: 256 * 2 ** 20 });
const importMs = performance.now() - t0;
const { nx, ny, nz } = raw.facts;
const plan = validatePlan(
  {
    source: { rawId: 'bench' },
    matrix: { nx, ny, nz },
    protocol: { trMs: 8 },
    patterns: [{ pattern: 'poisson-disc' }],
    accelerations: [4],
    methods: [method],
    seeds: 1,
  },
  { checkMasks: false },
);
const cell = planCells(plan).find((c) => !c.reference);
if (!cell) throw new Error('no 3D cell');
const { wallMs, peakRssMiB, nrmse } = await timedCellRuns(plan, cell, { loadRaw: async () => raw }, runs);
console.log(JSON.stringify({ importMs, wallMs, baselineRssMiB, peakRssMiB, nrmse }));
