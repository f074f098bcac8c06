import { readFileSync } from 'node:fs';
import { generateMask, type SampledMask } from '../../sampling/index.ts';
import { acquire } from '../../src/acquisition/acquire.ts';
import { fullKspaceFromPhantom } from '../../src/acquisition/phantom-source.ts';
import { fft2c } from '../../src/core/centered-fft.ts';
import { type ComplexImage, createComplexImage } from '../../src/core/complex-image.ts';
import { SeededRandom } from '../../src/core/random.ts';
import { getPhantom } from '../../src/phantoms/index.ts';

/** Random complex ny×nx image (standard normal parts). */
export function randomComplexImage(nx: number, ny: number, seed: number): ComplexImage {
  const rng = new SeededRandom(seed);
  const image = createComplexImage(nx, ny);
  for (let i = 0; i < image.data.length; i++) image.data[i] = rng.normal();
  return image;
}

/** Acquired k-space M ⊙ F_c(image) for a mask. */
export function sampledKspace(image: ComplexImage, mask: Uint8Array): ComplexImage {
  const k = fft2c(image);
  for (let i = 0; i < mask.length; i++) {
    if (!mask[i]) {
      k.data[2 * i] = 0;
      k.data[2 * i + 1] = 0;
    }
  }
  return k;
}

export function fullMask(nx: number, ny: number): Uint8Array {
  return new Uint8Array(nx * ny).fill(1);
}

/** ‖a − b‖₂ / ‖b‖₂ over interleaved complex (or real) arrays. */
export function relativeError(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let num = 0;
  let den = 0;
  for (let i = 0; i < b.length; i++) {
    num += (a[i] - b[i]) ** 2;
    den += b[i] ** 2;
  }
  return Math.sqrt(num / den);
}

/** max over pixels of |a_i − b_i| for interleaved complex arrays (the per-pixel distance). */
export function maxPixelDistance(a: Float64Array, b: Float64Array): number {
  let worst = 0;
  for (let i = 0; i < b.length; i += 2) worst = Math.max(worst, Math.hypot(a[i] - b[i], a[i + 1] - b[i + 1]));
  return worst;
}

export function maxAbsDifference(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < b.length; i++) m = Math.max(m, Math.abs(a[i] - b[i]));
  return m;
}

/**
 * k-space of K point sources (Diracs) at (X_k, Y_k) in the phantom frame [−1, 1]², y up, with
 * complex amplitudes c_k, on the grid of DEVELOPERS.md: F(kx, ky) = Σ c_k e^(−i2π(kx X_k + ky Y_k)),
 * kx = (u − ⌊nx/2⌋)/2, ky = −(v − ⌊ny/2⌋)/2. Off-grid positions: a sum of K 2-D exponentials.
 */
export function pointSourceKspace(
  nx: number,
  ny: number,
  sources: ReadonlyArray<{ x: number; y: number; re: number; im: number }>,
): ComplexImage {
  const k = createComplexImage(nx, ny);
  for (let v = 0; v < ny; v++) {
    for (let u = 0; u < nx; u++) {
      const kx = (u - Math.floor(nx / 2)) / 2;
      const ky = -(v - Math.floor(ny / 2)) / 2;
      let re = 0;
      let im = 0;
      for (const s of sources) {
        const phase = -2 * Math.PI * (kx * s.x + ky * s.y);
        const c = Math.cos(phase);
        const sn = Math.sin(phase);
        re += s.re * c - s.im * sn;
        im += s.re * sn + s.im * c;
      }
      k.data[2 * (v * nx + u)] = re;
      k.data[2 * (v * nx + u) + 1] = im;
    }
  }
  return k;
}

/** Random mask with each point kept with probability `fraction`. */
export function randomPointMask(nx: number, ny: number, fraction: number, seed: number): Uint8Array {
  const rng = new SeededRandom(seed);
  const mask = new Uint8Array(nx * ny);
  for (let i = 0; i < mask.length; i++) if (rng.uniform() < fraction) mask[i] = 1;
  return mask;
}

/** Four off-grid point sources (phantom frame, complex amplitudes) used by the finite-rate-of-innovation checks. */
export const POINT_SOURCES: ReadonlyArray<{ x: number; y: number; re: number; im: number }> = [
  { x: 0.13, y: -0.41, re: 1, im: 0 },
  { x: -0.52, y: 0.27, re: 0.6, im: -0.2 },
  { x: 0.33, y: 0.61, re: 0.3, im: 0.5 },
  { x: -0.2, y: -0.7, re: 0.8, im: 0.1 },
];

/**
 * The 1-D exact check signal of docs/references.md §5.3 [C]: M = 64 samples
 * x[m] = Σ c_k e^(−i2π m t_k), K = 3, t = (0.13, 0.41, 0.77), c = (1, 0.6 − 0.2i, 0.3 + 0.5i).
 */
export function friSignal1d(): Float64Array {
  const m = 64;
  const t = [0.13, 0.41, 0.77];
  const c = [
    [1, 0],
    [0.6, -0.2],
    [0.3, 0.5],
  ];
  const x = new Float64Array(2 * m);
  for (let j = 0; j < m; j++) {
    for (let k = 0; k < 3; k++) {
      const phase = -2 * Math.PI * j * t[k];
      x[2 * j] += c[k][0] * Math.cos(phase) - c[k][1] * Math.sin(phase);
      x[2 * j + 1] += c[k][0] * Math.sin(phase) + c[k][1] * Math.cos(phase);
    }
  }
  return x;
}

/** One case of the ROF (TV-denoising) fixture made by tests/reference/generate_tv_fixture.py. */
export interface TvRofCase {
  name: string;
  nx: number;
  ny: number;
  weight: number;
  inputScale: number;
  input: number[];
  output: number[];
  objective: number;
  selfConvergence: number;
}

/** skimage.restoration.denoise_tv_chambolle outputs (Debian python3-skimage), tests/reference/fixtures/tv-rof.json. */
export function tvRofFixture(): { cases: TvRofCase[] } {
  return JSON.parse(readFileSync(new URL('../reference/fixtures/tv-rof.json', import.meta.url), 'utf8')) as {
    cases: TvRofCase[];
  };
}

/**
 * A piecewise-constant 32×32 object (a unit block, rows 8–23 × columns 10–21) seen through a random
 * 40 % point mask (seed 3): the TV reconstructions' shared test problem.
 */
export function blockObjectProblem(): { image: ComplexImage; mask: Uint8Array; kspace: ComplexImage } {
  const n = 32;
  const image = createComplexImage(n, n);
  for (let i = 8; i < 24; i++) for (let j = 10; j < 22; j++) image.data[2 * (i * n + j)] = 1;
  const mask = randomPointMask(n, n, 0.4, 3);
  return { image, mask, kspace: sampledKspace(image, mask) };
}

/**
 * Noiseless acquisition of a phantom's exact (analytic) k-space on n×n through a Poisson-disc mask at
 * R = 4 with an acs×acs block, drawn with `seed`: the CS solver tests' and benchmarks' input.
 */
export function poissonDiscAcquisition(
  phantom: string,
  n: number,
  acs: number,
  seed: number,
): { kspace: ComplexImage; sampled: SampledMask } {
  const full = fullKspaceFromPhantom(getPhantom(phantom), n, n, 'analytic');
  const sampled = generateMask({ nx: n, ny: n }, { pattern: 'poisson-disc', acceleration: 4, acs, seed });
  const { kspace } = acquire(full, sampled.mask, undefined, seed);
  return { kspace, sampled };
}
