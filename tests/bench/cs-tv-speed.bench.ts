import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fft2c, ifft2c } from '../../src/core/centered-fft.ts';
import { createComplexImage } from '../../src/core/complex-image.ts';
import { plainFft2d } from '../../src/core/plain-fft-2d.ts';
import { acquiredFraction, solveCsTv, zeroFilledPeak } from '../../src/recon/cs-tv.ts';
import { preconditionedSigma, solveCsTvPreconditioned } from '../../src/recon/cs-tv-preconditioned.ts';
import { reconstruct } from '../../src/recon/index.ts';
import { defaultTvLambda } from '../../src/recon/parameters.ts';
import { poissonDiscAcquisition } from '../recon/helpers.ts';
import { type BenchRow, cpuMs, median } from './timing.ts';

const PYTHON = '/usr/bin/python3';
const REFERENCE_SCRIPT = new URL('../reference/cs_tv_reference.py', import.meta.url).pathname;
/** Iterations of the reference timing (ours and numpy's plain Chambolle–Pock). */
const REFERENCE_ITERATIONS = 200;
/** Iterations recorded to find the minimum and the iterations each solver needs to approach it. */
const HISTORY_CAP = 3000;
/** Iterations of the run that fixes Φ*. */
const OPTIMUM_ITERATIONS = 3000;

/** Wall and CPU ms of one call. */
function timed(fn: () => unknown): { wall: number; cpu: number } {
  const w0 = performance.now();
  const c0 = cpuMs();
  fn();
  return { wall: performance.now() - w0, cpu: cpuMs() - c0 };
}

/**
 * Single-coil Cartesian cs-tv at 256² (modified Shepp–Logan, analytic k-space, Poisson-disc R = 4,
 * 24 ACS, the default λ rule: 0.0009·(1/f − 1)^1.75 relative): the plain Chambolle–Pock scheme
 * (`solveCsTv`, τ = σ = 0.99/√8) against the Fourier-preconditioned one the service runs
 * (`solveCsTvPreconditioned`).
 * - Iteration cost in fft2c + ifft2c pairs: 100 iterations (tolerance 0), 3 runs, the pair
 *   re-measured (batch of 10) before each; medians of the per-run ratios, wall and CPU time. The
 *   preconditioned loop runs on the un-centred plainFft2d (no centring copies), so it can cost less
 *   than one centred pair; it is also quoted against one raw un-centred pair.
 * - Time to a relative objective tolerance: Φ* is the lowest objective of the two solvers'
 *   HISTORY_CAP-iteration histories and of a 3000-iteration run of the preconditioned scheme at its
 *   fastest tail setting; the iterations each solver needs to reach Φ*(1 + tol) come from its
 *   objective history, times its median per-iteration time.
 * - A default request (`{ name: 'cs-tv' }`, default λ and stop) through `reconstruct`: median of 5.
 * - The reference: tests/reference/cs_tv_reference.py's numpy implementation of the plain scheme,
 *   200 iterations on the same data (its loop only), against our 200 plain iterations and our
 *   default request. Skipped, with the reason, when /usr/bin/python3 or numpy is missing.
 * The machine is shared: read ratios from one run, not absolute times.
 */
export async function benchCsTvSpeed(): Promise<BenchRow[]> {
  const n = 256;
  const { kspace, sampled } = poissonDiscAcquisition('shepp-logan-modified', n, 24, 1);
  const input = { kspace, mask: sampled.mask };
  const lambdaRelative = defaultTvLambda(acquiredFraction(sampled.mask));
  const lambda = lambdaRelative * zeroFilledPeak(input);
  const sigma = preconditionedSigma(lambdaRelative);
  const solvers = {
    plain: (iterations: number, tolerance: number, record?: (o: number) => void) =>
      solveCsTv(input, lambda, iterations, tolerance, undefined, record),
    preconditioned: (iterations: number, tolerance: number, record?: (o: number) => void) =>
      solveCsTvPreconditioned(input, lambda, iterations, tolerance, {
        sigma,
        ...(record ? { recordObjective: record } : {}),
      }),
  };

  const scratch = createComplexImage(n, n);
  scratch.data.set(kspace.data);
  const pair = () => {
    const t = timed(() => {
      for (let i = 0; i < 10; i++) {
        fft2c(scratch, scratch);
        ifft2c(scratch, scratch);
      }
    });
    return { wall: t.wall / 10, cpu: t.cpu / 10 };
  };
  // The solver's own transform pair: un-centred, no shift or normalisation pass (plainFft2d forward,
  // then its mirrored inverse), between the solver's buffers.
  const spectrum = new Float64Array(2 * n * n);
  const rawPair = () => {
    const t = timed(() => {
      for (let i = 0; i < 10; i++) {
        plainFft2d(spectrum, scratch.data, n, n, 1, false);
        plainFft2d(scratch.data, spectrum, n, n, 1 / (n * n), true);
      }
    });
    return { wall: t.wall / 10, cpu: t.cpu / 10 };
  };
  pair();
  rawPair();
  const rows: BenchRow[] = [];
  const pairWalls: number[] = [];
  const pairCpus: number[] = [];
  const rawWalls: number[] = [];
  const rawCpus: number[] = [];
  const perIteration: Record<string, number> = {};
  const costIterations = 100;
  for (const [name, solve] of Object.entries(solvers)) {
    solve(2, 0);
    const walls: number[] = [];
    const wallRatios: number[] = [];
    const cpuRatios: number[] = [];
    const rawWallRatios: number[] = [];
    const rawCpuRatios: number[] = [];
    for (let run = 0; run < 3; run++) {
      const reference = pair();
      const raw = rawPair();
      pairWalls.push(reference.wall);
      pairCpus.push(reference.cpu);
      rawWalls.push(raw.wall);
      rawCpus.push(raw.cpu);
      const t = timed(() => solve(costIterations, 0));
      walls.push(t.wall / costIterations);
      wallRatios.push(t.wall / costIterations / reference.wall);
      cpuRatios.push(t.cpu / costIterations / reference.cpu);
      rawWallRatios.push(t.wall / costIterations / raw.wall);
      rawCpuRatios.push(t.cpu / costIterations / raw.cpu);
    }
    perIteration[name] = median(walls);
    rows.push({
      name: `${name} iteration ${n}×${n}`,
      medianMs: perIteration[name],
      note:
        `${median(wallRatios).toFixed(2)}× one fft2c+ifft2c pair in wall time, ` +
        `${median(cpuRatios).toFixed(2)}× in CPU time; ${median(rawWallRatios).toFixed(2)}× / ` +
        `${median(rawCpuRatios).toFixed(2)}× (wall / CPU) one raw un-centred pair ` +
        `(medians of 3 runs of ${costIterations})`,
    });
  }
  rows.unshift({
    name: `fft2c+ifft2c ${n}×${n} (reference pair)`,
    medianMs: median(pairWalls),
    note: `CPU ${median(pairCpus).toFixed(2)} ms`,
  });
  rows.splice(1, 0, {
    name: `raw un-centred pair ${n}×${n} (plainFft2d forward + mirrored inverse)`,
    medianMs: median(rawWalls),
    note: `CPU ${median(rawCpus).toFixed(2)} ms`,
  });

  const histories: Record<string, number[]> = {};
  for (const [name, solve] of Object.entries(solvers)) {
    const history: number[] = [];
    solve(HISTORY_CAP, 0, (o) => history.push(o));
    histories[name] = history;
  }
  // Φ*: also a long run of the preconditioned scheme at the setting that was fastest to 1e-6 in a
  // sweep of σ and ρ at 256² (σ × 1.5, ρ = 1.9; docs/design.md §3.13).
  const longRun = solveCsTvPreconditioned(input, lambda, OPTIMUM_ITERATIONS, 0, {
    sigma: 1.5 * sigma,
    relaxation: 1.9,
  }).objective;
  const optimum = Math.min(longRun, ...Object.values(histories).map((h) => Math.min(...h)));
  for (const tolerance of [1e-4, 1e-6]) {
    const times: Record<string, number> = {};
    for (const [name, history] of Object.entries(histories)) {
      const reach = history.findIndex((v) => v <= optimum * (1 + tolerance)) + 1;
      times[name] = reach > 0 ? reach * perIteration[name] : Number.NaN;
      rows.push({
        name: `${name} to objective within ${tolerance} of Φ*`,
        medianMs: times[name],
        note: reach > 0 ? `${reach} iterations` : `not reached in ${HISTORY_CAP}`,
      });
    }
    rows.push({
      name: `ratio plain / preconditioned (time to ${tolerance})`,
      medianMs: Number.NaN,
      note: Number.isFinite(times.plain)
        ? (times.plain / times.preconditioned).toFixed(2)
        : `plain not within ${tolerance} after ${HISTORY_CAP} iterations`,
    });
  }

  reconstruct(input, { name: 'cs-tv', iterations: 2 });
  const requests: { wall: number; cpu: number }[] = [];
  let info: Record<string, unknown> = {};
  for (let run = 0; run < 5; run++) {
    requests.push(
      timed(() => {
        info = reconstruct(input, { name: 'cs-tv' }).info;
      }),
    );
  }
  const requestWall = median(requests.map((r) => r.wall));
  const requestCpu = median(requests.map((r) => r.cpu));
  const gap = ((info.objective as number) - optimum) / optimum;
  rows.push({
    name: `default cs-tv request ${n}×${n} (λ ${lambdaRelative.toFixed(4)}, tolerance 1e-5)`,
    medianMs: requestWall,
    note:
      `CPU ${requestCpu.toFixed(0)} ms; ${info.iterations} iterations, ` +
      `converged ${info.converged}, objective ${gap.toExponential(1)} above Φ* (median of 5)`,
  });
  const ours = [0, 1, 2].map(() => timed(() => solvers.plain(REFERENCE_ITERATIONS, 0)));
  const ours200 = { wall: median(ours.map((r) => r.wall)), cpu: median(ours.map((r) => r.cpu)) };
  rows.push({
    name: `plain ${REFERENCE_ITERATIONS} iterations ${n}×${n} (ours)`,
    medianMs: ours200.wall,
    note: `CPU ${ours200.cpu.toFixed(0)} ms (median of 3)`,
  });
  rows.push(...numpyRows(input, n, lambda, { wall: requestWall, cpu: requestCpu }, ours200));
  return rows;
}

/** The numpy reference's 200-iteration time and our ratios to it (wall and CPU), or one row saying why not. */
function numpyRows(
  input: { kspace: { data: Float64Array }; mask: Uint8Array },
  n: number,
  lambda: number,
  request: { wall: number; cpu: number },
  ours200: { wall: number; cpu: number },
): BenchRow[] {
  const skipped = (reason: string): BenchRow[] => [
    {
      name: `numpy plain ${REFERENCE_ITERATIONS} iterations`,
      medianMs: Number.NaN,
      note: `skipped: ${reason}`,
    },
  ];
  if (!existsSync(PYTHON)) return skipped(`${PYTHON} not found`);
  const dir = mkdtempSync(join(tmpdir(), 'cs-tv-reference-'));
  try {
    const kspacePath = join(dir, 'kspace.f64');
    const maskPath = join(dir, 'mask.u8');
    const { data } = input.kspace;
    writeFileSync(kspacePath, new Uint8Array(data.buffer, data.byteOffset, data.byteLength));
    writeFileSync(maskPath, input.mask);
    const args = [REFERENCE_SCRIPT, 'time', kspacePath, maskPath, `${n}`, `${n}`, `${lambda}`];
    const walls: number[] = [];
    const cpus: number[] = [];
    for (let run = 0; run < 3; run++) {
      const out = spawnSync(PYTHON, [...args, `${REFERENCE_ITERATIONS}`], { encoding: 'utf8' });
      if (out.status !== 0) {
        return skipped((out.stderr || out.error?.message || 'failed').trim().split('\n').pop() ?? '');
      }
      const result = JSON.parse(out.stdout) as { wallSeconds: number; cpuSeconds: number };
      walls.push(1000 * result.wallSeconds);
      cpus.push(1000 * result.cpuSeconds);
    }
    const numpy = { wall: median(walls), cpu: median(cpus) };
    const ratio = (ours: { wall: number; cpu: number }) =>
      `${(ours.wall / numpy.wall).toFixed(2)} in wall time, ${(ours.cpu / numpy.cpu).toFixed(2)} in CPU time`;
    return [
      {
        name: `numpy plain ${REFERENCE_ITERATIONS} iterations ${n}×${n} (tests/reference/cs_tv_reference.py)`,
        medianMs: numpy.wall,
        note: `CPU ${numpy.cpu.toFixed(0)} ms (medians of 3, the loop only)`,
      },
      { name: 'ratio default request / numpy 200', medianMs: Number.NaN, note: ratio(request) },
      { name: 'ratio our plain 200 / numpy 200', medianMs: Number.NaN, note: ratio(ours200) },
    ];
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
