import { addComplexNoise } from '../acquisition/noise.ts';
import { type ComplexImage, createComplexImage, magnitude } from '../core/complex-image.ts';
import { throwIfAborted } from '../core/errors.ts';
import type { ReconInput } from '../recon/method.ts';
import { contrastRecovery, lesionResponse } from './contrast-recovery.ts';
import { lesionCnr, npwDetectability, ROSE_K, roseResolved } from './detectability.ts';
import { countFalseLesions, type FalseLesions } from './false-lesions.ts';
import { type Lesion, lesionDiscPixels } from './lesion.ts';
import { lesionCandidates, lesionMargins } from './lesion-placement.ts';
import {
  kernelVariance,
  replicaVariance,
  weightSupport,
  zeroFilledNoiseKernel,
  zeroFilledVariance,
} from './observer-noise.ts';

/**
 * How the noise in the reconstruction is known: `replicas` reconstructs the lesion-free data with
 * `count` further noise draws (any method, linear or not); `zero-filled` uses σ and the mask
 * directly (exact, and only valid when `reconstruct` is the zero-filled method).
 */
export type NoiseKnowledge =
  | { kind: 'replicas'; count: number }
  | { kind: 'zero-filled'; densityCompensation?: boolean };

export interface LesionStudyInput {
  /** Full grid k-space of the object without lesions and with them (noiseless). */
  without: ComplexImage;
  withLesions: ComplexImage;
  /** The fully sampled noiseless reference without lesions, F_cᴴ(without). */
  reference: ComplexImage;
  objectMask: Uint8Array;
  lesions: readonly Lesion[];
  /** Each lesion's own fully sampled noiseless response t (same order as `lesions`). */
  templates: readonly ComplexImage[];
  mask: Uint8Array;
  density?: Float64Array;
  /** Noise σ per real channel in k-space (0: noiseless) and the seed of the paired draw. */
  sigma: number;
  seed: number;
  noise: NoiseKnowledge;
  /**
   * One reconstruction, with everything fixed (λ absolute, iteration count, no early stop that
   * depends on the data), so that paired runs and replicas differ only in their data.
   */
  reconstruct: (input: ReconInput) => ComplexImage;
  /**
   * The lesion-free run already done with this mask, noise draw and `reconstruct` (its acquired
   * k-space and its image): the study then reuses that image as recon(without) and forms the
   * with-lesion data as acquired + M ⊙ (withLesions − without), the same draw without a new one.
   */
  paired?: { acquired: ComplexImage; image: ComplexImage };
  /**
   * |recon(without)| and |reference| when the caller already has them (a plan cell scores the same
   * two images): the false-lesion error map then reuses them instead of taking them again.
   */
  magnitudes?: { without: Float64Array; reference: Float64Array };
  signal?: AbortSignal;
}

export interface LesionScore {
  row: number;
  col: number;
  contrastRecovery: number;
  cnr: number;
  resolved: boolean;
  detectability: number;
  /** Mean of Re r over the disc ≥ threshold: the matched filter calls this lesion. */
  called: boolean;
}

export interface LesionStudy {
  lesions: LesionScore[];
  contrastRecovery: { mean: number; min: number };
  resolved: number;
  falseLesions: FalseLesions;
  /** The matched-filter threshold lesions and false lesions are called at (absolute intensity). */
  threshold: number;
  roseK: number;
  noise: { method: 'replicas' | 'zero-filled'; replicas: number };
  /** Reconstructions this study ran (a shared lesion-free run not counted). */
  reconstructions: number;
  /** recon(with lesions): the paired run's image. */
  withImage: ComplexImage;
}

/** The lesion-free acquired data plus M ⊙ (with − without): the with-lesion data of the same noise draw. */
function withAdded(
  acquiredWithout: ComplexImage,
  withLesions: ComplexImage,
  without: ComplexImage,
  mask: Uint8Array,
): ComplexImage {
  const k = createComplexImage(without.nx, without.ny);
  k.data.set(acquiredWithout.data);
  for (let i = 0; i < mask.length; i++) {
    if (!mask[i]) continue;
    k.data[2 * i] += withLesions.data[2 * i] - without.data[2 * i];
    k.data[2 * i + 1] += withLesions.data[2 * i + 1] - without.data[2 * i + 1];
  }
  return k;
}

/** M ⊙ (full + noise of σ per real channel drawn from `seed`): one simulated acquisition of full k-space. */
export function acquiredWithNoise(
  full: ComplexImage,
  mask: Uint8Array,
  sigma: number,
  seed: number,
): ComplexImage {
  const noisy = full.data.slice();
  if (sigma > 0) addComplexNoise(noisy, sigma, seed);
  const k = createComplexImage(full.nx, full.ny);
  for (let i = 0; i < mask.length; i++) {
    if (!mask[i]) continue;
    k.data[2 * i] = noisy[2 * i];
    k.data[2 * i + 1] = noisy[2 * i + 1];
  }
  return k;
}

/** Real weights image: 1 on the given pixels. */
function indicator(pixels: Int32Array, nx: number, ny: number): ComplexImage {
  const w = createComplexImage(nx, ny);
  for (const p of pixels) w.data[2 * p] = 1;
  return w;
}

/** r restricted to pixels within `radius` of (row, col): the lesion's own part of the response. */
function windowed(r: ComplexImage, row: number, col: number, radius: number): ComplexImage {
  const s = createComplexImage(r.nx, r.ny);
  const reach = Math.floor(radius);
  for (let i = Math.max(0, row - reach); i <= Math.min(r.ny - 1, row + reach); i++) {
    for (let j = Math.max(0, col - reach); j <= Math.min(r.nx - 1, col + reach); j++) {
      if ((i - row) ** 2 + (j - col) ** 2 > radius * radius) continue;
      const p = 2 * (i * r.nx + j);
      s.data[p] = r.data[p];
      s.data[p + 1] = r.data[p + 1];
    }
  }
  return s;
}

/**
 * One lesion study (DEVELOPERS.md "Feature fidelity"): paired reconstructions with and without the
 * lesions (same mask, same noise draw `seed`), the response r = recon(with) − recon(without), and per
 * lesion
 * - contrast recovery Re⟨r, t⟩/⟨t, t⟩ over its disc;
 * - CNR of the disc sum against the reconstruction's noise (replicas or the known σ), resolved by
 *   Rose's criterion CNR ≥ 5;
 * - the non-prewhitening matched filter's d' with s = r within half the lesion separation of its
 *   centre (neighbours excluded);
 * - `called`: the disc mean of Re r reaches the threshold, half the disc mean of t (halfway between
 *   absent and perfectly reconstructed), raised to k × the noise SD of that disc mean when noisy;
 * and false lesions: blobs of the lesion-free error map |x̂| − |x_ref| that the same disc filter
 * calls at the same threshold (with the first lesion's size and sign), counted where a lesion could
 * have been placed (the object less the edge clearance).
 * Noise replicas reuse the lesion-free data with draws seed + 1 … seed + M.
 */
export function runLesionStudy(input: LesionStudyInput): LesionStudy {
  const { lesions, templates, mask, density, sigma, seed, noise, reconstruct, signal } = input;
  const { nx, ny } = input.reference;
  if (lesions.length === 0 || templates.length !== lesions.length) {
    throw new RangeError('need one template per lesion and at least one lesion');
  }
  const recon = (k: ComplexImage) => {
    throwIfAborted(signal);
    return reconstruct({ kspace: k, mask, density });
  };
  const { paired } = input;
  const withImage = recon(
    paired
      ? withAdded(paired.acquired, input.withLesions, input.without, mask)
      : acquiredWithNoise(input.withLesions, mask, sigma, seed),
  );
  const withoutImage = paired ? paired.image : recon(acquiredWithNoise(input.without, mask, sigma, seed));
  const response = lesionResponse(withImage, withoutImage);
  let reconstructions = paired ? 1 : 2;

  const replicas: ComplexImage[] = [];
  if (noise.kind === 'replicas' && sigma > 0) {
    for (let m = 0; m < noise.count; m++) {
      replicas.push(recon(acquiredWithNoise(input.without, mask, sigma, seed + 1 + m)));
      reconstructions++;
    }
  }
  // Known σ: one kernel for every observer of small support (pairs ≤ 4N), a transform otherwise.
  const knownDensity = noise.kind === 'zero-filled' && noise.densityCompensation ? density : undefined;
  const kernel =
    noise.kind === 'zero-filled' && sigma > 0 ? zeroFilledNoiseKernel(mask, nx, ny, knownDensity) : null;
  const variance = (w: ComplexImage): number => {
    if (sigma === 0) return 0;
    if (kernel) {
      const support = weightSupport(w);
      return support.length ** 2 <= 4 * nx * ny
        ? kernelVariance(w, support, kernel, sigma)
        : zeroFilledVariance(w, mask, sigma, knownDensity);
    }
    return replicaVariance(w, replicas);
  };

  const scores: LesionScore[] = [];
  let firstThreshold = 0;
  lesions.forEach((lesion, index) => {
    const template = templates[index];
    const pixels = lesionDiscPixels(lesion, nx, ny);
    const discWeights = indicator(pixels, nx, ny);
    let discSignal = 0;
    let templateSum = 0;
    for (const p of pixels) {
      discSignal += response.data[2 * p];
      templateSum += template.data[2 * p];
    }
    const discVariance = variance(discWeights);
    const cnr = lesionCnr(discSignal, discVariance, lesion.amplitude);
    const s = windowed(response, lesion.row, lesion.col, lesionMargins(lesion.diameter).separation / 2);
    let energy = 0;
    for (let i = 0; i < s.data.length; i++) energy += s.data[i] * s.data[i];
    const detectability = npwDetectability(energy, variance(s));
    const n = pixels.length;
    const threshold = Math.max(0.5 * Math.abs(templateSum / n), (ROSE_K * Math.sqrt(discVariance)) / n);
    if (index === 0) firstThreshold = threshold;
    scores.push({
      row: lesion.row,
      col: lesion.col,
      contrastRecovery: contrastRecovery(response, template, lesion),
      cnr,
      resolved: roseResolved(cnr),
      detectability,
      called: (Math.sign(lesion.amplitude) * discSignal) / n >= threshold,
    });
  });

  const recovered = scores.map((s) => s.contrastRecovery);
  const errorMap = input.magnitudes ? input.magnitudes.without.slice() : magnitude(withoutImage);
  const referenceMagnitude = input.magnitudes?.reference ?? magnitude(input.reference);
  for (let i = 0; i < errorMap.length; i++) errorMap[i] -= referenceMagnitude[i];
  const first = lesions[0];
  const falseLesions = countFalseLesions(
    errorMap,
    lesionCandidates(input.objectMask, nx, ny, first.diameter),
    nx,
    ny,
    first.diameter,
    firstThreshold,
    first.amplitude < 0 ? -1 : 1,
  );
  return {
    lesions: scores,
    contrastRecovery: {
      mean: recovered.reduce((a, b) => a + b, 0) / recovered.length,
      min: Math.min(...recovered),
    },
    resolved: scores.filter((s) => s.resolved).length,
    falseLesions,
    threshold: firstThreshold,
    roseK: ROSE_K,
    noise: { method: noise.kind, replicas: replicas.length },
    reconstructions,
    withImage,
  };
}
