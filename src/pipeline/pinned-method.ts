import type { ComplexImage } from '../core/complex-image.ts';
import type { Limits } from '../core/limits.ts';
import { type MethodSpec, type ReconInput, reconstruct, zeroFilledPeak } from '../recon/index.ts';

/** One reconstruction with the base run's settings fixed, for paired runs and noise replicas. */
export interface PinnedReconstruction {
  reconstruct: (input: ReconInput) => ComplexImage;
  /** A linear method: its noise is known from σ and the mask, no replicas needed. */
  linear: boolean;
  /** What was pinned, in words (a note of the response). */
  description: string;
}

type Info = Record<string, unknown>;

function count(info: Info, key: string): number | undefined {
  const v = info[key];
  return typeof v === 'number' && Number.isFinite(v) ? v : undefined;
}

/**
 * How each method's settings are fixed so that paired runs and replicas differ only in their data
 * (DEVELOPERS.md "Feature fidelity"): the base run's λ in absolute terms, its iteration count and
 * no data-dependent early stop (tolerance 0). A method without an entry runs its spec as given,
 * and the description says so.
 */
const pinners: { [name: string]: (spec: MethodSpec, info: Info) => (input: ReconInput) => MethodSpec } = {
  'zero-filled': (spec) => () => spec,
  'cs-tv': (spec, info) => {
    const lambdaAbsolute = count(info, 'lambdaAbsolute') ?? 0;
    const iterations = count(info, 'iterations');
    // cs-tv's λ is relative to max |F_cᴴ y|, which the lesions and each noise draw move a little.
    return (input) => {
      const peak = zeroFilledPeak(input);
      return { ...spec, lambda: peak > 0 ? lambdaAbsolute / peak : 0, iterations, tolerance: 0 };
    };
  },
  'cs-wavelet': (spec, info) => {
    const lambdaAbsolute = count(info, 'lambdaAbsolute') ?? 0;
    const tvLambdaAbsolute = count(info, 'tvLambdaAbsolute') ?? 0;
    const iterations = count(info, 'iterations');
    // Both weights are relative to max |F_cᴴ y|, as cs-tv's; the cycle-spinning shifts are seeded.
    return (input) => {
      const peak = zeroFilledPeak(input);
      const relative = (absolute: number) => (peak > 0 ? absolute / peak : 0);
      return {
        ...spec,
        lambda: relative(lambdaAbsolute),
        tvLambda: relative(tvLambdaAbsolute),
        iterations,
        tolerance: 0,
      };
    };
  },
  'lowrank-hankel': (spec, info) => {
    const rank = count(info, 'rank');
    const iterations = count(info, 'iterations');
    const pinned = { ...spec, rank, energy: undefined, iterations, tolerance: 0 } as MethodSpec;
    return () => pinned;
  },
};

export function pinnedReconstruction(
  spec: MethodSpec,
  info: Info,
  options: { signal?: AbortSignal; limits: Limits },
): PinnedReconstruction {
  const pinner = pinners[spec.name];
  const specFor = pinner ? pinner(spec, info) : () => spec;
  const iterations = count(info, 'iterations');
  const description = !pinner
    ? `paired runs use ${spec.name} as requested (its settings are not pinned)`
    : spec.name === 'zero-filled'
      ? 'paired runs: zero-filled (linear; noise from the known σ)'
      : `paired runs and replicas: ${spec.name} with the base run's ${
          spec.name === 'cs-tv' || spec.name === 'cs-wavelet'
            ? `absolute λ ${(count(info, 'lambdaAbsolute') ?? 0).toPrecision(4)}, `
            : ''
        }${spec.name === 'lowrank-hankel' ? `rank ${count(info, 'rank')}, ` : ''}${iterations} iterations, no early stop`;
  return {
    reconstruct: (input) => reconstruct(input, specFor(input), options).image,
    linear: spec.name === 'zero-filled',
    description,
  };
}
