import { solveCsWavelet } from '../../src/recon/cs-wavelet-solver.ts';
import { poissonDiscAcquisition } from '../recon/helpers.ts';
import type { BenchRow } from './timing.ts';

/**
 * Time to a fixed relative objective tolerance, 256² single coil (modified Shepp–Logan, analytic
 * k-space, Poisson-disc R = 4, λ = 0.001, db4, 4 levels, no cycle spinning): plain FISTA against
 * FISTA with adaptive restart (O'Donoghue & Candès 2015). The target is the lower of the two
 * objectives after `cap` iterations; each run records its objective per iteration, and its time to
 * target is its wall time × (iterations to reach target·(1 + tol)) / cap. One run each: read the
 * ratio, not the absolute times.
 */
export async function benchSolverSpeed(): Promise<BenchRow[]> {
  const n = 256;
  const cap = 1000;
  const tolerance = 1e-6;
  const { kspace, sampled } = poissonDiscAcquisition('shepp-logan-modified', n, 24, 1);
  const input = { kspace, mask: sampled.mask };
  const runs = [false, true].map((restart) => {
    const start = performance.now();
    const out = solveCsWavelet(input, {
      lambda: 0.001,
      iterations: cap,
      tolerance: 0,
      restart,
      recordObjective: true,
    });
    return { restart, wall: performance.now() - start, history: out.info.objectiveHistory as number[] };
  });
  const target = Math.min(...runs.map((r) => r.history[r.history.length - 1]));
  const rows: BenchRow[] = [];
  const times: number[] = [];
  for (const r of runs) {
    const reach = r.history.findIndex((v) => v <= target * (1 + tolerance)) + 1;
    const ms = reach > 0 ? (r.wall * reach) / cap : Number.NaN;
    times.push(ms);
    rows.push({
      name: `cs-wavelet FISTA${r.restart ? ' + adaptive restart' : ''} ${n}×${n}, to objective within ${tolerance}`,
      medianMs: ms,
      note:
        reach > 0
          ? `${reach} iterations (of ${cap}, ${(r.wall / cap).toFixed(1)} ms each)`
          : `not reached in ${cap}`,
    });
  }
  rows.push({
    name: 'ratio plain / restart (time to target)',
    medianMs: Number.NaN,
    note: (times[0] / times[1]).toFixed(2),
  });
  return rows;
}
