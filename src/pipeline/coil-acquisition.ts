import {
  type CoilSimulation,
  type FullAcquisition,
  objectMaskOf,
  objectPhaseFactor,
  RASTER_SUPERSAMPLE,
} from '../acquisition/index.ts';
import {
  analyticCoilKspace,
  analyticCoilSamplesAt,
  CoilNoise,
  coilArrayMaps,
  coilArrayNoise,
  evaluateTrigPolynomial,
  fitTrigPolynomial,
  trigFitError,
} from '../coils/index.ts';
import { fft2c, ifft2c } from '../core/centered-fft.ts';
import { type ComplexImage, complexFromReal } from '../core/complex-image.ts';
import { ValidationError } from '../core/errors.ts';
import type { RealImage } from '../core/real-image.ts';
import { type CoilMaps, createMultiCoilArray, transformPlaneInPlace } from '../encoding/index.ts';
import type { Phantom } from '../phantoms/index.ts';
import { coilImages, combineCoilImages } from '../recon/index.ts';
import type { CoilsSpec, PhaseSpec } from './coil-request.ts';

/** Order P of the trigonometric fit (harmonics −P…P per axis) and its period factor L (period 2L units). */
export const COIL_FIT = { order: 6, periodFactor: 2 } as const;

/** A phantom seen through an array: the phantom, its grid, the k-space mode and the array's maps. */
export interface PhantomCoilSource {
  phantom: Phantom;
  nx: number;
  ny: number;
  mode: 'analytic' | 'raster';
  /** The array's maps on the grid (Biot–Savart loops, Gaussians, or uploaded). */
  maps: CoilMaps;
  noise: CoilNoise;
  /** Uploaded maps are given to the reconstruction as they are, never refitted (docs/design.md §3.8). */
  uploaded: boolean;
  phase?: PhaseSpec;
}

/**
 * The multi-coil simulation of a phantom. 'analytic' (default): each coil's smooth factor — its map
 * times the object phase, if any — is fitted by a trigonometric polynomial (Guerquin-Kern et al.
 * 2012), and the coil k-space is the exact transform of the phantom times that polynomial
 * (analyticCoilKspace). The fitted factor is the simulation's truth: the maps a reconstruction is
 * given are the fit with the object phase taken out again (or the uploaded maps as given), so the
 * object keeps its phase and the maps stay the coils'. `fitError` reports how far the fit is from
 * the array's own maps. 'raster': y_c = F(S_c·raster·e^(iφ)), flagged as an inverse crime.
 */
export function phantomCoilSimulation(source: PhantomCoilSource): CoilSimulation {
  const { phantom, nx, ny, mode, maps, noise, phase } = source;
  const phaseFactor = phase ? objectPhaseFactor(phase.order, phase.seed, nx, ny) : undefined;
  if (mode === 'raster') {
    const raster = phantom.rasterize(nx, ny, { supersample: RASTER_SUPERSAMPLE });
    return imageSimulation(objectOf(raster, phaseFactor), maps, noise);
  }
  const smooth = phaseFactor ? multiplyPlanes(maps, phaseFactor, false) : maps;
  const order = Math.min(COIL_FIT.order, Math.floor((Math.min(nx, ny) - 1) / 2));
  const fit = fitTrigPolynomial(smooth, { order, periodFactor: COIL_FIT.periodFactor });
  const fitted = evaluateTrigPolynomial(fit, nx, ny);
  const kspace = analyticCoilKspace(phantom, fit, nx, ny);
  const truth = phaseFactor ? multiplyPlanes(fitted, phaseFactor, true) : fitted;
  const reference = combineCoilImages(coilImages(kspace), truth).image;
  const objectMask = objectMaskOf(reference);
  const error = trigFitError(smooth, fitted, objectMask);
  const kspaceAt = (kx: Float64Array, ky: Float64Array): Float64Array =>
    analyticCoilSamplesAt(phantom, fit, kx, ky, nx, ny);
  return {
    kspace,
    maps: source.uploaded ? maps : truth,
    noise,
    reference,
    objectMask,
    inverseCrime: false,
    fitError: Math.max(...error.relative),
    kspaceAt,
  };
}

/** An uploaded image (or a raster) seen through an array: y_c = F(S_c·x), x_ref = x to rounding. */
export function imageCoilSimulation(
  image: RealImage,
  maps: CoilMaps,
  noise: CoilNoise,
  phase?: PhaseSpec,
): CoilSimulation {
  const phaseFactor = phase ? objectPhaseFactor(phase.order, phase.seed, image.nx, image.ny) : undefined;
  return imageSimulation(objectOf(image, phaseFactor), maps, noise);
}

function imageSimulation(object: ComplexImage, maps: CoilMaps, noise: CoilNoise): CoilSimulation {
  const { nx, ny } = object;
  const kspace = multiplyPlanes(maps, object.data, false);
  for (let c = 0; c < maps.coils; c++) transformPlaneInPlace(kspace.data, c * nx * ny, nx, ny, -1);
  const reference = combineCoilImages(coilImages(kspace), maps).image;
  return {
    kspace,
    maps,
    noise,
    reference,
    objectMask: objectMaskOf(reference),
    inverseCrime: true,
    object,
  };
}

/**
 * One coil (S = 1) with an object phase: today's single-coil acquisition of a complex object. A
 * phantom's k-space stays exact by the same fit, the phase being the one smooth factor.
 */
export function phasedSingleCoil(
  source: { phantom: Phantom; mode: 'analytic' | 'raster' } | { image: RealImage },
  nx: number,
  ny: number,
  phase: PhaseSpec,
): FullAcquisition {
  const phaseFactor = objectPhaseFactor(phase.order, phase.seed, nx, ny);
  if ('image' in source || source.mode === 'raster') {
    const real =
      'image' in source
        ? source.image
        : source.phantom.rasterize(nx, ny, { supersample: RASTER_SUPERSAMPLE });
    const reference = objectOf(real, phaseFactor);
    return {
      kspace: fft2c(reference),
      reference,
      ...('image' in source ? {} : { raster: real }),
      inverseCrime: true,
      objectMask: objectMaskOf(reference),
    };
  }
  const factor = { coils: 1, nx, ny, data: phaseFactor };
  const order = Math.min(COIL_FIT.order, Math.floor((Math.min(nx, ny) - 1) / 2));
  const fit = fitTrigPolynomial(factor, { order, periodFactor: COIL_FIT.periodFactor });
  const coil = analyticCoilKspace(source.phantom, fit, nx, ny);
  const kspace = { nx, ny, data: coil.data };
  const reference = ifft2c(kspace);
  return {
    kspace,
    reference,
    inverseCrime: false,
    objectMask: objectMaskOf(reference),
  };
}

/** The array's maps and noise model for a request's `coils` (not `uniform`), maps loaded by the caller. */
export function arrayModel(
  spec: Exclude<CoilsSpec, { array: 'uniform' }>,
  nx: number,
  ny: number,
  uploaded?: CoilMaps,
): { maps: CoilMaps; noise: CoilNoise; uploaded: boolean } {
  if ('mapsId' in spec) {
    if (!uploaded) throw new RangeError('uploaded maps must be loaded before the array model is built');
    if (uploaded.nx !== nx || uploaded.ny !== ny) {
      throw new ValidationError({
        field: 'coils.mapsId',
        message: `the maps are ${uploaded.ny}×${uploaded.nx}, the matrix ${ny}×${nx}`,
        allowed: `maps of the request's matrix, ${ny}×${nx}`,
      });
    }
    return { maps: uploaded, noise: CoilNoise.ring(uploaded.coils, 0), uploaded: true };
  }
  return { maps: coilArrayMaps(spec, nx, ny), noise: coilArrayNoise(spec), uploaded: false };
}

function objectOf(image: RealImage, phaseFactor?: Float64Array): ComplexImage {
  const object = complexFromReal(image.data, image.nx, image.ny);
  if (!phaseFactor) return object;
  const d = object.data;
  for (let i = 0; i < d.length; i += 2) {
    const v = d[i];
    d[i] = v * phaseFactor[i];
    d[i + 1] = v * phaseFactor[i + 1];
  }
  return object;
}

/** Every coil plane times one complex plane (or its conjugate), into a new array. */
function multiplyPlanes(maps: CoilMaps, plane: Float64Array, conjugate: boolean): CoilMaps {
  const { coils, nx, ny } = maps;
  const n = nx * ny;
  const out = createMultiCoilArray(coils, nx, ny);
  const sign = conjugate ? -1 : 1;
  for (let c = 0; c < coils; c++) {
    for (let i = 0; i < n; i++) {
      const at = 2 * (c * n + i);
      const sr = maps.data[at];
      const si = maps.data[at + 1];
      const pr = plane[2 * i];
      const pi = sign * plane[2 * i + 1];
      out.data[at] = sr * pr - si * pi;
      out.data[at + 1] = sr * pi + si * pr;
    }
  }
  return out;
}
