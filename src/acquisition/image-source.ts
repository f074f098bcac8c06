import { fft2c } from '../core/centered-fft.ts';
import { complexFromReal } from '../core/complex-image.ts';
import type { RealImage } from '../core/real-image.ts';
import type { FullAcquisition } from './full-acquisition.ts';
import { objectMaskOf } from './noise.ts';

/** Uploaded (or any real) image: k-space = F_c(image); unavoidable inverse crime. */
export function fullKspaceFromImage(image: RealImage): FullAcquisition {
  const reference = complexFromReal(image.data, image.nx, image.ny);
  return { kspace: fft2c(reference), reference, inverseCrime: true, objectMask: objectMaskOf(reference) };
}
