import type { RealImage } from '../core/real-image.ts';
import { hfen } from './hfen.ts';
import { nrmse } from './nrmse.ts';
import { psnr } from './psnr.ts';
import { ssim } from './ssim.ts';

export interface MetricSet {
  nrmse: number;
  psnr: number;
  ssim: number;
  hfen: number;
}

/** All four metrics of a magnitude estimate against the magnitude reference (same optional region). */
export function scoreAll(estimate: RealImage, reference: RealImage, mask?: Uint8Array): MetricSet {
  return {
    nrmse: nrmse(estimate, reference, mask),
    psnr: psnr(estimate, reference, mask),
    ssim: ssim(estimate, reference, { mask }),
    hfen: hfen(estimate, reference, mask),
  };
}
