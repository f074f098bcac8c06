import { type MetricSet, scoreAll } from '../metrics/index.ts';
import type { ReconstructionOutcome } from './run-reconstruction.ts';

/**
 * The four scores of the zero-filled image against the same reference, so a reconstruction's
 * numbers stand beside those of doing nothing. When the method is plain zero-filling the two images
 * are one (runReconstruction reuses it) and so are the scores.
 */
export function zeroFilledMetrics(outcome: ReconstructionOutcome): MetricSet {
  const { zeroFilled, reconstruction, reference } = outcome.images;
  return zeroFilled === reconstruction ? { ...outcome.metrics } : scoreAll(zeroFilled, reference);
}
