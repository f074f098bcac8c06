/**
 * Rank rules from the singular-value spectrum of lowrank-hankel against the acquired-fraction rule
 * and the best fixed rank per case (docs/design.md §3.12, docs/tuning/lowrank-hankel-spectrum.csv).
 *
 *   npx tsx scripts/tuning/hankel-spectrum.ts candidates --set=tuning --out=/tmp/spectrum-tuning.csv
 *   npx tsx scripts/tuning/lowrank-ssim.ts --accelerations=2,4,8 --ranks=8,9,…,44 --out=/tmp/ranks.csv
 *   npx tsx scripts/tuning/hankel-spectrum.ts evaluate --candidates=/tmp/spectrum-tuning.csv \
 *     --ranks=/tmp/ranks.csv --out=docs/tuning/lowrank-hankel-spectrum.csv
 *
 * candidates: per slice × mask × R of the set (tuning or held-out), the rank each rule picks at the
 * default 7×7 window and 'gradient' weighting, without reconstructing:
 *   fraction      the acquired-fraction rule (defaultHankelRank)
 *   gd-complete   optimal hard threshold (Gavish & Donoho 2014) on the rows of complete windows
 *   gd-zerofilled the same threshold on every window of the zero-filled k-space
 *   e90 … e999    smallest rank keeping 90 / 95 / 99 / 99.9 % of Σσ² of the complete windows
 * evaluate: joins the candidates with a fixed-rank sweep (lowrank-ssim.ts rows) and reports per
 * case NRMSE and SSIM at each rule's rank and at the best rank; a rank the sweep lacks is marked.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { fft2c } from '../../src/core/centered-fft.ts';
import { complexFromReal } from '../../src/core/complex-image.ts';
import { parseReconstructionRequest, runReconstruction } from '../../src/pipeline/run-reconstruction.ts';
import { acquiredHankelSpectrum, defaultHankelRank, hardThresholdRank } from '../../src/recon/hankel-rank.ts';
import { rankForEnergy } from '../../src/recon/lowrank-hankel.ts';
import { loadTuningSet, type TuningSlice } from './anatomy-set.ts';
import { runCase, scriptArguments, TUNING_ACCELERATIONS, TUNING_MASKS } from './cases.ts';
import { loadHeldOutSet } from './held-out-set.ts';

const KERNEL: [number, number] = [7, 7];
const ENERGIES = [0.9, 0.95, 0.99, 0.999];
export const RULES = ['fraction', 'gd-complete', 'gd-zerofilled', ...ENERGIES.map(energyLabel)];

function energyLabel(energy: number): string {
  return `e${String(energy).slice(2).padEnd(2, '0')}`;
}

export async function loadSet(name: string, n: number): Promise<TuningSlice[]> {
  if (name === 'tuning') return loadTuningSet(n);
  if (name === 'held-out') return loadHeldOutSet(n);
  throw new Error(`--set=${name}: tuning or held-out`);
}

/** The rank every rule picks for the acquired samples of `full` (n×n k-space) under `mask`; null where a rule has too few complete windows. */
export function ruleRanks(full: Float64Array, mask: Uint8Array, n: number): Record<string, number | null> {
  const zeroFilled = full.map((v, i) => (mask[i >> 1] ? v : 0));
  const complete = acquiredHankelSpectrum(full, mask, n, n, KERNEL, 'gradient');
  const everyWindow = acquiredHankelSpectrum(
    zeroFilled,
    new Uint8Array(n * n).fill(1),
    n,
    n,
    KERNEL,
    'gradient',
  );
  const power = complete.singularValues.map((s) => s * s);
  return {
    fraction: defaultHankelRank(KERNEL[0] * KERNEL[1], mask),
    'gd-complete': hardThresholdRank(complete),
    'gd-zerofilled': hardThresholdRank(everyWindow),
    ...Object.fromEntries(
      ENERGIES.map((e) => [energyLabel(e), complete.rows > 0 ? rankForEnergy(power, e) : null]),
    ),
  };
}

function completeWindowCount(mask: Uint8Array, n: number): number {
  return acquiredHankelSpectrum(new Float64Array(2 * n * n), mask, n, n, KERNEL, 'none').rows;
}

async function candidates(args: Map<string, string>): Promise<void> {
  const n = Number(args.get('n') ?? 96);
  const set = await loadSet(args.get('set') ?? 'tuning', n);
  const out = args.get('out') ?? '/tmp/spectrum-candidates.csv';
  const lines = [`slice,mask,acceleration,fraction,complete_windows,${RULES.join(',')}`];
  for (const slice of set) {
    const full = fft2c(complexFromReal(slice.image.data, n, n)).data;
    for (const [maskName, sampling] of Object.entries(TUNING_MASKS)) {
      for (const acceleration of TUNING_ACCELERATIONS) {
        const request = parseReconstructionRequest({
          source: { imageId: 'tuning' },
          matrix: { nx: n, ny: n },
          sampling: sampling(acceleration),
          method: { name: 'zero-filled' },
        });
        const outcome = await runReconstruction(request, undefined, { loadImage: async () => slice.image });
        const ranks = ruleRanks(full, outcome.sampled.mask, n);
        const complete = completeWindowCount(outcome.sampled.mask, n);
        lines.push(
          [
            slice.label,
            maskName,
            acceleration,
            outcome.fraction.toFixed(4),
            complete,
            ...RULES.map((r) => ranks[r] ?? ''),
          ].join(','),
        );
      }
    }
    writeFileSync(out, `${lines.join('\n')}\n`);
    console.log(`${slice.label} done`);
  }
}

/** Fixed ranks run for every case besides the rules' picks, for the best rank per case. */
const COARSE_RANKS = [12, 18, 25, 32, 38];

/**
 * Every case of the set at the union of the rules' ranks and COARSE_RANKS (lowrank-hankel, 7×7,
 * 'gradient', default iterations): one row per run; the candidates file beside it. Cases already in
 * `--have` (rows of an earlier sweep) are left out.
 */
async function sweep(args: Map<string, string>): Promise<void> {
  const n = Number(args.get('n') ?? 96);
  const [shard, shards] = (args.get('shard') ?? '0/1').split('/').map(Number);
  const set = (await loadSet(args.get('set') ?? 'tuning', n)).filter((_, i) => i % shards === shard);
  const out = args.get('out') ?? '/tmp/spectrum-ranks.csv';
  const have = new Set(
    (args.get('have')?.split(',') ?? [])
      .flatMap(readCsv)
      .map((r) => `${r.slice}|${r.mask}|${r.acceleration}`),
  );
  const lines = ['slice,mask,acceleration,fraction,rank,nrmse,ssim'];
  const picks = [`slice,mask,acceleration,fraction,complete_windows,${RULES.join(',')}`];
  for (const slice of set) {
    const full = fft2c(complexFromReal(slice.image.data, n, n)).data;
    for (const [maskName, sampling] of Object.entries(TUNING_MASKS)) {
      for (const acceleration of TUNING_ACCELERATIONS) {
        const zeroFilled = await runCase(slice.image, sampling(acceleration), { name: 'zero-filled' });
        const ranks = ruleRanks(full, zeroFilled.mask, n);
        const fraction = zeroFilled.fraction.toFixed(4);
        const head = [slice.label, maskName, acceleration, fraction];
        picks.push(
          [...head, completeWindowCount(zeroFilled.mask, n), ...RULES.map((r) => ranks[r] ?? '')].join(','),
        );
        if (have.has(`${slice.label}|${maskName}|${acceleration}`)) continue;
        const toRun = new Set([
          ...COARSE_RANKS,
          ...Object.values(ranks).filter((r): r is number => r !== null),
        ]);
        for (const rank of [...toRun].sort((p, q) => p - q)) {
          const run = await runCase(slice.image, sampling(acceleration), { name: 'lowrank-hankel', rank });
          lines.push([...head, rank, run.metrics.nrmse.toFixed(5), run.metrics.ssim.toFixed(5)].join(','));
        }
        writeFileSync(out, `${lines.join('\n')}\n`);
        writeFileSync(out.replace(/\.csv$/, '-candidates.csv'), `${picks.join('\n')}\n`);
        console.log(`${slice.label} ${maskName} R ${acceleration} done`);
      }
    }
  }
  writeFileSync(out.replace(/\.csv$/, '-candidates.csv'), `${picks.join('\n')}\n`);
}

function readCsv(path: string): Record<string, string>[] {
  const [header, ...body] = readFileSync(path, 'utf8').trim().split('\n');
  const keys = header.split(',');
  return body.map((line) => Object.fromEntries(line.split(',').map((v, i) => [keys[i], v])));
}

function evaluate(args: Map<string, string>): void {
  const picks = readCsv(args.get('candidates') ?? '/tmp/spectrum-candidates.csv');
  const sweep = (args.get('ranks') ?? '/tmp/ranks.csv').split(',').flatMap(readCsv);
  const out = args.get('out') ?? '/tmp/spectrum-evaluation.csv';
  const runs = new Map<string, { nrmse: number; ssim: number }>();
  for (const row of sweep) {
    if (!row.rank) continue;
    runs.set(`${row.slice}|${row.mask}|${row.acceleration}|${row.rank}`, {
      nrmse: Number(row.nrmse),
      ssim: Number(row.ssim),
    });
  }
  const lines = ['slice,mask,acceleration,fraction,rule,rank,nrmse,ssim'];
  const totals = new Map<string, { nrmse: number; ssim: number; cases: number; missing: number }>();
  for (const pick of picks) {
    const key = `${pick.slice}|${pick.mask}|${pick.acceleration}`;
    const swept = [...runs.entries()].filter(([k]) => k.startsWith(`${key}|`));
    const best = swept.reduce((p, q) => (q[1].nrmse < p[1].nrmse ? q : p));
    const bestSsim = swept.reduce((p, q) => (q[1].ssim > p[1].ssim ? q : p));
    const entries: [string, string, { nrmse: number; ssim: number } | undefined][] = [
      ...RULES.map((rule): [string, string, { nrmse: number; ssim: number } | undefined] => [
        rule,
        pick[rule],
        runs.get(`${key}|${pick[rule]}`),
      ]),
      ['best-nrmse', best[0].split('|')[3], best[1]],
      ['best-ssim', bestSsim[0].split('|')[3], bestSsim[1]],
    ];
    for (const [rule, rank, run] of entries) {
      lines.push(
        [
          pick.slice,
          pick.mask,
          pick.acceleration,
          pick.fraction,
          rule,
          rank,
          run ? run.nrmse.toFixed(5) : '',
          run ? run.ssim.toFixed(5) : '',
        ].join(','),
      );
      const total = totals.get(rule) ?? { nrmse: 0, ssim: 0, cases: 0, missing: 0 };
      if (run) {
        total.nrmse += run.nrmse;
        total.ssim += run.ssim;
        total.cases++;
      } else total.missing++;
      totals.set(rule, total);
    }
  }
  writeFileSync(out, `${lines.join('\n')}\n`);
  for (const [rule, t] of totals) {
    console.log(
      `${rule.padEnd(14)} mean NRMSE ${(t.nrmse / t.cases).toFixed(5)}  mean SSIM ${(t.ssim / t.cases).toFixed(5)}  cases ${t.cases}  missing ${t.missing}`,
    );
  }
}

const [command, ...rest] = process.argv.slice(2);
const args = scriptArguments(rest);
if (command === 'candidates') await candidates(args);
else if (command === 'sweep') await sweep(args);
else if (command === 'evaluate') evaluate(args);
else console.error('usage: hankel-spectrum.ts candidates|evaluate [--set=tuning|held-out] [--out=…]');
