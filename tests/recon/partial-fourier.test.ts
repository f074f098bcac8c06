import { describe, expect, it } from 'vitest';
import { partialFourierBand } from '../../sampling/index.ts';
import { fft2c, ifft2c } from '../../src/core/centered-fft.ts';
import {
  type ComplexImage,
  cloneComplexImage,
  complexFromReal,
  magnitude,
} from '../../src/core/complex-image.ts';
import { nrmse } from '../../src/metrics/nrmse.ts';
import { getPhantom, phantomGridKspace } from '../../src/phantoms/index.ts';
import { conjugateFill } from '../../src/recon/partial-fourier/conjugate-fill.ts';
import { homodyneReconstruction } from '../../src/recon/partial-fourier/homodyne.ts';
import { pocsReconstruction } from '../../src/recon/partial-fourier/pocs.ts';

const phantom = getPhantom('shepp-logan-modified');

/** Largest |a − b| over the largest |b|. */
function relativeMaxError(a: ComplexImage, b: ComplexImage): number {
  let worst = 0;
  let peak = 0;
  for (let i = 0; i < a.data.length; i += 2) {
    worst = Math.max(worst, Math.hypot(a.data[i] - b.data[i], a.data[i + 1] - b.data[i + 1]));
    peak = Math.max(peak, Math.hypot(b.data[i], b.data[i + 1]));
  }
  return worst / peak;
}

/** The rows before firstRow set to zero (what a partial-Fourier acquisition leaves out). */
function withoutRows(k: ComplexImage, firstRow: number): ComplexImage {
  const out = cloneComplexImage(k);
  out.data.fill(0, 0, 2 * firstRow * k.nx);
  return out;
}

describe('conjugate symmetry fills the missing rows of a real object (Hermitian spectrum, K(−k) = K(k)*)', () => {
  it('odd 63×63, p = 0.6: every missing row has its partner; the full image comes back to 1e-10', () => {
    const full = phantomGridKspace(phantom, 63, 63);
    const reference = ifft2c(full);
    const { firstRow } = partialFourierBand(63, 0.6); // 63 − ⌈37.8⌉ = 25
    expect(firstRow).toBe(25);
    const filled = ifft2c(conjugateFill(withoutRows(full, firstRow), firstRow));
    expect(relativeMaxError(filled, reference)).toBeLessThan(1e-10);
  });

  it('even 64×64: row 0 (ky = −N/2) and column 0 (kx = −N/2) have no partner and stay empty; put back, exact', () => {
    const n = 64;
    const full = phantomGridKspace(phantom, n, n);
    const { firstRow } = partialFourierBand(n, 0.625); // 64 − 40 = 24
    const filled = conjugateFill(withoutRows(full, firstRow), firstRow);
    for (let i = 0; i < 2 * n; i++) expect(filled.data[i]).toBe(0);
    for (let v = 0; v < firstRow; v++) expect(filled.data[2 * v * n]).toBe(0);
    // Measured: the unpartnered samples carry 0.0090 of the peak here (slack: between 1e-3 and 1e-1).
    const missing = relativeMaxError(ifft2c(filled), ifft2c(full));
    expect(missing).toBeGreaterThan(1e-3);
    expect(missing).toBeLessThan(1e-1);
    filled.data.set(full.data.subarray(0, 2 * n), 0);
    for (let v = 1; v < firstRow; v++) {
      filled.data[2 * v * n] = full.data[2 * v * n];
      filled.data[2 * v * n + 1] = full.data[2 * v * n + 1];
    }
    expect(relativeMaxError(ifft2c(filled), ifft2c(full))).toBeLessThan(1e-10);
  });
});

/** The modified Shepp–Logan raster at n² times e^{iφ}, φ from `phase(x, y)` in the phantom frame. */
function phasedObject(n: number, phase: (x: number, y: number) => number): ComplexImage {
  const raster = phantom.rasterize(n, n, { supersample: 2 });
  const image = complexFromReal(raster.data, n, n);
  for (let row = 0; row < n; row++) {
    const y = -((row - n / 2) * 2) / n;
    for (let col = 0; col < n; col++) {
      const x = ((col - n / 2) * 2) / n;
      const i = row * n + col;
      const value = image.data[2 * i];
      const phi = phase(x, y);
      image.data[2 * i] = value * Math.cos(phi);
      image.data[2 * i + 1] = value * Math.sin(phi);
    }
  }
  return image;
}

function magnitudeError(estimate: ComplexImage, truth: ComplexImage): number {
  const n = truth.nx;
  return nrmse({ nx: n, ny: n, data: magnitude(estimate) }, { nx: n, ny: n, data: magnitude(truth) });
}

function errors(truth: ComplexImage, fraction: number) {
  const n = truth.nx;
  const { firstRow } = partialFourierBand(n, fraction);
  const k = withoutRows(fft2c(truth), firstRow);
  const known = new Uint8Array(n * n).fill(1);
  return {
    zeroFill: magnitudeError(ifft2c(k), truth),
    homodyne: magnitudeError(homodyneReconstruction(k, firstRow), truth),
    pocs: magnitudeError(pocsReconstruction(k, known, firstRow), truth),
  };
}

describe('homodyne (Noll, Nishimura & Macovski 1991) and POCS (Haacke, Lindskog & Lin 1991) at p = 0.625, 64²', () => {
  // NRMSE of the magnitude against the true magnitude. Measured values; slack ±0.002.
  it('a smooth phase (0.8·x + 0.5·y²): zero-fill 0.2393, homodyne 0.0420, POCS 0.0393', () => {
    const e = errors(
      phasedObject(64, (x, y) => 0.8 * x + 0.5 * y * y),
      0.625,
    );
    expect(Math.abs(e.zeroFill - 0.2393)).toBeLessThan(0.002);
    expect(Math.abs(e.homodyne - 0.042)).toBeLessThan(0.002);
    expect(Math.abs(e.pocs - 0.0393)).toBeLessThan(0.002);
    expect(e.homodyne).toBeLessThan(e.zeroFill / 5);
    expect(e.pocs).toBeLessThan(e.zeroFill / 5);
  });

  it('the error grows with the phase bandwidth: φ = cos(π·f·y), f cycles per FOV, band half-width h = 8 rows', () => {
    // p = 0.625 at 64 rows keeps rows 24…63: the symmetric band is ky = −8…8, so the phase estimate
    // resolves phase variations up to about 8 cycles per FOV, less after its Hann window.
    const measured = {
      homodyne: [0.0752, 0.1445, 0.2625, 0.4716, 0.5382],
      pocs: [0.0417, 0.0876, 0.1696, 0.3673, 0.5384],
    };
    const rows = [1, 2, 4, 8, 16].map((f) =>
      errors(
        phasedObject(64, (_x, y) => Math.cos(Math.PI * f * y)),
        0.625,
      ),
    );
    rows.forEach((e, i) => {
      expect(Math.abs(e.homodyne - measured.homodyne[i])).toBeLessThan(0.002);
      expect(Math.abs(e.pocs - measured.pocs[i])).toBeLessThan(0.002);
      if (i > 0) {
        expect(e.homodyne).toBeGreaterThan(rows[i - 1].homodyne);
        expect(e.pocs).toBeGreaterThan(rows[i - 1].pocs);
      }
    });
    // Well inside the band both beat zero-filling; at and beyond h homodyne is worse than zero-filling.
    expect(rows[0].homodyne).toBeLessThan(rows[0].zeroFill / 3);
    expect(rows[0].pocs).toBeLessThan(rows[0].zeroFill / 5);
    expect(rows[3].pocs).toBeGreaterThan(rows[3].zeroFill);
    expect(rows[3].homodyne).toBeGreaterThan(rows[3].zeroFill);
  });

  it('a real object (φ = 0): exact on an odd grid; on an even one only the unpartnered row and column are lost', () => {
    // Odd 63²: H(k) + H(−k) = 2 on every row, so homodyne is exact for a Hermitian spectrum (measured
    // 2.8e-14); POCS converges towards it (2.1e-10 after its 30 iterations). Zero-fill: 0.2234.
    const odd = errors(
      phasedObject(63, () => 0),
      0.625,
    );
    expect(odd.homodyne).toBeLessThan(1e-12);
    expect(odd.pocs).toBeLessThan(1e-8);
    expect(Math.abs(odd.zeroFill - 0.2234)).toBeLessThan(0.002);
    // Even 64²: measured homodyne 0.0370, POCS 0.0370 (it converges to the same fixed point), zero-fill 0.2372 (slack ±0.002).
    const even = errors(
      phasedObject(64, () => 0),
      0.625,
    );
    expect(Math.abs(even.homodyne - 0.037)).toBeLessThan(0.002);
    expect(Math.abs(even.pocs - 0.037)).toBeLessThan(0.002);
    expect(Math.abs(even.zeroFill - 0.2372)).toBeLessThan(0.002);
  });
});
