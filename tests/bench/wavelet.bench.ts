import { type CsWaveletOptions, solveCsWavelet } from '../../src/recon/cs-wavelet-solver.ts';
import { daubechiesFilters } from '../../src/wavelets/daubechies-filters.ts';
import { forwardDwt2, inverseDwt2 } from '../../src/wavelets/dwt2.ts';
import { poissonDiscAcquisition, randomComplexImage } from '../recon/helpers.ts';
import { type BenchRow, fftPairMs, medianMs } from './timing.ts';

/**
 * Wavelet cost at 256×256: one 4-level db4 forward + inverse DWT pair against one fft2c + ifft2c
 * pair, and one cs-wavelet iteration (modified Shepp–Logan, analytic k-space, Poisson-disc R = 4;
 * 50 iterations with tolerance 0, divided by 50) against the same FFT pair. A FISTA iteration does
 * one FFT pair and one DWT pair plus O(n) passes; cycle spinning adds two circular shifts; the
 * primal–dual (with TV) one adds the gradient and divergence.
 */
export async function benchWavelet(): Promise<BenchRow[]> {
  const n = 256;
  const image = randomComplexImage(n, n, n);
  const pair = await fftPairMs(image);
  const filters = daubechiesFilters('db4');
  const coefficients = new Float64Array(image.data.length);
  const dwtPair = await medianMs(() => {
    forwardDwt2(coefficients, image.data, n, n, filters, 4);
    inverseDwt2(coefficients, coefficients, n, n, filters, 4);
  }, 11);
  const rows: BenchRow[] = [
    { name: `fft2c+ifft2c ${n}×${n} (reference pair)`, medianMs: pair },
    {
      name: `db4 4-level DWT + inverse ${n}×${n}`,
      medianMs: dwtPair,
      note: `${(dwtPair / pair).toFixed(2)}× one fft2c+ifft2c pair`,
    },
  ];

  const { kspace, sampled } = poissonDiscAcquisition('shepp-logan-modified', n, 24, 1);
  const input = { kspace, mask: sampled.mask };
  const iterations = 50;
  const cases: { label: string; options: CsWaveletOptions }[] = [
    { label: 'FISTA', options: { lambda: 0.001 } },
    { label: 'FISTA, cycle spinning', options: { lambda: 0.001, cycleSpinning: true } },
    { label: 'primal–dual with TV', options: { lambda: 0.001, lambdaTv: 0.002 } },
  ];
  for (const c of cases) {
    const total = await medianMs(
      () => solveCsWavelet(input, { ...c.options, iterations, tolerance: 0 }),
      3,
      1,
    );
    const perIteration = total / iterations;
    rows.push({
      name: `cs-wavelet ${c.label} ${n}×${n}, per iteration`,
      medianMs: perIteration,
      note: `${(perIteration / pair).toFixed(2)}× one fft2c+ifft2c pair (${pair.toFixed(2)} ms)`,
    });
  }
  return rows;
}
