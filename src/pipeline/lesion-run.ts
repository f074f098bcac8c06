import type { SampledMask } from '../../sampling/index.ts';
import { type FullAcquisition, sigmaForSnr } from '../acquisition/index.ts';
import { type ComplexImage, magnitude } from '../core/complex-image.ts';
import type { Limits } from '../core/limits.ts';
import type { RealImage } from '../core/real-image.ts';
import {
  acquiredWithNoise,
  type ContrastDetailPoint,
  contrastDetailCurve,
  contrastDetailLesionSet,
  DEFAULT_LESION_REPLICAS,
  LESION_SUPERSAMPLE,
  type LesionScore,
  type LesionSet,
  type LesionStudy,
  type LesionsRequest,
  lesionSetOn,
  lesionSpecOf,
  type NoiseKnowledge,
  runLesionStudy,
} from '../fidelity/index.ts';
import { type MethodSpec, reconstruct } from '../recon/index.ts';
import { pinnedReconstruction } from './pinned-method.ts';

/** The feature-fidelity scores of one reconstruction request with `lesions`. */
export interface FidelityOutcome {
  /** Each lesion as placed (centre row, col) with its scores; CNR and d' +∞ when noiseless. */
  lesions: LesionScore[];
  contrastRecovery: { mean: number; min: number };
  /** Lesions resolved by Rose's criterion (CNR ≥ roseK). */
  resolved: number;
  detectability: {
    mean: number;
    min: number;
    /** How the reconstruction's noise was known. */
    method: 'replicas' | 'known-sigma' | 'noiseless';
    replicas: number;
  };
  falseLesions: { count: number; positions: { row: number; col: number }[] };
  /** Absolute intensity a lesion (and a false lesion) is called at; roseK of the criterion. */
  threshold: number;
  roseK: number;
  /** The lesions as placed: diameter (px), shape, contrast and absolute amplitude. */
  diameter: number;
  shape: 'disc' | 'gaussian';
  contrast: number;
  amplitude: number;
  /** Reconstructions the study added to the base run. */
  reconstructions: number;
  /** |recon(with lesions)| (lesions.png). */
  image: RealImage;
  contrastDetail?: { curve: ContrastDetailPoint[]; fullySampled: ContrastDetailPoint[] };
  notes: string[];
}

export interface LesionRunInput {
  lesions: LesionsRequest;
  full: FullAcquisition;
  /** 'analytic': phantom k-space stays exact; 'raster': lesions rasterised and transformed (uploads). */
  kind: 'analytic' | 'raster';
  sampled: SampledMask;
  /** The base (lesion-free) run: its acquired k-space, image, method, method facts and noise. */
  acquired: ComplexImage;
  image: ComplexImage;
  method: MethodSpec;
  info: Record<string, unknown>;
  sigma: number;
  snr: number | null;
  noiseSeed: number;
  /** |image| and |reference| as the base run scored them (shared with the study's error map). */
  magnitudes?: { without: Float64Array; reference: Float64Array };
  signal?: AbortSignal;
  limits: Limits;
}

function noiseKnowledge(linear: boolean, method: MethodSpec, replicas: number | undefined): NoiseKnowledge {
  if (linear) {
    return {
      kind: 'zero-filled',
      densityCompensation: method.name === 'zero-filled' && method.densityCompensation === true,
    };
  }
  return { kind: 'replicas', count: replicas ?? DEFAULT_LESION_REPLICAS };
}

function finiteMean(values: number[]): number {
  return values.reduce((a, b) => a + b, 0) / values.length;
}

/**
 * The lesion study of one reconstruction request (DEVELOPERS.md "Feature fidelity"): lesions placed
 * in the source's object, the paired with-lesion run on the same mask and noise draw as the base run
 * (whose image is reused as the lesion-free one), noise replicas where the method is not linear,
 * and, when asked, the contrast–detail curve of the same sampling and method.
 */
export function runLesionFidelity(input: LesionRunInput): FidelityOutcome {
  const { lesions: request, full, sampled, method, signal, limits } = input;
  const spec = lesionSpecOf(request);
  const set = lesionSetOn(full.kspace, full.reference, spec, input.kind);
  const pinned = pinnedReconstruction(method, input.info, { signal, limits });
  const noise = noiseKnowledge(pinned.linear, method, request.replicas);
  const study = runLesionStudy({
    ...set,
    mask: sampled.mask,
    density: sampled.density,
    sigma: input.sigma,
    seed: input.noiseSeed,
    noise,
    reconstruct: pinned.reconstruct,
    paired: { acquired: input.acquired, image: input.image },
    ...(input.magnitudes ? { magnitudes: input.magnitudes } : {}),
    signal,
  });
  const notes = [pinned.description];
  if (input.kind === 'raster') {
    notes.push(
      `lesions rasterised with ${LESION_SUPERSAMPLE}×${LESION_SUPERSAMPLE} supersampled edges and added to the image before the forward model`,
    );
  }
  const outcome = describeStudy(study, set, spec, input.sigma, notes);
  if (request.contrastDetail) {
    outcome.contrastDetail = contrastDetailOf(input, request.replicas);
    notes.push(
      'contrast–detail: the same mask and method on the contrast-detail phantom at the same SNR; ' +
        'fully sampled curve: zero-filled at full sampling with the same noise σ',
    );
  }
  return outcome;
}

function describeStudy(
  study: LesionStudy,
  set: LesionSet,
  spec: { diameter: number; shape: 'disc' | 'gaussian'; contrast: number },
  sigma: number,
  notes: string[],
): FidelityOutcome {
  const d = study.lesions.map((l) => l.detectability);
  return {
    lesions: study.lesions,
    contrastRecovery: study.contrastRecovery,
    resolved: study.resolved,
    detectability: {
      mean: finiteMean(d),
      min: Math.min(...d),
      method: sigma === 0 ? 'noiseless' : study.noise.method === 'replicas' ? 'replicas' : 'known-sigma',
      replicas: study.noise.replicas,
    },
    falseLesions: study.falseLesions,
    threshold: study.threshold,
    roseK: study.roseK,
    diameter: spec.diameter,
    shape: spec.shape,
    contrast: spec.contrast,
    amplitude: set.lesions[0].amplitude,
    reconstructions: study.reconstructions,
    image: { nx: study.withImage.nx, ny: study.withImage.ny, data: magnitude(study.withImage) },
    notes,
  };
}

/**
 * Contrast–detail curves of the request's sampling and method and of full sampling on the
 * `contrast-detail` phantom, at the request's SNR (σ from that phantom's own object). The method
 * runs once as requested on the lesion-free background; that run's settings are then pinned for
 * the paired run and the replicas, as in the main study.
 */
function contrastDetailOf(
  input: LesionRunInput,
  replicas: number | undefined,
): { curve: ContrastDetailPoint[]; fullySampled: ContrastDetailPoint[] } {
  const { sampled, method, signal, limits } = input;
  const { nx, ny } = input.full.reference;
  const set = contrastDetailLesionSet(nx, ny);
  const sigma = input.snr === null ? 0 : sigmaForSnr(set.reference, set.objectMask, input.snr);
  const acquired = acquiredWithNoise(set.without, sampled.mask, sigma, input.noiseSeed);
  const base = reconstruct({ kspace: acquired, mask: sampled.mask, density: sampled.density }, method, {
    signal,
    limits,
  });
  const pinned = pinnedReconstruction(method, base.info, { signal, limits });
  const study = runLesionStudy({
    ...set,
    mask: sampled.mask,
    density: sampled.density,
    sigma,
    seed: input.noiseSeed,
    noise: noiseKnowledge(pinned.linear, method, replicas),
    reconstruct: pinned.reconstruct,
    paired: { acquired, image: base.image },
    signal,
  });
  const fullMask = new Uint8Array(nx * ny).fill(1);
  const fullStudy = runLesionStudy({
    ...set,
    mask: fullMask,
    sigma,
    seed: input.noiseSeed,
    noise: { kind: 'zero-filled' },
    reconstruct: (k) => reconstruct(k, { name: 'zero-filled' }, { signal, limits }).image,
    signal,
  });
  return {
    curve: contrastDetailCurve(
      set.cells,
      study.lesions.map((l) => l.resolved),
    ),
    fullySampled: contrastDetailCurve(
      set.cells,
      fullStudy.lesions.map((l) => l.resolved),
    ),
  };
}
