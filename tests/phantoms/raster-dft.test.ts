import { beforeAll, describe, expect, it } from 'vitest';
import { fft2c, ifft2c } from '../../src/core/centered-fft.ts';
import { type ComplexImage, complexFromReal } from '../../src/core/complex-image.ts';
import { phantomGridKspace } from '../../src/phantoms/grid-kspace.ts';
import type { Phantom } from '../../src/phantoms/phantom.ts';
import { sinc } from '../../src/phantoms/rectangle.ts';
import { resolutionContrast } from '../../src/phantoms/resolution-contrast.ts';
import { sheppLogan, sheppLoganModified } from '../../src/phantoms/shepp-logan.ts';
import { relativeError } from '../error-measures.ts';

/**
 * Relative 2-norm error of fft2c(raster) against the analytic grid k-space over the central
 * (2·8·2 + 1)² points (max(|kx|, |ky|) ≤ 8 cycles/unit), as in docs/references.md §1.3. With `sincCorrected`
 * the analytic values are multiplied by sinc(hx·kx)·sinc(hy·ky), the transform of the box average.
 * Grid frequencies are written out from docs/design.md §3.3 here, not taken from src/phantoms.
 */
function centralError(phantom: Phantom, nx: number, ny: number, ss: number, sincCorrected: boolean): number {
  const raster = phantom.rasterize(nx, ny, { supersample: ss });
  const dft = fft2c(complexFromReal(raster.data, nx, ny));
  const analytic = phantomGridKspace(phantom, nx, ny);
  const cx = Math.floor(nx / 2);
  const cy = Math.floor(ny / 2);
  let error = 0;
  let norm = 0;
  for (let v = cy - 16; v <= cy + 16; v++) {
    for (let u = cx - 16; u <= cx + 16; u++) {
      const kx = (u - cx) / 2;
      const ky = -(v - cy) / 2;
      const w = sincCorrected ? sinc((2 / nx) * kx) * sinc((2 / ny) * ky) : 1;
      const i = 2 * (v * nx + u);
      const re = analytic.data[i] * w;
      const im = analytic.data[i + 1] * w;
      error += (dft.data[i] - re) ** 2 + (dft.data[i + 1] - im) ** 2;
      norm += re * re + im * im;
    }
  }
  return Math.sqrt(error / norm);
}

function wholeGridError(phantom: Phantom, n: number): number {
  const dft = fft2c(complexFromReal(phantom.rasterize(n, n, { supersample: 8 }).data, n, n));
  return relativeError(dft.data, phantomGridKspace(phantom, n, n).data);
}

describe('analytic grid k-space against the DFT of a fine raster (docs/references.md §1.3)', () => {
  const modified = sheppLoganModified();
  let e128 = Number.NaN;
  let e256 = Number.NaN;
  let s128 = Number.NaN;
  let s256 = Number.NaN;
  beforeAll(() => {
    e128 = centralError(modified, 128, 128, 8, false);
    e256 = centralError(modified, 256, 256, 8, false);
    s128 = centralError(modified, 128, 128, 8, true);
    s256 = centralError(modified, 256, 256, 8, true);
  });

  it('central 33×33: relative error < 0.5 % at n = 256, ss = 8 (docs/references.md §1.3 gives 0.0025)', () => {
    expect(e256).toBeLessThan(0.005);
    expect(e128).toBeLessThan(0.015); // docs/references.md §1.3: 0.010
  });

  it('reproduces the docs/references.md §1.3 [C] table (NumPy, same convention) to the digits it quotes', () => {
    // 0.010, 0.0025, 0.0034, 0.00083: each within half a unit of its last quoted digit.
    expect(Math.abs(e128 - 0.01)).toBeLessThanOrEqual(0.0005);
    expect(Math.abs(e256 - 0.0025)).toBeLessThanOrEqual(0.00005);
    expect(Math.abs(s128 - 0.0034)).toBeLessThanOrEqual(0.00005);
    expect(Math.abs(s256 - 0.00083)).toBeLessThanOrEqual(0.000005);
  });

  it('central error falls by ≳ 3× when n doubles (docs/references.md §1.3)', () => {
    expect(e128 / e256).toBeGreaterThan(3);
    expect(s128 / s256).toBeGreaterThan(3);
  });

  it('sinc-corrected central error: < 0.005 at n = 128 and < 0.0012 at n = 256 (docs/references.md §1.3 gives 0.0034 and 0.00083)', () => {
    expect(s128).toBeLessThan(0.005);
    expect(s256).toBeLessThan(0.0012);
    expect(s256).toBeLessThan(e256);
  });

  it('whole-grid error stays at several % from aliasing, as docs/references.md §1.3 reports (0.059 at n = 256)', () => {
    const whole = wholeGridError(modified, 256);
    expect(whole).toBeGreaterThan(0.05);
    expect(whole).toBeLessThan(0.07);
  });

  it('odd and non-square sizes (127×129, 129×96) agree as well as 128×128 (centre at ⌊n/2⌋, docs/design.md §3.3)', () => {
    // The error falls like 1/n² (docs/references.md §1.3), so the bound scales with the shorter side. A centre off by
    // half a pixel (the literal (2j − n)/n for odd n, docs/references.md §0) gives about 12 % at 127×129.
    for (const [nx, ny] of [
      [127, 129],
      [129, 96],
    ]) {
      expect(centralError(modified, nx, ny, 8, true)).toBeLessThan(
        1.5 * s128 * Math.max(1, 128 / Math.min(nx, ny)) ** 2,
      );
    }
  });

  it('the 1974 intensities and the resolution-contrast phantom (rectangles) agree too (sinc-corrected < 1 % at 256)', () => {
    expect(centralError(sheppLogan(), 256, 256, 8, true)).toBeLessThan(0.0012);
    expect(centralError(resolutionContrast(), 256, 256, 8, true)).toBeLessThan(0.01);
  });
});

describe('grid k-space layout and scale', () => {
  it('holds K(0)·√(nx·ny)/4 at (⌊ny/2⌋, ⌊nx/2⌋) (DEVELOPERS.md scale: pixel area 4/(nx·ny) over √(nx·ny))', () => {
    const phantom = sheppLoganModified();
    for (const [nx, ny] of [
      [64, 64],
      [65, 40],
    ]) {
      const grid = phantomGridKspace(phantom, nx, ny);
      const dc = 2 * (Math.floor(ny / 2) * nx + Math.floor(nx / 2));
      expect(grid.data[dc] / (Math.sqrt(nx * ny) / 4)).toBeCloseTo(0.4952646048, 9);
      expect(grid.data[dc + 1]).toBe(0);
    }
  });

  it('puts +ky in the rows above the centre: row v holds ky = −(v − ⌊ny/2⌋)/2 (docs/design.md §3.3)', () => {
    const phantom = sheppLoganModified();
    const grid = phantomGridKspace(phantom, 16, 16);
    // Row 7 is one above the centre row 8: ky = +0.5; column 8 is kx = 0 (docs/references.md §1.2 value).
    const i = 2 * (7 * 16 + 8);
    const scale = Math.sqrt(256) / 4;
    expect(grid.data[i] / scale).toBeCloseTo(0.0255806687, 9);
    expect(grid.data[i + 1] / scale).toBeCloseTo(-0.0389715318, 9);
  });

  it('ifft2c of the analytic grid k-space approximates the raster (mean abs error well below the 0.2 brain value)', () => {
    const phantom = sheppLoganModified();
    const image: ComplexImage = ifft2c(phantomGridKspace(phantom, 128, 128));
    const raster = phantom.rasterize(128, 128, { supersample: 8 });
    let absError = 0;
    let imag = 0;
    for (let p = 0; p < raster.data.length; p++) {
      absError += Math.abs(image.data[2 * p] - raster.data[p]);
      imag = Math.max(imag, Math.abs(image.data[2 * p + 1]));
    }
    // Truncation ringing (Gibbs) remains, so compare on average; a wrong sign or scale would be off by ~0.2.
    expect(absError / raster.data.length).toBeLessThan(0.02);
    // The even-n Nyquist row and column have no conjugate partner, so the image is only nearly real.
    expect(imag).toBeLessThan(0.05);
  });
});
