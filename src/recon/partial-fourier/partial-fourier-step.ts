import { z } from 'zod';
import { fft2c } from '../../core/centered-fft.ts';
import type { ReconInput, ReconOutput } from '../method.ts';
import { homodyneReconstruction } from './homodyne.ts';
import { pocsReconstruction } from './pocs.ts';

export const PARTIAL_FOURIER_METHODS = ['zero-fill', 'homodyne', 'pocs'] as const;
export type PartialFourierMethod = (typeof PARTIAL_FOURIER_METHODS)[number];

/** The method piece's `partialFourier` field (the same on every method). */
export const partialFourierMethodField = {
  partialFourier: z
    .enum(PARTIAL_FOURIER_METHODS)
    .optional()
    .describe(
      "how rows left out by sampling.partialFourier are filled: 'zero-fill' (default; iterative methods then " +
        "treat them as unsampled rows of the mask), 'homodyne' (Noll, Nishimura & Macovski 1991) or 'pocs' " +
        '(Haacke, Lindskog & Lin 1991), both with a low-resolution phase estimate from the symmetric band',
    ),
};

/** Methods whose image is the zero-filled data itself: their k-space holds only measured samples. */
const DIRECT_METHODS: ReadonlySet<string> = new Set(['zero-filled']);

/**
 * The partial-Fourier step after a method has run (docs/design.md §2.1). Without a band (full ky),
 * or with 'zero-fill', the method's image stands: the missing rows were zero (direct methods) or
 * unsampled rows of the mask (iterative ones). With 'homodyne' or 'pocs' the step takes the
 * method's k-space on the kept rows [firstRow, ny) — for a direct method only its measured samples,
 * for an iterative one every kept row, which it has filled — and completes the missing rows.
 */
export function partialFourierStep(
  output: ReconOutput,
  input: ReconInput,
  method: { name: string; partialFourier?: PartialFourierMethod },
  band: { firstRow: number } | undefined,
  signal?: AbortSignal,
): ReconOutput {
  const choice = method.partialFourier ?? 'zero-fill';
  if (!band || band.firstRow === 0) return output;
  if (choice === 'zero-fill') return { ...output, info: { ...output.info, partialFourier: choice } };
  const { nx, ny } = output.image;
  const kspace = fft2c(output.image);
  kspace.data.fill(0, 0, 2 * band.firstRow * nx);
  const direct = DIRECT_METHODS.has(method.name);
  const known = direct ? input.mask : new Uint8Array(nx * ny).fill(1);
  if (direct) {
    // Only the measured samples: the k-space of a zero-filled image is the data where sampled.
    for (let i = 0; i < nx * ny; i++) {
      if (known[i]) continue;
      kspace.data[2 * i] = 0;
      kspace.data[2 * i + 1] = 0;
    }
  }
  const image =
    choice === 'homodyne'
      ? homodyneReconstruction(kspace, band.firstRow)
      : pocsReconstruction(kspace, known, band.firstRow, { signal });
  return { image, info: { ...output.info, partialFourier: choice } };
}
