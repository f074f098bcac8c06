import type { MetricName } from './metric-direction.ts';
import type { GridPosition } from './row-key.ts';

/**
 * What one cell of a plan produced: plain JSON (no typed arrays, no images, no infinities) so a
 * worker thread can send it back and a store can persist it. Metric values are `number | null`,
 * null standing for +∞ (PSNR of an exact reconstruction).
 */
export interface CellResult extends GridPosition {
  index: number;
  seed: number;
  /** Requested R (null for a custom mask) and the R the mask actually has. */
  requestedR: number | null;
  actualR: number;
  /** Count that costs scan time, in `acquiredUnit` (see src/protocol/scan-time.ts). */
  acquired: number;
  acquiredUnit: 'lines' | 'points' | 'spokes';
  scanSeconds: number;
  /** The mask as drawn: its own count and unit (a 2D point mask counts points) and acquired grid fraction. */
  mask: { acquired: number; unit: 'lines' | 'points' | 'spokes'; fraction: number };
  metrics: Record<MetricName, number | null>;
  reconMs: number;
  /** Pipeline notes (inverse crime for uploads, rescaling, …). */
  notes: string[];
}
