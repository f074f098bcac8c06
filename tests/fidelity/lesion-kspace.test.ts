import { describe, expect, it } from 'vitest';
import { fft2c, ifft2c } from '../../src/core/centered-fft.ts';
import { complexFromReal } from '../../src/core/complex-image.ts';
import {
  discLesionShape,
  type Lesion,
  lesionGridKspace,
  rasterizeLesions,
} from '../../src/fidelity/index.ts';
import { phantomGridKspace, ShapePhantom, sheppLoganModified } from '../../src/phantoms/index.ts';
import { maxAbsDifference } from '../error-measures.ts';

describe('lesion k-space (exact, grid scaling of phantomGridKspace)', () => {
  it('a Gaussian lesion: fft2c of its point-sampled raster equals the closed form (Gaussian pair + Poisson summation)', () => {
    // A Gaussian of FWHM 8 px (σ = 3.40 px) is band-limited to double precision on the grid: the
    // nearest aliased copy at the Nyquist edge weighs exp(−π²σ²/2) ≈ 1e-25 and the tails reach
    // the periodic copy ≥ 46 px away at exp(−46²/(2σ²)) ≈ 1e-40, so the DFT of point samples
    // equals the sampled continuous transform (Poisson summation; Bracewell, textbook).
    const n = 96;
    const lesion: Lesion = { row: 47, col: 50, diameter: 8, amplitude: -0.3, shape: 'gaussian' };
    const sigmaPx = 8 / (2 * Math.sqrt(2 * Math.LN2));
    const raster = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        raster[i * n + j] =
          lesion.amplitude * Math.exp(-((i - lesion.row) ** 2 + (j - lesion.col) ** 2) / (2 * sigmaPx ** 2));
      }
    }
    const fromRaster = fft2c(complexFromReal(raster, n, n));
    const analytic = lesionGridKspace([lesion], n, n);
    const diff = maxAbsDifference(fromRaster.data, analytic.data);
    // Measured 2.1e-16 (peak |K| ≈ 0.23): rounding only.
    expect(diff).toBeLessThan(1e-13);
  });

  it('a disc lesion is the ellipse of diameter d pixels: K(0) = amplitude·π(d/nx)(d/ny), and its supersampled raster matches at low frequencies', () => {
    const nx = 64;
    const ny = 48;
    const lesion: Lesion = { row: 20, col: 30, diameter: 9, amplitude: 0.25, shape: 'disc' };
    const shape = discLesionShape(lesion, nx, ny);
    const value = new Float64Array(2);
    shape.addTransform([0], [0], value);
    // Area of an ellipse πab (closed form).
    expect(Math.abs(value[0] - 0.25 * Math.PI * (9 / nx) * (9 / ny))).toBeLessThan(1e-15);
    // The same disc rasterised with 8×8 supersampling (pixel units, lesion-raster.ts): its DFT
    // equals the analytic grid k-space times the box-average factor at low frequencies
    // (DEVELOPERS.md: 0.25 % over the central 33×33 for the phantoms at 256², ss = 8).
    const raster = fft2c(complexFromReal(rasterizeLesions([lesion], nx, ny, 8), nx, ny));
    const analytic = lesionGridKspace([lesion], nx, ny);
    let worst = 0;
    const peak = Math.hypot(
      analytic.data[2 * ((ny / 2) * nx + nx / 2)],
      analytic.data[2 * ((ny / 2) * nx + nx / 2) + 1],
    );
    for (let v = ny / 2 - 3; v <= ny / 2 + 3; v++) {
      for (let u = nx / 2 - 3; u <= nx / 2 + 3; u++) {
        const p = 2 * (v * nx + u);
        const box = sincPi((u - nx / 2) / nx) * sincPi((v - ny / 2) / ny);
        const d = Math.hypot(
          raster.data[p] - box * analytic.data[p],
          raster.data[p + 1] - box * analytic.data[p + 1],
        );
        worst = Math.max(worst, d / peak);
      }
    }
    // Measured 2.8e-3 of the peak (the raster's remaining edge error); slack 2×.
    expect(worst).toBeLessThan(6e-3);
  });

  it('phantom + lesions as one shape list equals phantom grid k-space + lesion grid k-space (1e-12)', () => {
    const n = 64;
    const base = sheppLoganModified();
    const lesions: Lesion[] = [
      { row: 30, col: 25, diameter: 5, amplitude: 0.02, shape: 'disc' },
      { row: 40, col: 36, diameter: 3, amplitude: -0.04, shape: 'disc' },
    ];
    const combined = new ShapePhantom('with-lesions', 'test', [
      ...base.shapes,
      ...lesions.map((l) => discLesionShape(l, n, n)),
    ]);
    const a = phantomGridKspace(combined, n, n);
    const b = phantomGridKspace(base, n, n);
    const l = lesionGridKspace(lesions, n, n);
    for (let i = 0; i < b.data.length; i++) b.data[i] += l.data[i];
    expect(maxAbsDifference(a.data, b.data)).toBeLessThan(1e-12);
    // And its inverse DFT shows the disc at its pixel: mean over the 21 centres of the 5-px disc
    // close to the amplitude (band-limited disc: ≈ 0.9–1.0 of it, common practice).
    const t = ifft2c(lesionGridKspace([lesions[0]], n, n));
    expect(t.data[2 * (30 * n + 25)]).toBeGreaterThan(0.018);
  });
});

function sincPi(t: number): number {
  return t === 0 ? 1 : Math.sin(Math.PI * t) / (Math.PI * t);
}
