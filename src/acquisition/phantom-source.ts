import { fft2c, ifft2c } from '../core/centered-fft.ts';
import { complexFromReal } from '../core/complex-image.ts';
import { ValidationError } from '../core/errors.ts';
import { gridScale, type Phantom, phantomGridKspace } from '../phantoms/index.ts';
import type { FullAcquisition } from './full-acquisition.ts';
import { objectMaskOf } from './noise.ts';

/** Box-average supersampling of the phantom raster (display and 'raster' mode). */
export const RASTER_SUPERSAMPLE = 4;

/**
 * 'analytic' (default, no inverse crime): k-space evaluated from the phantom's exact Fourier
 * transform at the grid points; the reference is its inverse DFT. 'raster': k-space = F_c(raster),
 * reference = raster (inverse crime, flagged).
 */
export function fullKspaceFromPhantom(
  phantom: Phantom,
  nx: number,
  ny: number,
  mode: 'analytic' | 'raster' = 'analytic',
): FullAcquisition {
  if (mode !== 'analytic' && mode !== 'raster') {
    throw new ValidationError({
      field: 'source.kspace',
      message: `unknown k-space mode ${JSON.stringify(mode)}`,
      allowed: 'analytic | raster',
    });
  }
  const raster = phantom.rasterize(nx, ny, { supersample: RASTER_SUPERSAMPLE });
  if (mode === 'raster') {
    const reference = complexFromReal(raster.data, nx, ny);
    return {
      kspace: fft2c(reference),
      reference,
      raster,
      inverseCrime: true,
      objectMask: objectMaskOf(reference),
    };
  }
  const kspace = phantomGridKspace(phantom, nx, ny);
  const reference = ifft2c(kspace);
  const scale = gridScale(nx, ny);
  // Cycles per FOV are twice cycles per phantom unit (the FOV is [−1, 1]); same scale as the grid.
  const kspaceAt = (kx: Float64Array, ky: Float64Array): Float64Array => {
    const values = phantom.kspaceAt(
      Float64Array.from(kx, (k) => k / 2),
      Float64Array.from(ky, (k) => k / 2),
    );
    for (let i = 0; i < values.length; i++) values[i] *= scale;
    return values;
  };
  return { kspace, reference, raster, inverseCrime: false, objectMask: objectMaskOf(reference), kspaceAt };
}
