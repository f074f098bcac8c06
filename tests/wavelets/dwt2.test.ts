import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { type ComplexImage, energy } from '../../src/core/complex-image.ts';
import { SeededRandom } from '../../src/core/random.ts';
import { circularShift, randomShift } from '../../src/wavelets/cycle-spin.ts';
import { daubechiesFilters, WAVELET_NAMES } from '../../src/wavelets/daubechies-filters.ts';
import { checkDwtShape, dwt2, idwt2, maxDwtLevels } from '../../src/wavelets/dwt2.ts';
import { detailL1, softThresholdComplex, softThresholdDetails } from '../../src/wavelets/soft-threshold.ts';
import { maxAbsDifference } from '../error-measures.ts';
import { randomComplexImage } from '../recon/helpers.ts';

interface Part {
  input: number[];
  coefficients: number[];
}
interface WaveletCase {
  wavelet: string;
  mode: string;
  nx: number;
  ny: number;
  level: number;
  inputScale: number;
  real: Part;
  imag: Part;
}
interface Fixture {
  versions: Record<string, string>;
  filters: Record<string, { decLo: number[]; decHi: number[]; recLo: number[]; recHi: number[] }>;
  cases: WaveletCase[];
}
// Fixture: Debian python3-pywt (PyWavelets 1.1), made by tests/reference/generate_wavelet_fixture.py.
const fixture = JSON.parse(
  readFileSync(new URL('../reference/fixtures/wavelet-pywt.json', import.meta.url), 'utf8'),
) as Fixture;

function caseImage(c: WaveletCase): ComplexImage {
  const n = c.nx * c.ny;
  const data = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    data[2 * i] = c.real.input[i] * c.inputScale;
    data[2 * i + 1] = c.imag.input[i] * c.inputScale;
  }
  return { nx: c.nx, ny: c.ny, data };
}

describe('Daubechies filters computed by spectral factorisation (Daubechies 1992 §6.1)', () => {
  // Measured: largest difference from PyWavelets' tables 4.7e-16 (db6); asserted 1e-14.
  for (const name of WAVELET_NAMES) {
    it(`${name}: dec_lo, dec_hi, rec_lo, rec_hi equal pywt.Wavelet('${name}') to 1e-14`, () => {
      const ours = daubechiesFilters(name);
      const ref = fixture.filters[name];
      expect(ours.length).toBe(ref.decLo.length);
      for (const key of ['decLo', 'decHi', 'recLo', 'recHi'] as const) {
        expect(maxAbsDifference(ours[key], ref[key])).toBeLessThan(1e-14);
      }
    });
  }

  it('db2 has the closed form h = ((1+√3), (3+√3), (3−√3), (1−√3)) / (4√2) (Daubechies 1988)', () => {
    const s = Math.sqrt(3);
    const expected = [1 + s, 3 + s, 3 - s, 1 - s].map((v) => v / (4 * Math.SQRT2));
    expect(maxAbsDifference(daubechiesFilters('db2').recLo, expected)).toBeLessThan(1e-15);
  });

  it('every dbN satisfies Σh = √2, Σ h_k h_{k+2m} = δ_m and N vanishing moments of g (Daubechies 1992, §6.1)', () => {
    for (let order = 1; order <= 8; order++) {
      const { recLo: h, recHi: g } = daubechiesFilters(`db${order}`);
      expect(Math.abs(h.reduce((a, b) => a + b, 0) - Math.SQRT2)).toBeLessThan(1e-14);
      for (let m = 0; 2 * m < h.length; m++) {
        let s = 0;
        for (let k = 0; k + 2 * m < h.length; k++) s += h[k] * h[k + 2 * m];
        expect(Math.abs(s - (m === 0 ? 1 : 0))).toBeLessThan(1e-14);
      }
      for (let p = 0; p < order; p++) {
        let moment = 0;
        let scale = 0;
        for (let k = 0; k < g.length; k++) {
          moment += g[k] * k ** p;
          scale += Math.abs(g[k]) * k ** p;
        }
        expect(Math.abs(moment)).toBeLessThan(1e-12 * scale);
      }
    }
  });

  it('refuses an unknown wavelet name', () => {
    expect(() => daubechiesFilters('db9')).toThrow(RangeError);
    expect(() => daubechiesFilters('haar')).toThrow(/db1/);
  });
});

describe("2D DWT against pywt.wavedec2(..., mode='periodization')", () => {
  // Measured: coefficients within 4.5e-15 and reconstructions within 5.4e-15 of the fixture
  // (values of order 1–10); asserted 1e-12.
  for (const c of fixture.cases) {
    it(`${c.wavelet}, mode ${c.mode}, ${c.ny}×${c.nx}, ${c.level} levels: coefficients and perfect reconstruction to 1e-12`, () => {
      const image = caseImage(c);
      const w = dwt2(image, c.wavelet, c.level);
      const n = c.nx * c.ny;
      const re = new Float64Array(n);
      const im = new Float64Array(n);
      for (let i = 0; i < n; i++) {
        re[i] = w.data[2 * i];
        im[i] = w.data[2 * i + 1];
      }
      expect(maxAbsDifference(re, c.real.coefficients)).toBeLessThan(1e-12);
      expect(maxAbsDifference(im, c.imag.coefficients)).toBeLessThan(1e-12);
      const back = idwt2(w, c.wavelet, c.level);
      expect(maxAbsDifference(back.data, image.data)).toBeLessThan(1e-12);
    });
  }
});

describe('the periodised DWT is unitary (orthogonal filters, square transform)', () => {
  it('‖Wx‖ = ‖x‖ to 1e-12 relative, and ⟨Wx, c⟩ = ⟨x, W⁻¹c⟩ (adjoint = inverse), db1–db8', () => {
    // Measured: relative norm differences up to 1.6e-15; asserted 1e-12.
    for (const name of WAVELET_NAMES) {
      const x = randomComplexImage(64, 32, 3);
      const c = randomComplexImage(64, 32, 4);
      const wx = dwt2(x, name, 3);
      expect(Math.abs(Math.sqrt(energy(wx)) / Math.sqrt(energy(x)) - 1)).toBeLessThan(1e-12);
      const wInvC = idwt2(c, name, 3);
      let lhs = 0;
      let rhs = 0;
      for (let i = 0; i < x.data.length; i++) {
        lhs += wx.data[i] * c.data[i];
        rhs += x.data[i] * wInvC.data[i];
      }
      expect(Math.abs(lhs - rhs)).toBeLessThan(1e-12 * Math.sqrt(energy(x) * energy(c)));
    }
  });

  it('works in place (target = source) and leaves the input alone otherwise', () => {
    const x = randomComplexImage(32, 16, 5);
    const copy = x.data.slice();
    const out = dwt2(x, 'db4', 2);
    expect(x.data).toEqual(copy);
    dwt2(x, 'db4', 2, x);
    expect(maxAbsDifference(x.data, out.data)).toBe(0);
    idwt2(x, 'db4', 2, x);
    expect(maxAbsDifference(x.data, copy)).toBeLessThan(1e-13);
  });
});

describe('sizes: nx and ny must be divisible by 2^levels', () => {
  it('throws a RangeError naming the size otherwise, and for levels < 1 or fractional', () => {
    const x = randomComplexImage(24, 16, 1);
    expect(() => dwt2(x, 'db2', 4)).toThrow(/divisible by 16, got 16×24/);
    expect(() => checkDwtShape(30, 32, 2)).toThrow(RangeError);
    expect(() => checkDwtShape(32, 32, 0)).toThrow(RangeError);
    expect(() => checkDwtShape(32, 32, 1.5)).toThrow(RangeError);
    expect(() => dwt2(x, 'db2', 3)).not.toThrow();
  });

  it('maxDwtLevels gives the deepest allowed transform', () => {
    expect(maxDwtLevels(24, 16)).toBe(3);
    expect(maxDwtLevels(256, 256)).toBe(8);
    expect(maxDwtLevels(256, 96)).toBe(5);
    expect(maxDwtLevels(31, 32)).toBe(0);
  });
});

describe('soft-thresholding and cycle spinning', () => {
  it('complex soft-threshold shrinks moduli by t and keeps phases (Donoho 1995)', () => {
    const data = Float64Array.from([3, 4, 0.3, -0.4, -6, 0]);
    const l1 = softThresholdComplex(data, 1);
    expect(maxAbsDifference(data, [2.4, 3.2, 0, 0, -5, 0])).toBeLessThan(1e-15);
    expect(l1).toBeCloseTo(4 + 5, 14);
  });

  it('softThresholdDetails leaves the approximation block and shrinks every detail band', () => {
    const nx = 16;
    const ny = 8;
    const levels = 2;
    const data = new Float64Array(2 * nx * ny).fill(2);
    const l1 = softThresholdDetails(data, nx, ny, levels, 0.5);
    for (let row = 0; row < ny; row++) {
      for (let col = 0; col < nx; col++) {
        const inApprox = row < 2 && col < 4;
        expect(data[2 * (row * nx + col)]).toBeCloseTo(inApprox ? 2 : 2 - 0.5 / Math.SQRT2, 14);
      }
    }
    const details = nx * ny - 8;
    expect(l1).toBeCloseTo(details * (Math.hypot(2, 2) - 0.5), 10);
    expect(detailL1(data, nx, ny, levels)).toBeCloseTo(l1, 10);
  });

  it('a shift by 2^L moves each band circularly, leaving the detail ℓ1 unchanged; a shift by 1 changes it', () => {
    const nx = 32;
    const ny = 32;
    const levels = 3;
    const x = randomComplexImage(nx, ny, 8);
    const shifted = { nx, ny, data: new Float64Array(2 * nx * ny) };
    const norm = (img: ComplexImage) => detailL1(dwt2(img, 'db4', levels).data, nx, ny, levels);
    circularShift(shifted.data, x.data, nx, ny, 8, -16);
    expect(Math.abs(norm(shifted) - norm(x))).toBeLessThan(1e-12 * norm(x));
    circularShift(shifted.data, x.data, nx, ny, 1, 0);
    expect(Math.abs(norm(shifted) - norm(x))).toBeGreaterThan(1e-3 * norm(x));
  });

  it('circularShift moves pixel (i, j) to (i + dy, j + dx) mod size and the opposite shift undoes it', () => {
    const nx = 5;
    const ny = 4;
    const x = randomComplexImage(nx, ny, 2);
    const y = new Float64Array(2 * nx * ny);
    circularShift(y, x.data, nx, ny, 3, 2);
    expect(y[2 * (((1 + 3) % ny) * nx + ((4 + 2) % nx)) + 1]).toBe(x.data[2 * (1 * nx + 4) + 1]);
    const back = new Float64Array(2 * nx * ny);
    circularShift(back, y, nx, ny, -3, -2);
    expect(back).toEqual(x.data);
    expect(() => circularShift(y, y, nx, ny, 1, 1)).toThrow(RangeError);
  });

  it('random shifts are seeded and lie in [0, 2^L)', () => {
    const a = new SeededRandom(7);
    const b = new SeededRandom(7);
    const seen = new Set<number>();
    for (let i = 0; i < 200; i++) {
      const s = randomShift(a, 3);
      expect(randomShift(b, 3)).toEqual(s);
      expect(s.dy >= 0 && s.dy < 8 && s.dx >= 0 && s.dx < 8).toBe(true);
      seen.add(s.dy * 8 + s.dx);
    }
    expect(seen.size).toBeGreaterThan(50);
  });
});
