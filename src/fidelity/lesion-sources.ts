import { fft2c, ifft2c } from '../core/centered-fft.ts';
import { type ComplexImage, complexFromReal, createComplexImage } from '../core/complex-image.ts';
import { phantomGridKspace } from '../phantoms/grid-kspace.ts';
import type { Phantom } from '../phantoms/phantom.ts';
import type { Lesion, LesionSpec } from './lesion.ts';
import { lesionGridKspace } from './lesion-kspace.ts';
import { placeLesions } from './lesion-placement.ts';
import { rasterizeLesions } from './lesion-raster.ts';
import { objectSupport } from './object-support.ts';

/** What a lesion study needs from its source: both full k-spaces, the reference, the lesions and their templates. */
export interface LesionSet {
  without: ComplexImage;
  withLesions: ComplexImage;
  reference: ComplexImage;
  objectMask: Uint8Array;
  meanIntensity: number;
  lesions: Lesion[];
  templates: ComplexImage[];
}

function added(a: ComplexImage, b: ComplexImage): ComplexImage {
  const out = createComplexImage(a.nx, a.ny);
  for (let i = 0; i < out.data.length; i++) out.data[i] = a.data[i] + b.data[i];
  return out;
}

/**
 * Lesions in an analytic phantom: k-space stays exact, with = phantom grid k-space + the lesions'
 * grid k-space (both analytic), and each template t = ifft2c(that lesion's grid k-space). Positions
 * come from the reference ifft2c(phantom grid k-space), the object and its mean intensity.
 */
export function phantomLesionSet(phantom: Phantom, nx: number, ny: number, spec: LesionSpec): LesionSet {
  const without = phantomGridKspace(phantom, nx, ny);
  const reference = ifft2c(without);
  const { mask, meanIntensity } = objectSupport(reference);
  const lesions = placeLesions(mask, nx, ny, meanIntensity, spec);
  const withLesions = added(without, lesionGridKspace(lesions, nx, ny));
  const templates = lesions.map((l) => ifft2c(lesionGridKspace([l], nx, ny)));
  return { without, withLesions, reference, objectMask: mask, meanIntensity, lesions, templates };
}

/**
 * Lesions in an uploaded image (the reference itself; no analytic k-space): each lesion is
 * rasterised with supersampled edges and added to the image, k-space is fft2c of the result (the
 * discrete model the reconstruction inverts), and t is the lesion's raster, which full sampling
 * returns exactly.
 */
export function imageLesionSet(reference: ComplexImage, spec: LesionSpec): LesionSet {
  const { nx, ny } = reference;
  const { mask, meanIntensity } = objectSupport(reference);
  const lesions = placeLesions(mask, nx, ny, meanIntensity, spec);
  const templates = lesions.map((l) => complexFromReal(rasterizeLesions([l], nx, ny), nx, ny));
  const all = rasterizeLesions(lesions, nx, ny);
  const withImage = createComplexImage(nx, ny);
  withImage.data.set(reference.data);
  for (let i = 0; i < all.length; i++) withImage.data[2 * i] += all[i];
  return {
    without: fft2c(reference),
    withLesions: fft2c(withImage),
    reference,
    objectMask: mask,
    meanIntensity,
    lesions,
    templates,
  };
}
