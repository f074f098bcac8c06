import { ifft2c } from '../src/core/centered-fft.ts';
import { type ComplexImage, createComplexImage } from '../src/core/complex-image.ts';
import { ValidationError } from '../src/core/errors.ts';
import type { RealImage } from '../src/core/real-image.ts';
import { nufftPlanFor } from '../src/nufft/plan-cache.ts';
import { densityWeightsFor } from '../src/nufft/trajectory-weights.ts';
import type { SampledMask } from './sampled-mask.ts';
import type { Trajectory } from './trajectories/trajectory.ts';

/**
 * PSF of a non-Cartesian trajectory through the NUFFT: the gridding reconstruction of unit samples,
 * Aᴴ(w ⊙ 1) with the density compensation w the reconstruction uses. Its centre is its peak
 * (|Σ w e^{iφ}| ≤ Σ w for w ≥ 0).
 */
function trajectoryPsf(trajectory: Trajectory, nx: number, ny: number): ComplexImage {
  const plan = nufftPlanFor(trajectory, nx, ny);
  const { weights } = densityWeightsFor(trajectory, nx, ny);
  const samples = new Float64Array(2 * plan.count);
  for (let p = 0; p < plan.count; p++) samples[2 * p] = weights[p];
  return plan.adjoint(samples);
}

/**
 * Default main-lobe radius in pixels, √2: the centre and its 8 neighbours. A fully sampled grid has a
 * one-pixel PSF; variable density (denser near the k-space centre) widens the central peak into the
 * neighbouring pixels — a low-pass blur, not aliasing — so side lobes are measured outside the 3×3
 * block around the centre.
 */
export const DEFAULT_MAIN_LOBE_RADIUS = Math.SQRT2;

export interface MaskDiagnostics {
  /** |PSF| normalised to its peak 1, ny×nx, centre at (⌊ny/2⌋, ⌊nx/2⌋). */
  psf: RealImage;
  /** Largest |PSF| at a distance > mainLobeRadius pixels from the centre (peak side-lobe ratio). */
  peakSidelobe: number;
  /** Radius in pixels of the main lobe that peakSidelobe leaves out. */
  mainLobeRadius: number;
  /** Mean |PSF| over the ring of pixels whose distance from the centre rounds to i, i = 0, 1, … */
  radialProfile: number[];
}

/**
 * Point-spread function of a sampling mask: psf = ifft2c(M) (centred orthonormal inverse DFT,
 * src/core/centered-fft.ts), |psf| divided by its value at the centre, which is its peak
 * (|Σ M e^{iφ}| ≤ Σ M = the centre value). Rasterised trajectories: the PSF of the rasterised mask;
 * non-Cartesian ones: the PSF through the NUFFT (trajectoryPsf).
 * Distances are Euclidean in pixels from the centre, in the centred frame (offsets −⌊n/2⌋ … ⌈n/2⌉ − 1).
 */
export function maskDiagnostics(m: SampledMask, options: { mainLobeRadius?: number } = {}): MaskDiagnostics {
  const mainLobeRadius = options.mainLobeRadius ?? DEFAULT_MAIN_LOBE_RADIUS;
  if (!(mainLobeRadius >= 0) || !Number.isFinite(mainLobeRadius)) {
    throw new ValidationError({
      field: 'mainLobeRadius',
      message: `must be a finite number ≥ 0, got ${mainLobeRadius}`,
      allowed: '≥ 0 pixels',
    });
  }
  const { nx, ny, mask } = m;
  const n = nx * ny;
  let k: ComplexImage;
  if (m.trajectory) {
    k = trajectoryPsf(m.trajectory, nx, ny);
  } else {
    k = createComplexImage(nx, ny);
    for (let i = 0; i < n; i++) k.data[2 * i] = mask[i] !== 0 ? 1 : 0;
    ifft2c(k, k);
  }
  const cx = Math.floor(nx / 2);
  const cy = Math.floor(ny / 2);
  const d = k.data;
  const centre = cy * nx + cx;
  const peak = Math.hypot(d[2 * centre], d[2 * centre + 1]);
  const psf = new Float64Array(n);
  if (peak > 0) for (let i = 0; i < n; i++) psf[i] = Math.hypot(d[2 * i], d[2 * i + 1]) / peak;

  const maxRing = Math.round(Math.hypot(Math.max(cx, nx - 1 - cx), Math.max(cy, ny - 1 - cy)));
  const ringSum = new Float64Array(maxRing + 1);
  const ringCount = new Float64Array(maxRing + 1);
  const r2 = mainLobeRadius * mainLobeRadius + 1e-9; // pixels at exactly the radius belong to the main lobe
  let peakSidelobe = 0;
  for (let v = 0; v < ny; v++) {
    const dy = v - cy;
    for (let u = 0; u < nx; u++) {
      const dx = u - cx;
      const d2 = dx * dx + dy * dy;
      const value = psf[v * nx + u];
      const ring = Math.round(Math.sqrt(d2));
      ringSum[ring] += value;
      ringCount[ring]++;
      if (d2 > r2 && value > peakSidelobe) peakSidelobe = value;
    }
  }
  const radialProfile = Array.from(ringSum, (s, i) => (ringCount[i] > 0 ? s / ringCount[i] : 0));
  return { psf: { nx, ny, data: psf }, peakSidelobe, mainLobeRadius, radialProfile };
}
