import type { PartialFourierBand } from '../../sampling/partial-fourier.ts';
import { type ComplexImage, magnitude } from '../core/complex-image.ts';
import type { Limits } from '../core/limits.ts';
import type { RealImage } from '../core/real-image.ts';
import type { MetricSet } from '../metrics/index.ts';
import {
  type MethodSpec,
  partialFourierStep,
  type ReconInput,
  reconstruct,
  zeroFilledImage,
} from '../recon/index.ts';
import { scorePlane } from './volume-scores.ts';

/** A run of planes to reconstruct and score: plain data, so it can cross to a worker thread. */
export interface PlaneBatch {
  inputs: ReconInput[];
  references: RealImage[];
  method: MethodSpec;
  partialFourier?: PartialFourierBand;
}

/** What reconstructing a run of planes gives back: plain data, so a worker thread can send it. */
export interface PlaneReconstructions {
  /** |x̂| of each plane. */
  images: RealImage[];
  /** |zero-filled| of each plane; the same objects as `images` for plain zero-filling. */
  zeroFilled: RealImage[];
  /** Each plane's 2D scores against its reference (null: empty reference). */
  scores: (MetricSet | null)[];
  /** The method's facts of the first plane of the run (iterations, objective, …). */
  info: Record<string, unknown>;
  reconMs: number;
}

function magnitudeImage(image: ComplexImage): RealImage {
  return { nx: image.nx, ny: image.ny, data: magnitude(image) };
}

/**
 * The 2D reconstruction of each plane, exactly as a 2D request would run it (method, then the
 * partial-Fourier step), its zero-filled comparison image and its 2D scores. A batch is the unit the
 * service spreads over the worker pool (src/jobs/tasks.ts 'volume-planes').
 */
export function reconstructPlanes(
  batch: PlaneBatch,
  options: { signal?: AbortSignal; limits?: Limits },
): PlaneReconstructions {
  const { inputs, references, method, partialFourier } = batch;
  const out: PlaneReconstructions = { images: [], zeroFilled: [], scores: [], info: {}, reconMs: 0 };
  inputs.forEach((input, i) => {
    const started = performance.now();
    const output = reconstruct(input, method, options);
    const result = partialFourierStep(output, input, method, partialFourier, options.signal);
    out.reconMs += performance.now() - started;
    const image = magnitudeImage(result.image);
    out.images.push(image);
    // Plain zero-filling without density compensation is its own comparison image (as in 2D).
    const same =
      method.name === 'zero-filled' && !method.densityCompensation && result.image === output.image;
    out.zeroFilled.push(same ? image : magnitudeImage(zeroFilledImage(input).image));
    out.scores.push(scorePlane(image, references[i]));
    if (i === 0) out.info = result.info;
  });
  return out;
}

/** Splits a batch into `parts` contiguous runs (fewer when there are fewer planes). */
export function splitPlanes(batch: PlaneBatch, parts: number): PlaneBatch[] {
  const count = Math.max(1, Math.min(parts, batch.inputs.length));
  const size = Math.ceil(batch.inputs.length / count);
  const runs: PlaneBatch[] = [];
  for (let start = 0; start < batch.inputs.length; start += size) {
    runs.push({
      ...batch,
      inputs: batch.inputs.slice(start, start + size),
      references: batch.references.slice(start, start + size),
    });
  }
  return runs;
}

/** The runs' results joined back in plane order; info from the first run, times added. */
export function joinPlanes(runs: readonly PlaneReconstructions[]): PlaneReconstructions {
  return {
    images: runs.flatMap((r) => r.images),
    zeroFilled: runs.flatMap((r) => r.zeroFilled),
    scores: runs.flatMap((r) => r.scores),
    info: runs[0]?.info ?? {},
    reconMs: runs.reduce((sum, r) => sum + r.reconMs, 0),
  };
}
