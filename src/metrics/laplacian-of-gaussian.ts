import { gaussianKernel, gaussianSecondDerivativeKernel } from './gaussian-kernels.ts';
import { correlateColumnsReflect, correlateRowsReflect } from './reflect-correlation.ts';
import { scratch } from './scratch.ts';

/** HFEN's filter width: the 15×15 Laplacian of Gaussian of Ravishankar & Bresler 2011, σ = 1.5 px. */
export const LOG_SIGMA = 1.5;
export const LOG_RADIUS = 7;

interface LogKernels {
  gaussian: Float64Array;
  secondDerivative: Float64Array;
  ones: Float64Array;
  /** −(sum of the sampled 2D kernel)/(2r + 1)²: the constant that makes the kernel zero-sum. */
  meanCorrection: Float64Array;
}

let kernels: LogKernels | undefined;

function logKernels(): LogKernels {
  if (kernels) return kernels;
  const gaussian = gaussianKernel(LOG_SIGMA, LOG_RADIUS);
  const secondDerivative = gaussianSecondDerivativeKernel(LOG_SIGMA, LOG_RADIUS);
  const width = 2 * LOG_RADIUS + 1;
  // The sampled kernel K = g ⊗ g'' + g'' ⊗ g sums to 2·Σg·Σg'' (about −9e-6 here, not 0).
  let sumG = 0;
  let sumG2 = 0;
  for (let t = 0; t < width; t++) {
    sumG += gaussian[t];
    sumG2 += secondDerivative[t];
  }
  const mean = (2 * sumG * sumG2) / (width * width);
  kernels = {
    gaussian,
    secondDerivative,
    ones: new Float64Array(width).fill(1),
    meanCorrection: new Float64Array(width).fill(-mean),
  };
  return kernels;
}

/**
 * Laplacian of Gaussian (σ 1.5 px, 15×15 support) of a row-major ny×nx image into `target`:
 *   K[u][v] = g[u]·g''[v] + g''[u]·g[v]   (u row offset, v column offset, both −7…7; sampled as
 *                                          scipy.ndimage.gaussian_laplace samples it)
 *   zeroSum: K − mean(K) over the 15×15 support, so constants map to 0 (the usual discrete LoG)
 * applied separably (one row sweep, one column sweep) with the 'reflect' boundary (half-sample symmetric, as
 * scipy.ndimage mode='reflect'). With zeroSum false this is gaussian_laplace(sigma=1.5,
 * truncate=4.8, mode='reflect') itself; with zeroSum true it is that minus sum(K) times the
 * 15×15 moving average (scipy.ndimage.uniform_filter(size=15, mode='reflect')).
 */
export function laplacianOfGaussian(
  target: Float64Array,
  source: Float64Array,
  nx: number,
  ny: number,
  zeroSum: boolean,
): Float64Array {
  const n = nx * ny;
  if (source.length !== n || target.length !== n || target === source) {
    throw new RangeError(`laplacianOfGaussian needs distinct source and target of length nx·ny = ${n}`);
  }
  const k = logKernels();
  // K's rank-one terms (column kernel × row kernel): g × g'', g'' × g and, for zeroSum, −mean × 1.
  const rowsSecond = scratch('log-rows-second', n);
  const rowsGaussian = scratch('log-rows-gaussian', n);
  if (zeroSum) {
    const rowsOnes = scratch('log-rows-ones', n);
    correlateRowsReflect([rowsSecond, rowsGaussian, rowsOnes], source, nx, ny, [
      k.secondDerivative,
      k.gaussian,
      k.ones,
    ]);
    correlateColumnsReflect(target, [rowsSecond, rowsGaussian, rowsOnes], nx, ny, [
      k.gaussian,
      k.secondDerivative,
      k.meanCorrection,
    ]);
  } else {
    correlateRowsReflect([rowsSecond, rowsGaussian], source, nx, ny, [k.secondDerivative, k.gaussian]);
    correlateColumnsReflect(target, [rowsSecond, rowsGaussian], nx, ny, [k.gaussian, k.secondDerivative]);
  }
  return target;
}
