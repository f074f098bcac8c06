import { fft2c, ifft2c } from '../core/centered-fft.ts';
import { type ComplexImage, complexFromReal, createComplexImage } from '../core/complex-image.ts';
import { phantomGridKspace } from '../phantoms/grid-kspace.ts';
import type { Phantom } from '../phantoms/phantom.ts';
import type { Lesion, LesionSpec } from './lesion.ts';
import { lesionKspaceAndTemplates } from './lesion-kspace.ts';
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
 * Lesions added to a source whose full grid k-space (`without`) and reference ifft2c(without) are
 * known. Positions come from the reference: its object and mean intensity (DEVELOPERS.md "Feature
 * fidelity").
 * - `analytic` (phantoms): with = without + the lesions' exact grid k-space, so k-space stays
 *   analytic, and each template t = ifft2c(that lesion's grid k-space).
 * - `raster` (uploads, raster phantoms): each lesion is rasterised with supersampled edges and
 *   added to the image, k-space is fft2c of the result (the discrete model the reconstruction
 *   inverts), and t is the lesion's raster, which full sampling returns exactly.
 */
export function lesionSetOn(
  without: ComplexImage,
  reference: ComplexImage,
  spec: LesionSpec,
  kind: 'analytic' | 'raster',
): LesionSet {
  const { nx, ny } = reference;
  const { mask, meanIntensity } = objectSupport(reference);
  const lesions = placeLesions(mask, nx, ny, meanIntensity, spec);
  let withLesions: ComplexImage;
  let templates: ComplexImage[];
  if (kind === 'analytic') {
    const lesionK = lesionKspaceAndTemplates(lesions, nx, ny);
    withLesions = added(without, lesionK.kspace);
    templates = lesionK.templates;
  } else {
    templates = lesions.map((l) => complexFromReal(rasterizeLesions([l], nx, ny), nx, ny));
    withLesions = added(without, fft2c(complexFromReal(rasterizeLesions(lesions, nx, ny), nx, ny)));
  }
  return { without, withLesions, reference, objectMask: mask, meanIntensity, lesions, templates };
}

/** Where lesions of `spec` go in a phantom at nx×ny (ValidationError on lesions.count when they do not fit). */
export function phantomLesionPositions(phantom: Phantom, nx: number, ny: number, spec: LesionSpec): Lesion[] {
  const { mask, meanIntensity } = objectSupport(ifft2c(phantomGridKspace(phantom, nx, ny)));
  return placeLesions(mask, nx, ny, meanIntensity, spec);
}

/** Lesions in an analytic phantom: lesionSetOn its exact grid k-space, `analytic`. */
export function phantomLesionSet(phantom: Phantom, nx: number, ny: number, spec: LesionSpec): LesionSet {
  const without = phantomGridKspace(phantom, nx, ny);
  return lesionSetOn(without, ifft2c(without), spec, 'analytic');
}

/** Lesions in an uploaded image (the reference itself; no analytic k-space): lesionSetOn, `raster`. */
export function imageLesionSet(reference: ComplexImage, spec: LesionSpec): LesionSet {
  return lesionSetOn(fft2c(reference), reference, spec, 'raster');
}
