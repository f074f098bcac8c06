/**
 * The defaults before and after tuning on anatomy never used in tuning (scripts/tuning/held-out-set.ts):
 *   cs-tv           phantom rule 0.002·(1/f − 1) ≤ 0.05  against  the anatomy rule (defaultTvLambda)
 *   cs-wavelet      phantom rule 0.00025·(1/f − 1) ≤ 0.02  against  the current default
 *   lowrank-hankel  the acquired-fraction rank rule  against  the spectrum rules (`--spectrum=gd-complete,e99`,
 *                   hankel-spectrum.ts)
 *
 *   npx tsx scripts/tuning/held-out.ts --n=96 --shard=0/2 --out=/tmp/held-out-0.csv   (and 1/2; join the rows)
 *   npx tsx scripts/tuning/held-out.ts summary --in=docs/tuning/held-out.csv
 *
 * Same masks and accelerations as the tuning (scripts/tuning/cases.ts), noiseless, one CSV row per run.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { fft2c } from '../../src/core/centered-fft.ts';
import { complexFromReal } from '../../src/core/complex-image.ts';
import { runCase, scriptArguments, TUNING_ACCELERATIONS, TUNING_MASKS } from './cases.ts';
import { loadHeldOutSet } from './held-out-set.ts';
import { ruleRanks } from './rank-rules.ts';
import { TUNED_METHODS } from './tuned-methods.ts';

const HEADER = 'slice,mask,acceleration,fraction,method,rule,parameter,nrmse,ssim';

async function run(args: Map<string, string>): Promise<void> {
  const n = Number(args.get('n') ?? 96);
  const [shard, shards] = (args.get('shard') ?? '0/1').split('/').map(Number);
  const out = args.get('out') ?? '/tmp/held-out.csv';
  const spectrumRules = (args.get('spectrum') ?? 'gd-complete').split(',');
  const set = (await loadHeldOutSet(n)).filter((_, i) => i % shards === shard);
  const lines = [HEADER];
  for (const slice of set) {
    const full = fft2c(complexFromReal(slice.image.data, n, n)).data;
    for (const [maskName, sampling] of Object.entries(TUNING_MASKS)) {
      for (const acceleration of TUNING_ACCELERATIONS) {
        const mask = sampling(acceleration);
        const row = (
          method: string,
          rule: string,
          parameter: number,
          r: Awaited<ReturnType<typeof runCase>>,
        ) =>
          lines.push(
            [
              slice.label,
              maskName,
              acceleration,
              r.fraction.toFixed(4),
              method,
              rule,
              parameter.toPrecision(3),
              r.metrics.nrmse.toFixed(5),
              r.metrics.ssim.toFixed(5),
            ].join(','),
          );
        for (const name of ['cs-tv', 'cs-wavelet'] as const) {
          const after = await runCase(slice.image, mask, { name });
          const lambdaBefore = TUNED_METHODS[name].phantomRule(after.fraction);
          const before = await runCase(slice.image, mask, { name, lambda: lambdaBefore });
          row(name, 'phantom-rule', lambdaBefore, before);
          row(name, String(after.info.lambdaRule), Number(after.info.lambda), after);
        }
        // The rank rules see the mask the pipeline drew (the runs above share it: same seed).
        const zeroFilled = await runCase(slice.image, mask, { name: 'zero-filled' });
        const ranks = ruleRanks(full, zeroFilled.mask, n);
        for (const rule of ['fraction-default', ...spectrumRules]) {
          const rank = ranks[rule];
          if (rank === null) continue;
          row(
            'lowrank-hankel',
            rule,
            rank,
            await runCase(slice.image, mask, { name: 'lowrank-hankel', rank }),
          );
        }
      }
    }
    writeFileSync(out, `${lines.join('\n')}\n`);
    console.log(`${slice.label} done`);
  }
}

/** Per method: mean NRMSE and SSIM before and after, and the cases each rule wins. */
function summary(args: Map<string, string>): void {
  const [header, ...body] = readFileSync(args.get('in') ?? '/tmp/held-out.csv', 'utf8')
    .trim()
    .split('\n');
  if (header !== HEADER) throw new Error(`unexpected header ${header}`);
  const out = args.get('out');
  const runs = body.map((line) => {
    const [slice, mask, acceleration, , method, rule, , nrmse, ssim] = line.split(',');
    return {
      key: `${slice}|${mask}|${acceleration}`,
      slice,
      method,
      rule,
      nrmse: Number(nrmse),
      ssim: Number(ssim),
    };
  });
  const lines = [
    'method,group,rule_before,rule_after,cases,nrmse_before,nrmse_after,ssim_before,ssim_after,nrmse_median_change_pct,nrmse_wins_after,ssim_wins_after',
  ];
  const groups: [string, (slice: string) => boolean][] = [
    ['all', () => true],
    ['independent', (slice) => /^(MR_small|anatomical):/.test(slice)],
    ['other-slices', (slice) => !/^(MR_small|anatomical):/.test(slice)],
  ];
  for (const method of [...new Set(runs.map((r) => r.method))]) {
    const mine = runs.filter((r) => r.method === method);
    const [before, ...afters] = [...new Set(mine.map((r) => r.rule))];
    for (const after of afters)
      for (const [group, inGroup] of groups) {
        const pairs = [...new Set(mine.map((r) => r.key))]
          .map((key) => [before, after].map((rule) => mine.find((r) => r.key === key && r.rule === rule)))
          .filter(
            (pair): pair is [(typeof runs)[number], (typeof runs)[number]] =>
              !!pair[0] && !!pair[1] && inGroup(pair[0].slice),
          );
        const mean = (pick: (p: (typeof pairs)[number]) => number) =>
          pairs.reduce((s, p) => s + pick(p), 0) / pairs.length;
        lines.push(
          [
            method,
            group,
            before,
            after,
            pairs.length,
            mean((p) => p[0].nrmse).toFixed(5),
            mean((p) => p[1].nrmse).toFixed(5),
            mean((p) => p[0].ssim).toFixed(5),
            mean((p) => p[1].ssim).toFixed(5),
            medianChangePercent(pairs.map((p) => p[1].nrmse / p[0].nrmse - 1)),
            pairs.filter((p) => p[1].nrmse < p[0].nrmse).length,
            pairs.filter((p) => p[1].ssim > p[0].ssim).length,
          ].join(','),
        );
      }
  }
  console.log(lines.join('\n'));
  if (out) writeFileSync(out, `${lines.join('\n')}\n`);
}

function medianChangePercent(changes: number[]): string {
  const sorted = [...changes].sort((p, q) => p - q);
  const k = sorted.length;
  const median = k % 2 ? sorted[(k - 1) / 2] : 0.5 * (sorted[k / 2 - 1] + sorted[k / 2]);
  return (100 * median).toFixed(1);
}

const [command, ...rest] = process.argv.slice(2);
const args = scriptArguments(command.startsWith('--') ? [command, ...rest] : rest);
if (command === 'summary') summary(args);
else await run(args);
