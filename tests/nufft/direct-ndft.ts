import type { ComplexImage } from '../../src/core/complex-image.ts';

/**
 * The exact non-uniform DFT the NUFFT approximates, by direct summation (O(N·M)), with the
 * orthonormal centred scaling of src/nufft/nufft-plan.ts: y_p = (1/√(nx·ny)) Σ x[i][j]
 * e^(−i2π(kx_p·n/nx − ky_p·m/ny)), n = j − ⌊nx/2⌋, m = i − ⌊ny/2⌋. Separable phases per point.
 */
export function directNdft(image: ComplexImage, kx: Float64Array, ky: Float64Array): Float64Array {
  const { nx, ny, data } = image;
  const out = new Float64Array(2 * kx.length);
  const cx = Math.floor(nx / 2);
  const cy = Math.floor(ny / 2);
  const ex = new Float64Array(2 * nx);
  const ey = new Float64Array(2 * ny);
  const scale = 1 / Math.sqrt(nx * ny);
  for (let p = 0; p < kx.length; p++) {
    for (let j = 0; j < nx; j++) {
      const phase = (-2 * Math.PI * kx[p] * (j - cx)) / nx;
      ex[2 * j] = Math.cos(phase);
      ex[2 * j + 1] = Math.sin(phase);
    }
    for (let i = 0; i < ny; i++) {
      const phase = (2 * Math.PI * ky[p] * (i - cy)) / ny;
      ey[2 * i] = Math.cos(phase);
      ey[2 * i + 1] = Math.sin(phase);
    }
    let re = 0;
    let im = 0;
    for (let i = 0; i < ny; i++) {
      let rr = 0;
      let ri = 0;
      for (let j = 0; j < nx; j++) {
        const xr = data[2 * (i * nx + j)];
        const xi = data[2 * (i * nx + j) + 1];
        rr += xr * ex[2 * j] - xi * ex[2 * j + 1];
        ri += xr * ex[2 * j + 1] + xi * ex[2 * j];
      }
      re += rr * ey[2 * i] - ri * ey[2 * i + 1];
      im += rr * ey[2 * i + 1] + ri * ey[2 * i];
    }
    out[2 * p] = re * scale;
    out[2 * p + 1] = im * scale;
  }
  return out;
}

/**
 * The exact adjoint sum x[i][j] = (1/√(nx·ny)) Σ_p y_p e^(+i2π(kx_p·n/nx − ky_p·m/ny)) by direct
 * summation, same conventions as directNdft.
 */
export function directAdjointNdft(
  samples: Float64Array,
  kx: Float64Array,
  ky: Float64Array,
  nx: number,
  ny: number,
): Float64Array {
  const out = new Float64Array(2 * nx * ny);
  const cx = Math.floor(nx / 2);
  const cy = Math.floor(ny / 2);
  const scale = 1 / Math.sqrt(nx * ny);
  for (let i = 0; i < ny; i++) {
    for (let j = 0; j < nx; j++) {
      let re = 0;
      let im = 0;
      for (let p = 0; p < kx.length; p++) {
        const phase = 2 * Math.PI * ((kx[p] * (j - cx)) / nx - (ky[p] * (i - cy)) / ny);
        const c = Math.cos(phase);
        const s = Math.sin(phase);
        re += samples[2 * p] * c - samples[2 * p + 1] * s;
        im += samples[2 * p] * s + samples[2 * p + 1] * c;
      }
      out[2 * (i * nx + j)] = re * scale;
      out[2 * (i * nx + j) + 1] = im * scale;
    }
  }
  return out;
}
