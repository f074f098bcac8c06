import { type RadialTrajectory, radialTrajectory } from '../../sampling/trajectories/radial-trajectory.ts';
import { fft2c } from '../../src/core/centered-fft.ts';
import { type ComplexImage, createComplexImage } from '../../src/core/complex-image.ts';
import { defaultLimits } from '../../src/core/limits.ts';
import { SeededRandom } from '../../src/core/random.ts';
import { densityWeightsFor, nufftPlanFor, toeplitzFor } from '../../src/nufft/index.ts';
import { createNufftPlan } from '../../src/nufft/nufft-plan.ts';
import { reconstruct, type TrajectoryData } from '../../src/recon/index.ts';
import { type BenchRow, medianMs } from './timing.ts';

/**
 * NUFFT at 256² on Nyquist radial with 2× readout oversampling (403 spokes × 512 samples), W = 4
 * and 6, α = 2: plan set-up, type 2 and type 1, each also as a ratio to one fft2c of the 512²
 * oversampled grid (the goal is ≤ 3×).
 */
export async function benchNufft(): Promise<BenchRow[]> {
  const side = 256;
  const t = radialTrajectory({ side, readoutOversampling: 2 });
  const rng = new SeededRandom(1);
  const image = createComplexImage(side, side);
  for (let i = 0; i < image.data.length; i++) image.data[i] = rng.normal();
  const grid = createComplexImage(2 * side, 2 * side);
  grid.data.set(image.data);
  const fftMs = await medianMs(() => fft2c(grid, grid), 7);
  const rows: BenchRow[] = [{ name: 'fft2c 512×512 (oversampled grid)', medianMs: fftMs }];
  for (const width of [4, 6]) {
    let plan = createNufftPlan(side, side, t.kx, t.ky, { width });
    const setup = await medianMs(
      () => {
        plan = createNufftPlan(side, side, t.kx, t.ky, { width });
      },
      3,
      1,
    );
    const samples = new Float64Array(2 * plan.count);
    const out = createComplexImage(side, side);
    const forward = await medianMs(() => plan.forward(image, samples), 7);
    const adjoint = await medianMs(() => plan.adjoint(samples, out), 7);
    const label = `256², ${t.readouts}×${t.samplesPerReadout} radial, W=${width} α=2`;
    rows.push({ name: `NUFFT plan ${label}`, medianMs: setup, note: 'taps and weights precomputed' });
    rows.push({
      name: `NUFFT type 2 ${label}`,
      medianMs: forward,
      note: `${(forward / fftMs).toFixed(2)}× fft2c 512²`,
    });
    rows.push({
      name: `NUFFT type 1 ${label}`,
      medianMs: adjoint,
      note: `${(adjoint / fftMs).toFixed(2)}× fft2c 512²`,
    });
  }
  rows.push(...(await csTvOnTrajectory(t, image)));
  return rows;
}

/**
 * One cs-tv iteration on the trajectory operator (density-weighted data term, linearised
 * primal–dual with one Toeplitz EᴴE per iteration), against its floor: one type-2 plus one type-1
 * NUFFT (W = 4, α = 2), the cost of one gridded EᴴE; the goal is ≤ 1.5×. The iteration's cost is
 * the difference of a 30- and a 10-iteration run over 20, so the set-up both share (back-projection,
 * λ scale, the power iteration for L) is not counted against an iteration; the set-up is a row of
 * its own. Also the Toeplitz EᴴE against the gridded one.
 */
async function csTvOnTrajectory(t: RadialTrajectory, image: ComplexImage): Promise<BenchRow[]> {
  const side = image.nx;
  const plan = nufftPlanFor(t, side, side);
  const samples = plan.forward(image);
  const out = createComplexImage(side, side);
  const floor = await medianMs(() => plan.adjoint(plan.forward(image, samples), out), 5);
  const { weights, weighting } = densityWeightsFor(t, side, side);
  const kernel = toeplitzFor(t, side, side, { name: weighting, values: weights });
  const toeplitz = await medianMs(() => kernel.apply(image, out), 5);
  const trajectory: TrajectoryData = {
    trajectory: t,
    plan,
    samples: { coils: 1, data: samples },
    weights,
    weighting,
  };
  const input = { kspace: image, mask: new Uint8Array(side * side), trajectory };
  const runOf = (iterations: number) => () => {
    reconstruct(input, { name: 'cs-tv', iterations, tolerance: 0 }, { limits: defaultLimits });
  };
  const short = await medianMs(runOf(10), 3, 1);
  const long = await medianMs(runOf(30), 3);
  const perIteration = (long - short) / 20;
  const setup = short - 10 * perIteration;
  return [
    {
      name: 'EᴴE gridded (type 2 + type 1), 256², 403×512 radial',
      medianMs: floor,
      note: 'the floor of one iteration',
    },
    {
      name: 'EᴴE through the Toeplitz kernel (512² FFT pair)',
      medianMs: toeplitz,
      note: `${(toeplitz / floor).toFixed(2)}× gridded`,
    },
    {
      name: 'cs-tv iteration on the trajectory operator, 256²',
      medianMs: perIteration,
      note: `${(perIteration / floor).toFixed(2)}× its floor (linearised primal–dual, one Toeplitz EᴴE)`,
    },
    {
      name: 'cs-tv set-up on the trajectory operator, 256²',
      medianMs: setup,
      note: `${(setup / floor).toFixed(1)}× the floor: back-projection, λ scale, power iteration for L`,
    },
  ];
}
