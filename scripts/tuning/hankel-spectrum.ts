/**
 * Rank rules from the singular-value spectrum of lowrank-hankel against the acquired-fraction rule
 * and the best fixed rank per case (docs/design.md §3.12, docs/tuning/lowrank-hankel-spectrum.csv).
 *
 *   npx tsx scripts/tuning/hankel-spectrum.ts sweep --set=tuning --out=/tmp/spectrum-ranks.csv
 *     (writes /tmp/spectrum-ranks-candidates.csv beside it; --have=a.csv,… skips cases already run)
 *   npx tsx scripts/tuning/hankel-spectrum.ts evaluate --candidates=/tmp/spectrum-ranks-candidates.csv \
 *     --ranks=/tmp/spectrum-ranks.csv,… --out=docs/tuning/lowrank-hankel-spectrum.csv
 *
 * sweep: per slice × mask × R of the set (tuning or held-out), the rank each rule of rank-rules.ts
 * picks at the default 7×7 window and 'gradient' weighting, and lowrank-hankel run at those ranks
 * and at a few fixed ones (rows of lowrank-ssim.ts's fixed-rank sweeps can be joined in).
 * evaluate: per case NRMSE and SSIM at each rule's rank and at the best rank run; a rank not run is
 * marked missing.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { fft2c } from '../../src/core/centered-fft.ts';
import { complexFromReal } from '../../src/core/complex-image.ts';
import { loadTuningSet, type TuningSlice } from './anatomy-set.ts';
import { runCase, scriptArguments, TUNING_ACCELERATIONS, TUNING_MASKS } from './cases.ts';
import { loadHeldOutSet } from './held-out-set.ts';
import { completeWindowCount, RULES, ruleRanks } from './rank-rules.ts';

export async function loadSet(name: string, n: number): Promise<TuningSlice[]> {
  if (name === 'tuning') return loadTuningSet(n);
  if (name === 'held-out') return loadHeldOutSet(n);
  throw new Error(`--set=${name}: tuning or held-out`);
}

/** Fixed ranks run for every case besides the rules' picks, for the best rank per case. */
const COARSE_RANKS = [18, 25, 32];
/** The rules whose picks are run (the energy rules 90 % and 99.9 % are listed, not run). */
const RUN_RULES = ['fraction-default', 'gd-complete', 'gd-zerofilled', 'e95', 'e99'];

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
        const picked = RUN_RULES.map((rule) => ranks[rule]).filter((r): r is number => r != null);
        const toRun = new Set([...COARSE_RANKS, ...picked]);
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

type Run = { nrmse: number; ssim: number };

/**
 * Per case and rule: the rule's rank (the fraction rule's where the rule has no complete windows
 * to work from, as the method would fall back) and its run; the best run of the case. Then per
 * rule, over the cases where its rank was run: means against the fraction rule's, and wins.
 */
function evaluate(args: Map<string, string>): void {
  const picks = readCsv(args.get('candidates') ?? '/tmp/spectrum-candidates.csv');
  const sweep = (args.get('ranks') ?? '/tmp/ranks.csv').split(',').flatMap(readCsv);
  const out = args.get('out') ?? '/tmp/spectrum-evaluation.csv';
  const summaryOut = args.get('summary');
  const runs = new Map<string, Run>();
  for (const row of sweep) {
    if (!row.rank) continue;
    runs.set(`${row.slice}|${row.mask}|${row.acceleration}|${row.rank}`, {
      nrmse: Number(row.nrmse),
      ssim: Number(row.ssim),
    });
  }
  const lines = ['slice,mask,acceleration,fraction,rule,rank,fallback,nrmse,ssim'];
  const paired = new Map<string, [Run, Run][]>();
  const missing = new Map<string, number>();
  for (const pick of picks) {
    const key = `${pick.slice}|${pick.mask}|${pick.acceleration}`;
    const swept = [...runs.entries()].filter(([k]) => k.startsWith(`${key}|`));
    if (swept.length === 0) continue;
    const best = swept.reduce((p, q) => (q[1].nrmse < p[1].nrmse ? q : p));
    const bestSsim = swept.reduce((p, q) => (q[1].ssim > p[1].ssim ? q : p));
    const fractionRun = runs.get(`${key}|${pick['fraction-default']}`);
    const entries: [string, string, boolean, Run | undefined][] = [
      ...RULES.map((rule): [string, string, boolean, Run | undefined] => {
        const rank = pick[rule] || pick['fraction-default'];
        return [rule, rank, !pick[rule], runs.get(`${key}|${rank}`)];
      }),
      ['best-nrmse', best[0].split('|')[3], false, best[1]],
      ['best-ssim', bestSsim[0].split('|')[3], false, bestSsim[1]],
    ];
    for (const [rule, rank, fallback, run] of entries) {
      lines.push(
        [
          pick.slice,
          pick.mask,
          pick.acceleration,
          pick.fraction,
          rule,
          rank,
          fallback ? 'yes' : '',
          run ? run.nrmse.toFixed(5) : '',
          run ? run.ssim.toFixed(5) : '',
        ].join(','),
      );
      if (run && fractionRun) paired.set(rule, [...(paired.get(rule) ?? []), [fractionRun, run]]);
      else missing.set(rule, (missing.get(rule) ?? 0) + 1);
    }
  }
  writeFileSync(out, `${lines.join('\n')}\n`);
  const summary = [
    'rule,cases,not_run,nrmse_fraction_rule,nrmse_rule,ssim_fraction_rule,ssim_rule,nrmse_lower,nrmse_higher,ssim_higher,ssim_lower',
  ];
  for (const [rule, pairs] of paired) {
    const mean = (pick: (pair: [Run, Run]) => number) =>
      pairs.reduce((s, p) => s + pick(p), 0) / pairs.length;
    summary.push(
      [
        rule,
        pairs.length,
        missing.get(rule) ?? 0,
        mean((p) => p[0].nrmse).toFixed(5),
        mean((p) => p[1].nrmse).toFixed(5),
        mean((p) => p[0].ssim).toFixed(5),
        mean((p) => p[1].ssim).toFixed(5),
        pairs.filter((p) => p[1].nrmse < p[0].nrmse).length,
        pairs.filter((p) => p[1].nrmse > p[0].nrmse).length,
        pairs.filter((p) => p[1].ssim > p[0].ssim).length,
        pairs.filter((p) => p[1].ssim < p[0].ssim).length,
      ].join(','),
    );
  }
  console.log(summary.join('\n'));
  if (summaryOut) writeFileSync(summaryOut, `${summary.join('\n')}\n`);
}

const [command, ...rest] = process.argv.slice(2);
const args = scriptArguments(rest);
if (command === 'sweep') await sweep(args);
else if (command === 'evaluate') evaluate(args);
else console.error('usage: hankel-spectrum.ts sweep|evaluate [--set=tuning|held-out] [--out=…]');
