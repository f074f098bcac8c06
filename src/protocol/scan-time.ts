import { occupiedRows } from '../../sampling/index.ts';
import { ValidationError } from '../core/errors.ts';
import { effectiveTeMs, sliceTiming } from './echo-train-timing.ts';
import { formatDuration } from './format-duration.ts';
import type { ScanTime } from './scan-time-result.ts';
import type { Protocol } from './schema.ts';

export type { ScanTime } from './scan-time-result.ts';

/** What the scan-time model reads from a sampled mask (a sampling/ SampledMask satisfies it). */
export interface ScanTimeSampling {
  nx: number;
  ny: number;
  mask: Uint8Array;
  acquired: { count: number; unit: string };
  representation: 'cartesian' | 'radial-rasterised' | 'spiral-rasterised' | 'non-cartesian';
  /** Set when the sampling itself applied partial Fourier (sampling.partialFourier). */
  partialFourier?: { fraction: number };
}

/**
 * Acquisition time (docs/references.md §8; calibration and preparation scans excluded):
 *   2D Cartesian  TA = TR × ⌈lines / ETL⌉ × averages × passes
 *   3D Cartesian  TA = TR × ⌈points(ky,kz) / ETL⌉ × averages      (matrix ny×nx = ky×kz)
 *   radial        TA = TR × ⌈spokes / ETL⌉ × averages × passes         (ETL > 1: several spokes per TR)
 *   spiral        TA = TR × ⌈interleaves / ETL⌉ × averages × passes
 *   stack of stars (radial or spiral with dimensions 3d): TA = TR × ⌈readouts × partitions / ETL⌉ × averages
 *
 * Counting with a mask: in 2D every phase-encode row with at least one sampled point costs a whole
 * line (the readout direction kx is free), so a 2D point mask counts its occupied rows; in 3D every
 * sampled ky–kz point costs one readout.
 *
 * Partial Fourier p keeps the ⌈p·ny⌉ rows `ny − ⌈p·ny⌉ … ny − 1` (one half of ky plus the centre row
 * ⌊ny/2⌋ and the extra rows beyond it); rows outside that band are skipped even where the mask
 * samples them. Without a mask this is the handbook ⌈p·N_pe⌉. `sampling.partialFourier` removes
 * those rows from the mask itself (so the simulation sees them missing too); the protocol's
 * `partialFourier` is its deprecated alias for the same rows, and the two must agree when both are
 * given. Radial sampling takes p = 1.
 *
 * Passes, slices per TR and the effective TE: echo-train-timing.ts.
 *
 * Matrix and protocol come parsed (the request schema, or protocolSchema through parseOrThrow);
 * only what needs the mask is checked here.
 */
export function scanTime(
  matrix: { nx: number; ny: number },
  protocol: Protocol,
  sampled?: ScanTimeSampling,
): ScanTime {
  const { nx, ny } = matrix;
  if (sampled && (sampled.nx !== nx || sampled.ny !== ny)) {
    throw new ValidationError({
      field: 'matrix',
      message: `the sampled mask is ${sampled.ny}×${sampled.nx} but the matrix is ${ny}×${nx}`,
      allowed: 'the mask size equal to the matrix',
    });
  }
  const sampledFraction = sampled?.partialFourier?.fraction;
  if (
    sampledFraction !== undefined &&
    protocol.partialFourier !== 1 &&
    protocol.partialFourier !== sampledFraction
  ) {
    const message = `sampling.partialFourier ${sampledFraction} and its deprecated alias protocol.partialFourier ${protocol.partialFourier} disagree`;
    const allowed = 'sampling.partialFourier alone, or protocol.partialFourier equal to it';
    throw new ValidationError([
      { field: 'sampling.partialFourier', message, allowed },
      { field: 'protocol.partialFourier', message, allowed },
    ]);
  }
  const { slicesPerTr, passes } = sliceTiming(protocol);

  let acquired: number;
  // Acquired units ahead of the k-space centre in ky order (linear echo ordering); null for radial.
  let before: number | null = null;
  let unit: ScanTime['unit'];
  const readoutUnit = sampled?.acquired.unit;
  const stack = protocol.dimensions === '3d' && (readoutUnit === 'spokes' || readoutUnit === 'interleaves');
  // Protocols built in code before `partitions` existed lack it: one partition.
  const partitions = protocol.partitions ?? 1;
  if (partitions !== 1 && !stack) {
    throw new ValidationError({
      field: 'protocol.partitions',
      message: 'partitions count the kz planes of a 3D stack of stars or spirals',
      allowed: "1 unless dimensions is '3d' with radial or spiral sampling",
    });
  }
  if (readoutUnit === 'spokes' || readoutUnit === 'interleaves') {
    if (protocol.partialFourier !== 1) {
      throw new ValidationError({
        field: 'protocol.partialFourier',
        message: `partial Fourier is not modelled for ${readoutUnit === 'spokes' ? 'radial' : 'spiral'} sampling`,
        allowed: '1 for radial and spiral sampling',
      });
    }
    // 3D: a stack of stars (or spirals), the in-plane pattern repeated for every kz partition.
    acquired = (sampled as ScanTimeSampling).acquired.count * (stack ? partitions : 1);
    unit = readoutUnit;
  } else {
    const keptRows = Math.ceil(protocol.partialFourier * ny - 1e-9);
    const firstRow = ny - keptRows;
    const centreRow = Math.floor(ny / 2);
    if (protocol.dimensions === '2d') {
      acquired = sampled ? occupiedRows(sampled.mask, nx, firstRow, ny) : keptRows;
      before = sampled ? occupiedRows(sampled.mask, nx, firstRow, centreRow) : centreRow - firstRow;
      unit = 'lines';
    } else {
      const centre = centreRow * nx + Math.floor(nx / 2);
      acquired = sampled ? sampledPoints(sampled.mask, firstRow * nx, ny * nx) : keptRows * nx;
      before = sampled ? sampledPoints(sampled.mask, firstRow * nx, centre) : centre - firstRow * nx;
      unit = 'points';
    }
  }
  const shots = Math.ceil(acquired / protocol.echoTrainLength);
  // Integer product first, one division last: 10 ms × 16384 gives exactly 163.84 s.
  const seconds = (protocol.trMs * shots * protocol.averages * passes) / 1000;
  return {
    seconds,
    formatted: formatDuration(seconds),
    acquired,
    unit,
    shots,
    passes,
    slicesPerTr,
    effectiveTeMs: effectiveTeMs(protocol, before, shots),
  };
}

/** Sampled points at flat indices [from, to). */
function sampledPoints(mask: Uint8Array, from: number, to: number): number {
  let points = 0;
  for (let i = from; i < to; i++) if (mask[i] !== 0) points++;
  return points;
}
