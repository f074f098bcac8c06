export { hfen, highFrequencyErrorNorm } from './hfen.ts';
export { LOG_RADIUS, LOG_SIGMA, laplacianOfGaussian } from './laplacian-of-gaussian.ts';
export { nrmse } from './nrmse.ts';
export { psnr } from './psnr.ts';
export { type MetricSet, scoreAll } from './score-all.ts';
export { SSIM_K1, SSIM_K2, SSIM_RADIUS, SSIM_SIGMA, type SsimOptions, ssim, ssimWindow } from './ssim.ts';
