import type { Matrix } from '../core/matrix.ts';
import type { VolumeAcquisitionMode } from '../volume/volume-schema.ts';
import { type ScanTime, type ScanTimeSampling, scanTime } from './scan-time.ts';
import type { Protocol } from './schema.ts';

/**
 * The grid a volume's pattern is drawn on: 3D, the ky–kz plane (ny rows × nz columns); multi-slice,
 * the ky–kx plane of each slice (ny × nx). A 2D matrix (nz absent or 1) is its own grid.
 */
export function patternGrid(matrix: Matrix, acquisition: VolumeAcquisitionMode | undefined): Matrix {
  const nz = matrix.nz ?? 1;
  return nz > 1 && (acquisition ?? '3d') === '3d'
    ? { nx: nz, ny: matrix.ny }
    : { nx: matrix.nx, ny: matrix.ny };
}

/**
 * Scan time of a matrix that may be a volume (docs/design.md §2.2, §2.5). 2D matrices: scanTime as
 * the protocol says. Volumes, whatever protocol.dimensions and slices say:
 *   3D           TA = TR × ⌈ky–kz points / ETL⌉ × averages    (scanTime on the ny × nz grid, '3d')
 *   multi-slice  TA = the 2D model with slices = nz           (scanTime on ny × nx, '2d'): without the
 *                echo-train model one slice per TR unless protocol.slicesPerPass says more fit, so by
 *                default 2D time × nz; with echoSpacingMs, the slices that fit in one TR.
 */
export function acquisitionScanTime(
  matrix: Matrix,
  protocol: Protocol,
  sampled: ScanTimeSampling | undefined,
  acquisition: VolumeAcquisitionMode | undefined,
): ScanTime {
  const nz = matrix.nz ?? 1;
  if (nz <= 1) return scanTime(matrix, protocol, sampled);
  const grid = patternGrid(matrix, acquisition);
  if ((acquisition ?? '3d') === '3d')
    return scanTime(grid, { ...protocol, dimensions: '3d', slices: 1 }, sampled);
  // Without the echo-train model, one slice per TR unless slicesPerPass says more fit (sequential slices).
  const perPass = protocol.slicesPerPass ?? (protocol.echoSpacingMs === undefined ? 1 : undefined);
  const { slicesPerPass: _, ...rest } = protocol;
  return scanTime(
    grid,
    {
      ...rest,
      dimensions: '2d',
      slices: nz,
      ...(perPass === undefined ? {} : { slicesPerPass: Math.min(perPass, nz) }),
    },
    sampled,
  );
}
