import { ValidationError } from '../src/core/errors.ts';
import type { Matrix } from '../src/core/matrix.ts';
import { cartesianSampledMask, centredBlockStart, countSampled, type SampledMask } from './sampled-mask.ts';
import type { LatticeSpec } from './schema.ts';

/**
 * Two-direction undersampling of the ky–kz plane on a sheared lattice (the idea of Breuer et al.
 * 2006, docs/references.md §3.7): with ky, kz counted from the centre (⌊ny/2⌋, ⌊nx/2⌋), the point
 * (ky, kz) is sampled when
 *   ky ≡ 0 (mod rows)  and  kz ≡ shift·ky/rows (mod R/rows),
 * i.e. every `rows`-th ky row, every (R/rows)-th kz column in it, each lattice row moved along kz by
 * `shift` against the one before. The lattice basis (rows, shift), (0, R/rows) has determinant R, so a
 * grid whose sides are multiples of rows and R/rows holds exactly ny·nx/R lattice points. An acs×acs
 * central square is added and counted. R must be an integer multiple of rows (exact R).
 */
export function latticeMask(matrix: Matrix, spec: LatticeSpec): SampledMask {
  const { nx, ny } = matrix;
  const { rows, step, shift } = latticeSteps(spec, matrix);
  const acs = spec.acs ?? 0;
  const mask = new Uint8Array(nx * ny);
  const cy = Math.floor(ny / 2);
  const cx = Math.floor(nx / 2);
  for (let v = 0; v < ny; v++) {
    const ky = v - cy;
    if (modulo(ky, rows) !== 0) continue;
    const offset = modulo(shift * (ky / rows), step);
    for (let u = 0; u < nx; u++) if (modulo(u - cx - offset, step) === 0) mask[v * nx + u] = 1;
  }
  const rowStart = centredBlockStart(ny, acs);
  const colStart = centredBlockStart(nx, acs);
  for (let v = rowStart; v < rowStart + acs; v++) mask.fill(1, v * nx + colStart, v * nx + colStart + acs);
  const count = countSampled(mask);
  return cartesianSampledMask({
    nx,
    ny,
    mask,
    pattern: 'lattice',
    requested: spec.acceleration,
    acquired: { count, unit: 'points' },
    total: nx * ny,
    acs: acs > 0 ? { size: [acs, acs] } : null,
    seed: null,
    details: { rows, columnStep: step, shift },
  });
}

/** Lattice steps checked against the matrix: R a multiple of rows, steps inside the grid, 0 ≤ shift < R/rows. */
export function latticeSteps(
  spec: LatticeSpec,
  matrix: Matrix,
): { rows: number; step: number; shift: number } {
  const { nx, ny } = matrix;
  const R = spec.acceleration;
  const rows = spec.rows;
  if (!Number.isInteger(R) || R % rows !== 0) {
    throw new ValidationError([
      {
        field: 'sampling.acceleration',
        message: `a lattice has exact R: ${R} is not an integer multiple of rows = ${rows}`,
        allowed: `integer multiples of rows (${rows}, ${2 * rows}, ${3 * rows}, …)`,
      },
      {
        field: 'sampling.rows',
        message: `${rows} does not divide acceleration ${R}`,
        allowed: 'an integer divisor of acceleration',
      },
    ]);
  }
  const step = R / rows;
  if (rows > ny) {
    throw new ValidationError({
      field: 'sampling.rows',
      message: `a step of ${rows} rows leaves at most one of the ${ny} ky rows`,
      allowed: `1 ≤ rows ≤ ${ny} (ny)`,
    });
  }
  if (step > nx) {
    throw new ValidationError({
      field: 'sampling.acceleration',
      message: `R / rows = ${step} is wider than the ${nx} kz columns`,
      allowed: `acceleration ≤ ${rows * nx} (rows × nx)`,
    });
  }
  const shift = spec.shift ?? 0;
  if (shift >= step) {
    throw new ValidationError({
      field: 'sampling.shift',
      message: `${shift} is not smaller than the kz step R / rows = ${step} (larger shifts repeat smaller ones)`,
      allowed: `0 ≤ shift ≤ ${step - 1}`,
    });
  }
  const acs = spec.acs ?? 0;
  if (acs > Math.min(nx, ny)) {
    throw new ValidationError({
      field: 'sampling.acs',
      message: `an ${acs}×${acs} ACS square does not fit in ${ny}×${nx}`,
      allowed: `0 ≤ acs ≤ ${Math.min(nx, ny)}`,
    });
  }
  return { rows, step, shift };
}

/**
 * Where a lattice folds a pixel to (without ACS): the PSF of the lattice is a sum of peaks at the
 * reciprocal lattice, the offsets (Δy, Δz) with ky·Δy/ny + kz·Δz/nx integer for every sampled
 * (ky, kz) (Fourier shift theorem). For the basis (rows, shift), (0, R/rows) these are
 *   Δz = j·nx·rows/R,  Δy = (ny/rows)·(i − shift·j·rows/R)   for integers i, j,
 * R of them per period. Returned as row-major pairs [Δy, Δz] reduced to 0 ≤ Δy < ny, 0 ≤ Δz < nx,
 * the zero offset first; needs ny a multiple of R and nx of R/rows so that every offset is a pixel.
 */
export function latticeAliasOffsets(
  ny: number,
  nx: number,
  spec: { acceleration: number; rows: number; shift?: number },
): Int32Array {
  const R = spec.acceleration;
  const rows = spec.rows;
  const step = R / rows;
  const shift = spec.shift ?? 0;
  if (!Number.isInteger(step) || ny % R !== 0 || nx % step !== 0) {
    throw new RangeError(
      `alias offsets need rows | R, R | ny and R/rows | nx; got R ${R}, rows ${rows}, ${ny}×${nx}`,
    );
  }
  const out = new Int32Array(2 * R);
  let k = 0;
  for (let j = 0; j < step; j++) {
    for (let i = 0; i < rows; i++) {
      out[2 * k] = modulo((ny / rows) * i - (ny / R) * shift * j, ny);
      out[2 * k + 1] = (nx / step) * j;
      k++;
    }
  }
  return out;
}

function modulo(a: number, b: number): number {
  return ((a % b) + b) % b;
}
