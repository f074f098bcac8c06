import { type MetricSet, scoreAll } from '../metrics/index.ts';
import type { ReconstructionOutcome } from './run-reconstruction.ts';
import { volumeZeroFilledMetrics } from './volume-reconstruction.ts';

/**
 * The four scores of the zero-filled image against the same reference, so a reconstruction's
 * numbers stand beside those of doing nothing. When the method is plain zero-filling the two images
 * are one (runReconstruction reuses it) and so are the scores. Volumes score their zero-filled planes
 * over the whole volume (src/pipeline/volume-reconstruction.ts).
 */
export function zeroFilledMetrics(outcome: ReconstructionOutcome): MetricSet {
  if (outcome.volume) return volumeZeroFilledMetrics({ ...outcome, volume: outcome.volume });
  const { zeroFilled, reconstruction, reference } = outcome.images;
  return zeroFilled === reconstruction ? { ...outcome.metrics } : scoreAll(zeroFilled, reference);
}
