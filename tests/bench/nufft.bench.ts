import { radialTrajectory } from '../../sampling/trajectories/radial-trajectory.ts';
import { fft2c } from '../../src/core/centered-fft.ts';
import { createComplexImage } from '../../src/core/complex-image.ts';
import { SeededRandom } from '../../src/core/random.ts';
import { createNufftPlan } from '../../src/nufft/nufft-plan.ts';
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
  return rows;
}
