import { readFileSync } from 'node:fs';
import { ifft2c } from '../../../src/core/centered-fft.ts';
import type { MultiCoilKspace } from '../../../src/encoding/index.ts';
import { maxAbsDifference } from '../../error-measures.ts';

/**
 * The 3D ISMRMRD fixtures and numpy's reference values, written by
 * tests/reference/generate_ismrmrd_3d_fixture.py (python3-h5py and numpy; record layout copied from
 * the ismrmrd-tools file, header after Debian's ismrmrd-schema): 4 coils, 2× readout oversampling,
 * 16 × 16 × 12 reconstructed, 4 noise-scan records, invented identifiers in the XML header.
 */
export const raw3dFileName = 'volume-3d-4coil.h5';
export const raw3dMissingFileName = 'volume-3d-missing.h5';

export const raw3dBytes = (name: string): Buffer =>
  readFileSync(new URL(`../../fixtures/ismrmrd/${name}`, import.meta.url));

export const raw3dReference: {
  coils: number;
  readoutSamples: number;
  readoutOversampling: number;
  encodedMatrix: [number, number, number];
  reconMatrix: [number, number, number];
  records: { total: number; imaging: number; noise: number };
  missing: { step1: number; step2: number };
  nx: number;
  ny: number;
  nz: number;
  identifiers: string[];
  rss: number[];
  noiseSamples: number;
  noiseCovariance: number[];
  rssWhitened: number[];
} = JSON.parse(
  readFileSync(new URL('../../reference/fixtures/ismrmrd-3d-rss.json', import.meta.url), 'utf8'),
);

/** max |actual − expected| over max |expected|. */
export function peakRelativeError(actual: ArrayLike<number>, expected: ArrayLike<number>): number {
  let peak = 0;
  for (let i = 0; i < expected.length; i++) peak = Math.max(peak, Math.abs(expected[i]));
  return maxAbsDifference(actual, expected) / peak;
}

/**
 * The hybrid-space plane at readout position x of a 3D coil k-space (coil-major, then z, y, x):
 * every coil's ky × kz plane (rows y, columns z) after the centred orthonormal inverse DFT along
 * kx, written out as the sum x_j = n^(−1/2) Σ_k X_k e^(2πi (k − n/2)(j − n/2)/n) (fftshift ∘ ifft ∘
 * ifftshift with norm="ortho" for even n), independent of the service's FFT.
 */
export function hybridPlane(kspace: MultiCoilKspace, nz: number, x: number): MultiCoilKspace {
  const { coils, nx, ny } = kspace;
  if (nx % 2 !== 0) throw new RangeError('the written-out centred DFT needs an even nx');
  const data = new Float64Array(2 * coils * ny * nz);
  for (let c = 0; c < coils; c++) {
    for (let z = 0; z < nz; z++) {
      for (let y = 0; y < ny; y++) {
        const line = 2 * ((c * nz + z) * ny + y) * nx;
        let re = 0;
        let im = 0;
        for (let k = 0; k < nx; k++) {
          const angle = (2 * Math.PI * (k - nx / 2) * (x - nx / 2)) / nx;
          const a = kspace.data[line + 2 * k];
          const b = kspace.data[line + 2 * k + 1];
          re += a * Math.cos(angle) - b * Math.sin(angle);
          im += a * Math.sin(angle) + b * Math.cos(angle);
        }
        const to = 2 * (c * ny * nz + y * nz + z);
        data[to] = re / Math.sqrt(nx);
        data[to + 1] = im / Math.sqrt(nx);
      }
    }
  }
  return { coils, nx: nz, ny, data };
}

/**
 * The root-sum-of-squares volume (x fastest) of a 3D coil k-space, independently of the service's
 * readout transform: the written-out inverse DFT along kx gives each x-plane (ky × kz) of every
 * coil (hybridPlane); ifft2c of that plane is the coil image's y–z plane.
 */
export function rssVolume(kspace: MultiCoilKspace, nz: number): Float64Array {
  const { coils, nx, ny } = kspace;
  const rss = new Float64Array(nx * ny * nz);
  for (let x = 0; x < nx; x++) {
    const plane = hybridPlane(kspace, nz, x);
    for (let c = 0; c < coils; c++) {
      const image = ifft2c({ nx: nz, ny, data: plane.data.slice(2 * c * ny * nz, 2 * (c + 1) * ny * nz) });
      for (let y = 0; y < ny; y++) {
        for (let z = 0; z < nz; z++) {
          const at = 2 * (y * nz + z);
          rss[(z * ny + y) * nx + x] += image.data[at] ** 2 + image.data[at + 1] ** 2;
        }
      }
    }
  }
  return rss.map(Math.sqrt);
}
