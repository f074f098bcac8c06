/**
 * Tunes the default λ of cs-tv and cs-wavelet on real anatomy (docs/design.md §3.12); `--method=cs-wavelet`
 * for the wavelet method (default cs-tv), at its default wavelet, levels and iterations.
 *
 *   npx tsx scripts/tune-defaults.ts sweep --n=96 --shard=0/2 --out=/tmp/sweep-0.csv
 *   npx tsx scripts/tune-defaults.ts sweep --n=96 --masks=vd-lines,poisson-disc --accelerations=8 \
 *     --lambdas=0.0512,0.1024 --out=/tmp/sweep-2.csv     (extends the grid where its end was best)
 *   npx tsx scripts/tune-defaults.ts fit --in=docs/tuning/cs-tv-sweep.csv (the sweeps joined) \
 *     --exclude=poisson-disc:8
 *   npx tsx scripts/tune-defaults.ts compare --n=96 --shard=0/2 --out=/tmp/compare-0.csv   (and 1/2; join the rows)
 *   npx tsx scripts/tune-defaults.ts sweep --method=cs-wavelet --out=/tmp/cs-wavelet-sweep.csv   (and so on)
 *
 * sweep: every slice of the tuning set (scripts/tuning/anatomy-set.ts) × mask × R × λ on a log
 * grid, noiseless, through runReconstruction; one CSV row per run.
 * fit: the best-NRMSE (and best-SSIM) λ per case, refined by a parabola in log λ through the
 * grid minimum and its neighbours; the least-squares line log λ = log a + b·log(1/f − 1) over the
 * cases; writes docs/tuning/<method>-defaults.csv (one row per mask and R). `--exclude=mask:R,…`
 * leaves out failed acquisitions (at 96² the Poisson-disc mask of R 8 without a calibration square
 * gives NRMSE 0.5–0.7 at every λ: not a question of λ).
 * compare: the phantom rule (tuning/tuned-methods.ts) against the current default on every case.
 * Needs Debian's mricron-data and python3-nibabel (apt-get install mricron-data python3-nibabel).
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { loadTuningSet } from './tuning/anatomy-set.ts';
import { runCase, scriptArguments, TUNING_ACCELERATIONS, TUNING_MASKS } from './tuning/cases.ts';
import { tunedMethod } from './tuning/tuned-methods.ts';

interface SweepRow {
  slice: string;
  mask: string;
  acceleration: number;
  fraction: number;
  lambda: number;
  nrmse: number;
  ssim: number;
  iterations: number;
}

const SWEEP_HEADER = 'slice,mask,acceleration,fraction,lambda,nrmse,ssim,iterations';

async function sweep(args: Map<string, string>): Promise<void> {
  const n = Number(args.get('n') ?? 96);
  const [shard, shards] = (args.get('shard') ?? '0/1').split('/').map(Number);
  const { name, method } = tunedMethod(args);
  const out = args.get('out') ?? `/tmp/${name}-sweep.csv`;
  const list = (name: string) => args.get(name)?.split(',');
  const masks = list('masks') ?? Object.keys(TUNING_MASKS);
  const accelerations = list('accelerations')?.map(Number) ?? TUNING_ACCELERATIONS;
  const lambdas = list('lambdas')?.map(Number) ?? method.grid;
  const set = await loadTuningSet(n);
  const lines = [SWEEP_HEADER];
  let job = 0;
  for (const slice of set) {
    for (const mask of masks) {
      const sampling = TUNING_MASKS[mask];
      for (const acceleration of accelerations) {
        if (job++ % shards !== shard) continue;
        for (const lambda of lambdas) {
          const run = await runCase(slice.image, sampling(acceleration), { name, lambda });
          lines.push(
            [
              slice.label,
              mask,
              acceleration,
              run.fraction.toFixed(4),
              lambda,
              run.metrics.nrmse.toFixed(5),
              run.metrics.ssim.toFixed(5),
              run.info.iterations,
            ].join(','),
          );
        }
        writeFileSync(out, `${lines.join('\n')}\n`);
        console.log(`${slice.label} ${mask} R ${acceleration} done`);
      }
    }
  }
}

function readSweep(paths: string[]): SweepRow[] {
  const rows: SweepRow[] = [];
  for (const path of paths) {
    const [header, ...body] = readFileSync(path, 'utf8').trim().split('\n');
    if (header !== SWEEP_HEADER) throw new Error(`${path}: unexpected header ${header}`);
    for (const line of body) {
      const [slice, mask, ...values] = line.split(',');
      const [acceleration, fraction, lambda, nrmse, ssim, iterations] = values.map(Number);
      rows.push({ slice, mask, acceleration, fraction, lambda, nrmse, ssim, iterations });
    }
  }
  return rows;
}

/**
 * The λ minimising `score` over a grid sorted by λ: the parabola in log λ through the grid minimum
 * and its two neighbours (the grid end when the minimum sits on it).
 */
export function refinedMinimum(lambdas: number[], scores: number[]): number {
  let best = 0;
  for (let i = 1; i < scores.length; i++) if (scores[i] < scores[best]) best = i;
  if (best === 0 || best === scores.length - 1) return lambdas[best];
  const [x0, x1, x2] = [best - 1, best, best + 1].map((i) => Math.log(lambdas[i]));
  const [y0, y1, y2] = [scores[best - 1], scores[best], scores[best + 1]];
  const denominator = (x0 - x1) * (x0 - x2) * (x1 - x2);
  const a = (x2 * (y1 - y0) + x1 * (y0 - y2) + x0 * (y2 - y1)) / denominator;
  const b = (x2 * x2 * (y0 - y1) + x1 * x1 * (y2 - y0) + x0 * x0 * (y1 - y2)) / denominator;
  if (!(a > 0)) return lambdas[best];
  return Math.exp(Math.min(x2, Math.max(x0, -b / (2 * a))));
}

interface CaseOptimum {
  slice: string;
  mask: string;
  acceleration: number;
  fraction: number;
  lambdaNrmse: number;
  lambdaSsim: number;
  /** The best NRMSE on the grid. */
  nrmse: number;
}

function optima(rows: SweepRow[]): CaseOptimum[] {
  const cases = new Map<string, SweepRow[]>();
  for (const row of rows) {
    const key = `${row.slice}|${row.mask}|${row.acceleration}`;
    cases.set(key, [...(cases.get(key) ?? []), row]);
  }
  return [...cases.values()].map((runs) => {
    runs.sort((p, q) => p.lambda - q.lambda);
    const lambdas = runs.map((r) => r.lambda);
    return {
      slice: runs[0].slice,
      mask: runs[0].mask,
      acceleration: runs[0].acceleration,
      fraction: runs[0].fraction,
      lambdaNrmse: refinedMinimum(
        lambdas,
        runs.map((r) => r.nrmse),
      ),
      lambdaSsim: refinedMinimum(
        lambdas,
        runs.map((r) => -r.ssim),
      ),
      nrmse: Math.min(...runs.map((r) => r.nrmse)),
    };
  });
}

/** Least-squares line y = c + b·x. */
function lineFit(xs: number[], ys: number[]): { c: number; b: number; residualSd: number } {
  const n = xs.length;
  const mx = xs.reduce((s, v) => s + v, 0) / n;
  const my = ys.reduce((s, v) => s + v, 0) / n;
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < n; i++) {
    sxy += (xs[i] - mx) * (ys[i] - my);
    sxx += (xs[i] - mx) ** 2;
  }
  const b = sxy / sxx;
  const c = my - b * mx;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (ys[i] - c - b * xs[i]) ** 2;
  return { c, b, residualSd: Math.sqrt(ss / Math.max(1, n - 2)) };
}

const geometricMean = (values: number[]) =>
  Math.exp(values.reduce((s, v) => s + Math.log(v), 0) / values.length);

function fitRule(args: Map<string, string>): void {
  const { name, method } = tunedMethod(args);
  const inputs = (args.get('in') ?? `/tmp/${name}-sweep.csv`).split(',');
  const out = args.get('out') ?? `docs/tuning/${name}-defaults.csv`;
  const excluded = new Set((args.get('exclude') ?? '').split(',').filter(Boolean));
  const cases = optima(readSweep(inputs)).filter((c) => !excluded.has(`${c.mask}:${c.acceleration}`));
  const xs = cases.map((c) => Math.log(1 / c.fraction - 1));
  const line = lineFit(
    xs,
    cases.map((c) => Math.log(c.lambdaNrmse)),
  );
  const ssimLine = lineFit(
    xs,
    cases.map((c) => Math.log(c.lambdaSsim)),
  );
  console.log(
    `best-NRMSE λ ≈ ${Math.exp(line.c).toPrecision(3)}·(1/f − 1)^${line.b.toFixed(3)} ` +
      `(${cases.length} cases, residual sd of log λ ${line.residualSd.toFixed(3)})`,
  );
  console.log(
    `best-SSIM  λ ≈ ${Math.exp(ssimLine.c).toPrecision(3)}·(1/f − 1)^${ssimLine.b.toFixed(3)} ` +
      `(residual sd of log λ ${ssimLine.residualSd.toFixed(3)})`,
  );
  const lines = [
    'mask,acceleration,fraction,cases,lambda_best_nrmse_geomean,lambda_best_nrmse_min,lambda_best_nrmse_max,lambda_best_ssim_geomean,lambda_default,lambda_phantom_rule',
  ];
  for (const mask of Object.keys(TUNING_MASKS)) {
    for (const acceleration of TUNING_ACCELERATIONS) {
      const group = cases.filter((c) => c.mask === mask && c.acceleration === acceleration);
      if (group.length === 0) continue;
      const fraction = group.reduce((s, c) => s + c.fraction, 0) / group.length;
      const best = group.map((c) => c.lambdaNrmse);
      lines.push(
        [
          mask,
          acceleration,
          fraction.toFixed(4),
          group.length,
          geometricMean(best).toPrecision(3),
          Math.min(...best).toPrecision(3),
          Math.max(...best).toPrecision(3),
          geometricMean(group.map((c) => c.lambdaSsim)).toPrecision(3),
          method.defaultLambda(fraction).toPrecision(3),
          method.phantomRule(fraction).toPrecision(3),
        ].join(','),
      );
    }
  }
  writeFileSync(out, `${lines.join('\n')}\n`);
  console.log(lines.join('\n'));
}

async function compare(args: Map<string, string>): Promise<void> {
  const n = Number(args.get('n') ?? 96);
  const { name, method } = tunedMethod(args);
  const out = args.get('out') ?? `docs/tuning/${name}-before-after.csv`;
  const [shard, shards] = (args.get('shard') ?? '0/1').split('/').map(Number);
  const set = (await loadTuningSet(n)).filter((_, i) => i % shards === shard);
  const lines = [
    'slice,mask,acceleration,fraction,lambda_before,nrmse_before,ssim_before,lambda_after,nrmse_after,ssim_after',
  ];
  for (const slice of set) {
    for (const [mask, sampling] of Object.entries(TUNING_MASKS)) {
      for (const acceleration of TUNING_ACCELERATIONS) {
        const after = await runCase(slice.image, sampling(acceleration), { name });
        const lambdaBefore = method.phantomRule(after.fraction);
        const before = await runCase(slice.image, sampling(acceleration), { name, lambda: lambdaBefore });
        lines.push(
          [
            slice.label,
            mask,
            acceleration,
            after.fraction.toFixed(4),
            lambdaBefore.toPrecision(3),
            before.metrics.nrmse.toFixed(5),
            before.metrics.ssim.toFixed(5),
            Number(after.info.lambda).toPrecision(3),
            after.metrics.nrmse.toFixed(5),
            after.metrics.ssim.toFixed(5),
          ].join(','),
        );
      }
    }
    writeFileSync(out, `${lines.join('\n')}\n`);
    console.log(`${slice.label} done`);
  }
}

const [command, ...rest] = process.argv.slice(2);
const args = scriptArguments(rest);
if (command === 'sweep') await sweep(args);
else if (command === 'fit') fitRule(args);
else if (command === 'compare') await compare(args);
else console.error('usage: tune-defaults.ts sweep|fit|compare [--n=96] [--shard=i/k] [--in=…] [--out=…]');
