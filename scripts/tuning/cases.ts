import type { SamplingSpec } from '../../sampling/index.ts';
import type { RealImage } from '../../src/core/real-image.ts';
import type { MetricSet } from '../../src/metrics/index.ts';
import { parseReconstructionRequest, runReconstruction } from '../../src/pipeline/run-reconstruction.ts';
import type { MethodSpec } from '../../src/recon/index.ts';

/** The mask families of the tuning runs, by a short name. */
export const TUNING_MASKS: { [name: string]: (acceleration: number) => SamplingSpec } = {
  // 1D variable density: random phase-encode lines, density ∝ (1 − |ky|/max)², 8 central lines.
  'vd-lines': (acceleration) => ({ pattern: 'cartesian-random', acceleration, acs: 8, seed: 1 }),
  'poisson-disc': (acceleration) => ({ pattern: 'poisson-disc', acceleration, seed: 1 }),
  // Golden-angle radial spokes moved to their nearest grid points (the NUFFT path is ~40× slower).
  'golden-radial': (acceleration) => ({
    pattern: 'radial',
    angles: 'golden',
    acceleration,
    trajectory: 'rasterised',
    seed: 1,
  }),
};

export const TUNING_ACCELERATIONS = [2, 4, 8];

export interface CaseResult {
  fraction: number;
  /** The mask the pipeline drew (1 = acquired). */
  mask: Uint8Array;
  metrics: MetricSet;
  info: Record<string, unknown>;
}

/** One noiseless reconstruction of `image` through the project's pipeline (runReconstruction). */
export async function runCase(
  image: RealImage,
  sampling: SamplingSpec,
  method: MethodSpec,
  noise?: { snr: number },
): Promise<CaseResult> {
  const request = parseReconstructionRequest({
    source: { imageId: 'tuning' },
    matrix: { nx: image.nx, ny: image.ny },
    sampling,
    method,
    ...(noise ? { noise } : {}),
  });
  const outcome = await runReconstruction(request, undefined, { loadImage: async () => image });
  return {
    fraction: outcome.fraction,
    mask: outcome.sampled.mask,
    metrics: outcome.metrics,
    info: outcome.info,
  };
}

/** `--name=value` arguments of a script. */
export function scriptArguments(argv: string[]): Map<string, string> {
  const args = new Map<string, string>();
  for (const arg of argv) {
    const match = /^--([\w-]+)=(.*)$/.exec(arg);
    if (match) args.set(match[1], match[2]);
  }
  return args;
}
