import { describe, expect, it } from 'vitest';
import { generateMask } from '../../sampling/index.ts';
import { ifft2c } from '../../src/core/centered-fft.ts';
import { type ComplexImage, createComplexImage } from '../../src/core/complex-image.ts';
import {
  contrastRecovery,
  imageLesionSet,
  type Lesion,
  type LesionSpec,
  lesionGridKspace,
  lesionResponse,
  phantomLesionSet,
} from '../../src/fidelity/index.ts';
import { sheppLoganModified } from '../../src/phantoms/index.ts';
import { zeroFilledImage } from '../../src/recon/zero-filled.ts';
import fixture from '../reference/fixtures/fidelity.json' with { type: 'json' };

function masked(k: ComplexImage, mask: Uint8Array): ComplexImage {
  const out = createComplexImage(k.nx, k.ny);
  for (let i = 0; i < mask.length; i++) {
    if (!mask[i]) continue;
    out.data[2 * i] = k.data[2 * i];
    out.data[2 * i + 1] = k.data[2 * i + 1];
  }
  return out;
}

function zeroFilled(k: ComplexImage, mask: Uint8Array): ComplexImage {
  return zeroFilledImage({ kspace: masked(k, mask), mask }).image;
}

/** Rows shifted circularly by `shift`: out(i) = image(i − shift). */
function rolledRows(image: ComplexImage, shift: number): ComplexImage {
  const { nx, ny } = image;
  const out = createComplexImage(nx, ny);
  for (let i = 0; i < ny; i++) {
    const src = (((i - shift) % ny) + ny) % ny;
    out.data.set(image.data.subarray(2 * src * nx, 2 * (src + 1) * nx), 2 * i * nx);
  }
  return out;
}

describe('contrast recovery Re⟨r, t⟩/⟨t, t⟩ over the lesion disc', () => {
  const n = 128;
  const spec = (shape: 'disc' | 'gaussian'): LesionSpec => ({
    count: 4,
    diameter: 5,
    contrast: 0.08,
    shape,
    seed: 3,
  });

  for (const shape of ['disc', 'gaussian'] as const) {
    it(`full sampling, noiseless (${shape}): one lesion recovers 1 within 1e-6 and r = ifft2c(lesion k-space) to 1e-10 (definition)`, () => {
      const set = phantomLesionSet(sheppLoganModified(), n, n, { ...spec(shape), count: 1 });
      const full = new Uint8Array(n * n).fill(1);
      const r = lesionResponse(zeroFilled(set.withLesions, full), zeroFilled(set.without, full));
      const analytic = ifft2c(lesionGridKspace(set.lesions, n, n));
      let worst = 0;
      for (let i = 0; i < r.data.length; i++) worst = Math.max(worst, Math.abs(r.data[i] - analytic.data[i]));
      // Measured 5.1e-16 (rounding of two 128² inverse DFTs).
      expect(worst).toBeLessThan(1e-10);
      // Measured |CR − 1| ≤ 2.2e-15: r = t for an isolated lesion.
      expect(Math.abs(contrastRecovery(r, set.templates[0], set.lesions[0]) - 1)).toBeLessThan(1e-6);
    });

    it(`full sampling, noiseless (${shape}), 4 lesions: the neighbours' tails move the recovery by less than 1e-4`, () => {
      const set = phantomLesionSet(sheppLoganModified(), n, n, spec(shape));
      const full = new Uint8Array(n * n).fill(1);
      const r = lesionResponse(zeroFilled(set.withLesions, full), zeroFilled(set.without, full));
      const errors = set.lesions.map((lesion, i) =>
        Math.abs(contrastRecovery(r, set.templates[i], lesion) - 1),
      );
      // Measured max 1.1e-5 for discs (band-limited ringing reaches the next disc 15 px away) and
      // 1.2e-13 for Gaussians (no ringing); slack to 1e-4.
      expect(Math.max(...errors)).toBeLessThan(1e-4);
    });
  }

  it('zero-filled uniform R = 2 without ACS: recovery 1/2 and the alias N/2 rows away with half the amplitude (PSF ½(δ(0) + δ(N/2)), by hand)', () => {
    // Every other row sampled, m(v) = ½(1 + (−1)^(v − ⌊N/2⌋)); multiplying k-space by (−1)^(v − c)
    // shifts the centred image by N/2 rows, so zero-filled returns ½(x + x shifted by N/2).
    const sampled = generateMask({ nx: n, ny: n }, { pattern: 'cartesian-uniform', acceleration: 2, acs: 0 });
    // One lesion: with several, one lesion's alias can land on another (seed 3, 4 Gaussians: 4 px
    // off, recovery 0.535), which is the effect being measured, not an error of it.
    for (const shape of ['disc', 'gaussian'] as const) {
      const set = phantomLesionSet(sheppLoganModified(), n, n, { ...spec(shape), count: 1 });
      const r = lesionResponse(
        zeroFilled(set.withLesions, sampled.mask),
        zeroFilled(set.without, sampled.mask),
      );
      const t = ifft2c(lesionGridKspace(set.lesions, n, n));
      const predicted = rolledRows(t, n / 2);
      let worst = 0;
      for (let i = 0; i < r.data.length; i++) {
        worst = Math.max(worst, Math.abs(r.data[i] - 0.5 * (t.data[i] + predicted.data[i])));
      }
      // Measured ≈ 5e-16: the identity holds to rounding.
      expect(worst).toBeLessThan(1e-12);
      set.lesions.forEach((lesion, i) => {
        const recovery = contrastRecovery(r, set.templates[i], lesion);
        // Measured |CR − ½| = 3.0e-6 (disc: its ringing 64 rows away), 9e-14 (Gaussian); slack 1e-4.
        expect(Math.abs(recovery - 0.5)).toBeLessThan(1e-4);
        const aliasLesion: Lesion = { ...lesion, row: (lesion.row + n / 2) % n };
        const aliasTemplate = rolledRows(set.templates[i], n / 2);
        expect(Math.abs(contrastRecovery(r, aliasTemplate, aliasLesion) - 0.5)).toBeLessThan(1e-4);
      });
    }
  });

  it('an upload (rasterised lesions, no analytic k-space): full sampling recovers 1 and uniform R = 2 recovers ½ per lesion', () => {
    // The "upload" is the modified phantom's 4× supersampled raster; lesions are rasterised with
    // 8× supersampled edges and t is their raster, which full sampling returns exactly.
    const raster = sheppLoganModified().rasterize(n, n, { supersample: 4 });
    const image = createComplexImage(n, n);
    for (let i = 0; i < raster.data.length; i++) image.data[2 * i] = raster.data[i];
    const set = imageLesionSet(image, { count: 3, diameter: 6, contrast: -0.1, shape: 'disc', seed: 4 });
    const full = new Uint8Array(n * n).fill(1);
    const r = lesionResponse(zeroFilled(set.withLesions, full), zeroFilled(set.without, full));
    const uniform = generateMask({ nx: n, ny: n }, { pattern: 'cartesian-uniform', acceleration: 2, acs: 0 });
    const half = lesionResponse(
      zeroFilled(set.withLesions, uniform.mask),
      zeroFilled(set.without, uniform.mask),
    );
    set.lesions.forEach((lesion, i) => {
      expect(lesion.amplitude).toBeCloseTo(-0.1 * set.meanIntensity, 15);
      // Measured |CR − 1| ≤ 1.8e-15: the raster has no ringing and lesions do not overlap.
      expect(Math.abs(contrastRecovery(r, set.templates[i], lesion) - 1)).toBeLessThan(1e-6);
      // Exactly ½ unless another lesion's alias lands on the disc; measured ≤ 2e-15 here.
      expect(Math.abs(contrastRecovery(half, set.templates[i], lesion) - 0.5)).toBeLessThan(1e-6);
    });
  });

  it('zero-filled on a random-lines mask equals numpy/scipy (tests/reference/generate_fidelity_fixture.py) to 1e-9', () => {
    const size = fixture.n;
    const mask = new Uint8Array(size * size);
    for (const row of fixture.rows) mask.fill(1, row * size, (row + 1) * size);
    for (const entry of fixture.lesions) {
      const lesion: Lesion = {
        row: entry.row,
        col: entry.col,
        diameter: entry.diameter,
        amplitude: entry.amplitude,
        shape: entry.shape as Lesion['shape'],
      };
      const k = lesionGridKspace([lesion], size, size);
      const t = ifft2c(k);
      const r = zeroFilled(k, mask);
      // The template itself (scipy.special.j1 and numpy.fft against stdlib J1 and our FFT).
      expect(Math.abs(t.data[2 * (lesion.row * size + lesion.col)] - entry.templateCentre)).toBeLessThan(
        1e-12,
      );
      // Measured ≤ 2.3e-16 against numpy (template centre ≤ 1.4e-17).
      expect(Math.abs(contrastRecovery(r, t, lesion) - entry.contrastRecovery)).toBeLessThan(1e-9);
    }
  });
});
