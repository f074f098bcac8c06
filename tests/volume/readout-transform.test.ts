import { describe, expect, it } from 'vitest';
import { SeededRandom } from '../../src/core/random.ts';
import { phaseEncodeTransform, readoutTransform } from '../../src/volume/readout-transform.ts';

/**
 * The readout transform against the DFT definition, written out as a direct sum: the centred
 * orthonormal DFT X[k] = N^(−½) Σ_n x[n] exp(−2πi (k − ⌊N/2⌋)(n − ⌊N/2⌋) / N), i.e.
 * fftshift ∘ fft(norm="ortho") ∘ ifftshift as numpy defines the shifts.
 */
function directLineDft(re: number[], im: number[], sign: -1 | 1): { re: number[]; im: number[] } {
  const n = re.length;
  const h = Math.floor(n / 2);
  const out = { re: new Array<number>(n).fill(0), im: new Array<number>(n).fill(0) };
  for (let k = 0; k < n; k++) {
    for (let j = 0; j < n; j++) {
      const phase = (sign * 2 * Math.PI * (k - h) * (j - h)) / n;
      out.re[k] += re[j] * Math.cos(phase) - im[j] * Math.sin(phase);
      out.im[k] += re[j] * Math.sin(phase) + im[j] * Math.cos(phase);
    }
    out.re[k] /= Math.sqrt(n);
    out.im[k] /= Math.sqrt(n);
  }
  return out;
}

function randomVolume(nx: number, ny: number, nz: number, seed: number): Float64Array {
  const rng = new SeededRandom(seed);
  const data = new Float64Array(2 * nx * ny * nz);
  for (let i = 0; i < data.length; i++) data[i] = rng.normal();
  return data;
}

describe('readout transform (x, fully sampled)', () => {
  for (const [nx, ny, nz] of [
    [5, 3, 4],
    [8, 2, 3],
    [7, 4, 1],
  ] as const) {
    it(`matches the direct centred DFT along x at ${nx}×${ny}×${nz}, forward and inverse`, () => {
      const source = randomVolume(nx, ny, nz, nx * 100 + ny * 10 + nz);
      for (const sign of [-1, 1] as const) {
        const data = source.slice();
        readoutTransform(data, nx, ny, nz, sign);
        for (let line = 0; line < ny * nz; line++) {
          const re = Array.from({ length: nx }, (_, x) => source[2 * (line * nx + x)]);
          const im = Array.from({ length: nx }, (_, x) => source[2 * (line * nx + x) + 1]);
          const expected = directLineDft(re, im, sign);
          for (let x = 0; x < nx; x++) {
            expect(data[2 * (line * nx + x)]).toBeCloseTo(expected.re[x], 12);
            expect(data[2 * (line * nx + x) + 1]).toBeCloseTo(expected.im[x], 12);
          }
        }
      }
    });
  }

  it('the phase-encode transform is the direct 2D DFT over (y, z) of each x-plane', () => {
    const [nx, ny, nz] = [3, 5, 4];
    const source = randomVolume(nx, ny, nz, 9);
    const data = source.slice();
    phaseEncodeTransform(data, nx, ny, nz, -1);
    const x = 1;
    // Separable: the DFT along y of each column, then along z of each row of the plane.
    const plane = (get: (y: number, z: number) => [number, number]) =>
      Array.from({ length: ny }, (_, y) => Array.from({ length: nz }, (_, z) => get(y, z)));
    const start = plane((y, z) => [
      source[2 * ((z * ny + y) * nx + x)],
      source[2 * ((z * ny + y) * nx + x) + 1],
    ]);
    const alongY = plane(() => [0, 0]);
    for (let z = 0; z < nz; z++) {
      const t = directLineDft(
        start.map((r) => r[z][0]),
        start.map((r) => r[z][1]),
        -1,
      );
      for (let y = 0; y < ny; y++) alongY[y][z] = [t.re[y], t.im[y]];
    }
    for (let y = 0; y < ny; y++) {
      const t = directLineDft(
        alongY[y].map((v) => v[0]),
        alongY[y].map((v) => v[1]),
        -1,
      );
      for (let z = 0; z < nz; z++) {
        expect(data[2 * ((z * ny + y) * nx + x)]).toBeCloseTo(t.re[z], 12);
        expect(data[2 * ((z * ny + y) * nx + x) + 1]).toBeCloseTo(t.im[z], 12);
      }
    }
  });
});
