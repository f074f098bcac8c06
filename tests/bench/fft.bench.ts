import { fftPlan } from '../../src/core/fft-plan.ts';
import { randomComplexImage } from '../recon/helpers.ts';
import { type BenchRow, fftPairMs, medianMs } from './timing.ts';

/**
 * Forward + inverse centred 2D pair. The ratio compares the pair with the bare 1D plan calls it
 * contains (ny row and nx column transforms, twice), so it shows what gathers, shifts and scaling
 * cost. Rate: 5·N·log2(N) flops per complex transform of N points (the usual radix-2 count).
 * 320 = 64·5 and 384 = 128·3 run the split plan (fft.js lengths 64 / 128, then radix-5 / radix-3
 * butterflies), so their rate against 256 and 512 shows what the split costs.
 */
export async function benchFft(): Promise<BenchRow[]> {
  const rows: BenchRow[] = [];
  for (const [nx, ny] of [
    [256, 256],
    [320, 320],
    [384, 384],
    [512, 512],
  ]) {
    const image = randomComplexImage(nx, ny, nx);
    const pair = await fftPairMs(image);
    const rowIn = new Float64Array(2 * nx);
    const rowOut = new Float64Array(2 * nx);
    const colIn = new Float64Array(2 * ny);
    const colOut = new Float64Array(2 * ny);
    const rowPlan = fftPlan(nx);
    const colPlan = fftPlan(ny);
    const bare = await medianMs(() => {
      for (let pass = 0; pass < 2; pass++) {
        for (let r = 0; r < ny; r++) rowPlan.forward(rowOut, rowIn);
        for (let c = 0; c < nx; c++) colPlan.forward(colOut, colIn);
      }
    }, 11);
    const n = nx * ny;
    const gflops = (2 * 5 * n * Math.log2(n)) / (pair * 1e6);
    rows.push({
      name: `fft2c+ifft2c ${ny}×${nx}`,
      medianMs: pair,
      note: `pair / bare 1D transforms = ${(pair / bare).toFixed(2)}; ${gflops.toFixed(2)} GFLOP/s (5N log2 N)`,
    });
  }
  return rows;
}
