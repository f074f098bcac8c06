import { fft2c, ifft2c } from '../core/centered-fft.ts';
import { type ComplexImage, createComplexImage } from '../core/complex-image.ts';
import type { NufftOptions } from './nufft-options.ts';
import { createNufftPlan } from './nufft-plan.ts';

/**
 * Toeplitz embedding of the normal operator AᴴWA (Fessler, Lee, Olafsson, Shi & Noll 2005): for the
 * NUFFT A of src/nufft/nufft-plan.ts and real sample weights W,
 *   (AᴴWA x)[n] = Σ_m x[m] · h[n − m],   h[d] = (1/(nx·ny)) Σ_p w_p e^(+i2π(kx_p·dx/nx − ky_p·dy/ny)),
 * a convolution with offsets d in (−n, n). h is one adjoint NUFFT on the 2nx×2ny grid (points at 2k,
 * since kx·d/nx = 2kx·d/(2nx)), computed once; applying the operator is then two centred FFTs of the
 * doubled grid and a product, with no gridding. The 2n grid is large enough that the circular
 * convolution never wraps. Agrees with adjoint(w ⊙ forward(x)) to the NUFFT accuracy.
 */
export interface ToeplitzOperator {
  readonly nx: number;
  readonly ny: number;
  /** AᴴWA x into `out` (a new image when absent); `out` may not be `image`. */
  apply(image: ComplexImage, out?: ComplexImage): ComplexImage;
  /**
   * max |ĥ| over the doubled grid: an upper bound of the applied operator's norm (crop · circulant ·
   * pad, and the circulant's eigenvalues are ĥ), e.g. a safe step size for gradient methods.
   */
  readonly normBound: number;
}

export function toeplitzNormalOperator(
  nx: number,
  ny: number,
  kx: Float64Array,
  ky: Float64Array,
  weights: Float64Array,
  options: NufftOptions = {},
): ToeplitzOperator {
  if (weights.length !== kx.length) {
    throw new RangeError(`need one weight per point: ${kx.length} points, ${weights.length} weights`);
  }
  const mx = 2 * nx;
  const my = 2 * ny;
  const doubledKx = kx.map((k) => 2 * k);
  const doubledKy = ky.map((k) => 2 * k);
  const doubled = createNufftPlan(mx, my, doubledKx, doubledKy, options);
  const weighted = new Float64Array(2 * kx.length);
  for (let p = 0; p < kx.length; p++) weighted[2 * p] = weights[p];
  // The doubled plan scales by 1/√(4·nx·ny); h wants 1/(nx·ny), and the convolution theorem for the
  // orthonormal centred DFT of the 2n grid contributes √(4·nx·ny): together 4·nx·ny/(nx·ny) = 4.
  const spectrum = fft2c(doubled.adjoint(weighted));
  let normBound = 0;
  for (let i = 0; i < spectrum.data.length; i += 2) {
    spectrum.data[i] *= 4;
    spectrum.data[i + 1] *= 4;
    normBound = Math.max(normBound, Math.hypot(spectrum.data[i], spectrum.data[i + 1]));
  }
  const padded = createComplexImage(mx, my);
  // Pixel (i, j) of the n grid sits at the same centred offset of the 2n grid.
  const rowShift = ny - Math.floor(ny / 2);
  const colShift = nx - Math.floor(nx / 2);
  return {
    nx,
    ny,
    normBound,
    apply(image, out) {
      if (image.nx !== nx || image.ny !== ny) {
        throw new RangeError(`operator is for ${ny}×${nx}, image is ${image.ny}×${image.nx}`);
      }
      const target = out ?? createComplexImage(nx, ny);
      padded.data.fill(0);
      for (let i = 0; i < ny; i++) {
        const src = 2 * i * nx;
        padded.data.set(image.data.subarray(src, src + 2 * nx), 2 * ((i + rowShift) * mx + colShift));
      }
      fft2c(padded, padded);
      const d = padded.data;
      const s = spectrum.data;
      for (let q = 0; q < d.length; q += 2) {
        const re = d[q] * s[q] - d[q + 1] * s[q + 1];
        d[q + 1] = d[q] * s[q + 1] + d[q + 1] * s[q];
        d[q] = re;
      }
      ifft2c(padded, padded);
      for (let i = 0; i < ny; i++) {
        const src = 2 * ((i + rowShift) * mx + colShift);
        target.data.set(d.subarray(src, src + 2 * nx), 2 * i * nx);
      }
      return target;
    },
  };
}
