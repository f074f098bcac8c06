import type { PartialFourierBand } from '../../sampling/partial-fourier.ts';
import type { ComplexImage } from '../core/complex-image.ts';
import type { Limits } from '../core/limits.ts';
import {
  type MethodSpec,
  partialFourierStep,
  type ReconInput,
  reconstruct,
  zeroFilledImage,
} from '../recon/index.ts';

/** What reconstructing a run of planes gives back: plain data, so a worker thread can send it. */
export interface PlaneReconstructions {
  images: ComplexImage[];
  zeroFilled: ComplexImage[];
  /** The method's facts of the first plane of the run (iterations, objective, …). */
  info: Record<string, unknown>;
  reconMs: number;
}

/**
 * The 2D reconstruction of each plane, exactly as a 2D request would run it (method, then the
 * partial-Fourier step), plus its zero-filled comparison image. A run of planes is the unit that
 * crosses to a worker thread (src/jobs/tasks.ts 'volume-planes').
 */
export function reconstructPlanes(
  inputs: readonly ReconInput[],
  method: MethodSpec,
  partialFourier: PartialFourierBand | undefined,
  options: { signal?: AbortSignal; limits?: Limits },
): PlaneReconstructions {
  const images: ComplexImage[] = [];
  const zeroFilled: ComplexImage[] = [];
  let info: Record<string, unknown> = {};
  const started = performance.now();
  inputs.forEach((input, i) => {
    const output = reconstruct(input, method, options);
    const result = partialFourierStep(output, input, method, partialFourier, options.signal);
    images.push(result.image);
    // Plain zero-filling without density compensation is its own comparison image (as in 2D).
    const same =
      method.name === 'zero-filled' && !method.densityCompensation && result.image === output.image;
    zeroFilled.push(same ? result.image : zeroFilledImage(input).image);
    if (i === 0) info = result.info;
  });
  return { images, zeroFilled, info, reconMs: performance.now() - started };
}
