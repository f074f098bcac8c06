import { describe, expect, it } from 'vitest';
import { centeredLineTransform, fft2c, ifft2c } from '../../src/core/centered-fft.ts';
import { createComplexImage, energy } from '../../src/core/complex-image.ts';
import { fftPlan } from '../../src/core/fft-plan.ts';
import { SeededRandom } from '../../src/core/random.ts';
import { relativeMaxError } from '../error-measures.ts';

/** Direct O(N²) unnormalised DFT, the textbook definition (docs/references.md §2.1, common practice). */
function directDft(x: Float64Array): Float64Array {
  const n = x.length / 2;
  const out = new Float64Array(2 * n);
  for (let k = 0; k < n; k++) {
    let re = 0;
    let im = 0;
    for (let j = 0; j < n; j++) {
      const phase = (-2 * Math.PI * ((j * k) % n)) / n;
      const c = Math.cos(phase);
      const s = Math.sin(phase);
      re += x[2 * j] * c - x[2 * j + 1] * s;
      im += x[2 * j] * s + x[2 * j + 1] * c;
    }
    out[2 * k] = re;
    out[2 * k + 1] = im;
  }
  return out;
}

function randomComplex(n: number, seed: number): Float64Array {
  const rng = new SeededRandom(seed);
  return Float64Array.from({ length: 2 * n }, () => rng.normal());
}

describe('1D plans against the direct DFT (definition, docs/references.md §2.1–2.2)', () => {
  const lengths = [...Array.from({ length: 64 }, (_, i) => i + 1), 97, 182, 218, 320, 384, 509, 1000];
  // The issue asks ≤ 1e-10 and docs/references.md §2.2 < 1e-11; measured ≤ 2.1e-15 over all these lengths
  // (the direct sum itself rounds at ~√N·ε), so 1e-12 keeps ~500× slack.
  it.each(lengths)('N = %i: relative max error ≤ 1e-12', (n) => {
    const x = randomComplex(n, n);
    const got = new Float64Array(2 * n);
    fftPlan(n).forward(got, x);
    expect(relativeMaxError(got, directDft(x))).toBeLessThanOrEqual(1e-12);
  });

  it('Bluestein at N = 320: ramp x[n] = n has the closed form −160 + 160i·cot(πk/320) (docs/references.md §2.2)', () => {
    const n = 320;
    const x = new Float64Array(2 * n);
    for (let j = 0; j < n; j++) x[2 * j] = j;
    const got = new Float64Array(2 * n);
    fftPlan(n).forward(got, x);
    expect(got[0]).toBeCloseTo(51040, 6);
    expect(Math.abs(got[1])).toBeLessThan(1e-7);
    const checks: [number, number, number][] = [
      [1, -160, 16296.94257047],
      [7, -160, 2324.54310729],
      [160, -160, 0],
    ];
    for (const [k, re, im] of checks) {
      const scale = Math.hypot(re, im);
      expect(Math.abs(got[2 * k] - re) / scale).toBeLessThan(1e-9);
      expect(Math.abs(got[2 * k + 1] - im) / scale).toBeLessThan(1e-9);
    }
  });
});

describe('centred orthonormal transform (docs/design.md §3.2)', () => {
  it('fftshift and ifftshift index moves for odd and even N (docs/references.md §2.1)', () => {
    // A centred transform of a delta at ⌊N/2⌋ is constant: check the shift by where the DC lands instead.
    for (const n of [4, 5]) {
      const x = new Float64Array(2 * n);
      for (let j = 0; j < n; j++) x[2 * j] = 1; // constant → DC only
      const out = new Float64Array(2 * n);
      centeredLineTransform(out, x, 0, n, 1, -1);
      const dc = Math.floor(n / 2);
      expect(out[2 * dc]).toBeCloseTo(Math.sqrt(n), 12);
      for (let k = 0; k < n; k++)
        if (k !== dc) expect(Math.hypot(out[2 * k], out[2 * k + 1])).toBeLessThan(1e-12);
    }
  });

  it('centred delta at ⌊N/2⌋ → constant 1/√N, zero phase; N = 320 gives 0.05590170 (docs/references.md §2.1)', () => {
    const n = 320;
    const x = new Float64Array(2 * n);
    x[2 * 160] = 1;
    const out = new Float64Array(2 * n);
    centeredLineTransform(out, x, 0, n, 1, -1);
    for (let k = 0; k < n; k++) {
      expect(Math.abs(out[2 * k] - 0.0559017)).toBeLessThan(1e-8);
      expect(Math.abs(out[2 * k + 1])).toBeLessThan(1e-12);
    }
  });

  it('odd N: a delta at ⌊N/2⌋ also gives zero phase, which needs ifftshift (not fftshift) on input (docs/references.md §2.1)', () => {
    // ifftshift([0,1,2,3,4]) = [2,3,4,0,1] moves ⌊N/2⌋ to 0; fftshift would move it to N − 1 and
    // leave a linear phase e^(i2πk/N) on the output.
    for (const n of [5, 7, 321]) {
      for (const sign of [-1, 1] as const) {
        const x = new Float64Array(2 * n);
        x[2 * Math.floor(n / 2)] = 1;
        const out = new Float64Array(2 * n);
        centeredLineTransform(out, x, 0, n, 1, sign);
        for (let k = 0; k < n; k++) {
          expect(Math.abs(out[2 * k] - 1 / Math.sqrt(n))).toBeLessThan(1e-14);
          expect(Math.abs(out[2 * k + 1])).toBeLessThan(1e-14);
        }
      }
    }
  });

  it('single complex exponential e^(i2π·5n/N) at N = 320 → √320 = 17.88854382 in one bin (docs/references.md §2.2)', () => {
    const n = 320;
    const x = new Float64Array(2 * n);
    for (let j = 0; j < n; j++) {
      x[2 * j] = Math.cos((2 * Math.PI * 5 * j) / n);
      x[2 * j + 1] = Math.sin((2 * Math.PI * 5 * j) / n);
    }
    const out = new Float64Array(2 * n);
    fftPlan(n).forward(out, x);
    expect(Math.abs(out[10] / Math.sqrt(n) - 17.88854382)).toBeLessThan(1e-8);
    for (let k = 0; k < n; k++)
      if (k !== 5) expect(Math.hypot(out[2 * k], out[2 * k + 1]) / Math.sqrt(n)).toBeLessThan(1e-10);
  });

  it.each([
    [1, 1],
    [2, 3],
    [5, 7],
    [64, 64],
    [182, 218],
    [320, 320],
    [384, 96],
  ])('%i×%i: Parseval to 1e-12 and inverse(forward(x)) = x', (nx, ny) => {
    const image = createComplexImage(nx, ny);
    image.data.set(randomComplex(nx * ny, nx * 1000 + ny));
    const k = fft2c(image);
    expect(Math.abs(energy(k) - energy(image)) / energy(image)).toBeLessThan(1e-12);
    const back = ifft2c(k);
    expect(relativeMaxError(back.data, image.data)).toBeLessThan(1e-12);
  });

  it('in-place use gives the same bytes as out-of-place', () => {
    const image = createComplexImage(37, 24);
    image.data.set(randomComplex(37 * 24, 3));
    const out = fft2c(image);
    fft2c(image, image);
    expect(Array.from(image.data)).toEqual(Array.from(out.data));
  });

  it('a real even image has a real centred transform (docs/references.md §2.1, common practice)', () => {
    for (const [nx, ny] of [
      [9, 7],
      [8, 6],
    ]) {
      const image = createComplexImage(nx, ny);
      const cx = Math.floor(nx / 2);
      const cy = Math.floor(ny / 2);
      for (let r = 0; r < ny; r++)
        for (let c = 0; c < nx; c++) {
          const dx = c - cx;
          const dy = r - cy;
          // Even about the centre where the mirrored pixel exists (all of it for odd sizes).
          image.data[2 * (r * nx + c)] =
            Math.exp(-(dx * dx + dy * dy) / 4) *
            (nx % 2 && ny % 2 ? 1 : Math.abs(dx) < cx && Math.abs(dy) < cy ? 1 : 0);
        }
      const k = fft2c(image);
      for (let i = 0; i < nx * ny; i++) expect(Math.abs(k.data[2 * i + 1])).toBeLessThan(1e-12);
    }
  });
});
