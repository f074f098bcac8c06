import { defaultCsWaveletLambda, defaultTvLambda } from '../../src/recon/parameters.ts';

/** What each tuned method needs: its λ grid, its current default and the rule it replaced. */
interface TunedMethod {
  /** Factor-2 steps around the phantom rule's range. */
  grid: number[];
  defaultLambda: (fraction: number) => number;
  /** The rule the phantoms gave, kept here only to compare against. */
  phantomRule: (fraction: number) => number;
}

const excessOf = (fraction: number) => 1 / Math.min(1, fraction) - 1;

export const TUNED_METHODS: { [name in 'cs-tv' | 'cs-wavelet']: TunedMethod } = {
  // The phantom rule gave 0.002 at R = 2 and 0.014 at R = 8.
  'cs-tv': {
    grid: [0.0004, 0.0008, 0.0016, 0.0032, 0.0064, 0.0128, 0.0256],
    defaultLambda: defaultTvLambda,
    phantomRule: (fraction) => Math.min(0.05, 0.002 * excessOf(fraction)),
  },
  // The phantom rule gave 0.00025 at R = 2 and 0.00175 at R = 8 (db4, 4 levels, cycle spinning).
  'cs-wavelet': {
    grid: [0.0000625, 0.000125, 0.00025, 0.0005, 0.001, 0.002, 0.004, 0.008, 0.016],
    defaultLambda: defaultCsWaveletLambda,
    phantomRule: (fraction) => Math.min(0.02, 0.00025 * excessOf(fraction)),
  },
};

export function tunedMethod(args: Map<string, string>): {
  name: 'cs-tv' | 'cs-wavelet';
  method: TunedMethod;
} {
  const name = args.get('method') ?? 'cs-tv';
  if (name !== 'cs-tv' && name !== 'cs-wavelet') throw new Error(`--method=${name}: cs-tv or cs-wavelet`);
  return { name, method: TUNED_METHODS[name] };
}
