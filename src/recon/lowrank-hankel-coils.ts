import type { MultiCoilKspace } from '../encoding/index.ts';
import { derivativeWeights } from './derivative-weights.ts';
import { runHankelIterations } from './hankel-iterations.ts';
import type { HankelSolution, HankelSolveParams } from './lowrank-hankel.ts';
import { StackedBlockHankel } from './stacked-block-hankel.ts';

/** Largest coils × window area (the Gram matrix is that square; its eigendecomposition grows as the cube). */
export const STACKED_COLUMNS_MAX = 400;

/**
 * Calibrationless structured low-rank completion of multi-coil k-space (SAKE, Shin et al. 2014,
 * docs/references.md §5.3–5.4): the coils' block-Hankel matrices side by side, [H(z_1) … H(z_C)], are
 * low rank because the coil images are one object times smooth sensitivities; alternate a rank-r
 * truncation of that matrix (eigendecomposition of its (C·n)² Gram matrix), averaging back per
 * coil (StackedBlockHankel) and data consistency per coil. Needs no maps.
 * Weighting 'gradient' stacks the coils' derivative k-spaces kx·z_c over ky·z_c (as the single-coil
 * solver does, Ongie & Jacob 2016) and recovers each coil by (kx·ẑx + ky·ẑy)/(kx² + ky²), the DC
 * sample keeping its previous value. Returns the completed coil k-space.
 */
export function solveLowrankHankelCoils(
  kspace: MultiCoilKspace,
  mask: Uint8Array,
  params: HankelSolveParams,
  signal?: AbortSignal,
): HankelSolution<MultiCoilKspace> {
  const { nx, ny, coils } = kspace;
  const n = nx * ny;
  const [wy, wx] = params.kernel;
  const gradientWeighting = params.weighting === 'gradient';
  const lift = new StackedBlockHankel(nx, ny, wx, wy, coils, gradientWeighting ? 2 : 1);
  const x = kspace.data.slice();
  for (let c = 0; c < coils; c++) {
    for (let i = 0; i < n; i++) {
      if (mask[i]) continue;
      x[2 * (c * n + i)] = 0;
      x[2 * (c * n + i) + 1] = 0;
    }
  }
  const plane = (c: number) => x.subarray(2 * c * n, 2 * (c + 1) * n);
  const { weightX, weightY, inverseWeight } = derivativeWeights(nx, ny);
  const planes = () => Array.from({ length: coils }, () => new Float64Array(2 * n));
  const lifted = gradientWeighting
    ? [planes(), planes()]
    : [Array.from({ length: coils }, (_, c) => plane(c))];
  const projected = gradientWeighting ? [planes(), planes()] : [planes()];
  const setWeighted = (c: number, i: number, re: number, im: number) => {
    lifted[0][c][2 * i] = weightX[i] * re;
    lifted[0][c][2 * i + 1] = weightX[i] * im;
    lifted[1][c][2 * i] = weightY[i] * re;
    lifted[1][c][2 * i + 1] = weightY[i] * im;
  };
  if (gradientWeighting) {
    for (let c = 0; c < coils; c++) {
      const z = plane(c);
      for (let i = 0; i < n; i++) setWeighted(c, i, z[2 * i], z[2 * i + 1]);
    }
  }
  // One iteration's truncation and data consistency; the loop around it is runHankelIterations.
  const update = (vectors: Float64Array, rank: number) => {
    lift.setProjector(vectors, rank);
    lift.project(projected);
    let diff = 0;
    let norm = 0;
    for (let c = 0; c < coils; c++) {
      const z = plane(c);
      for (let i = 0; i < n; i++) {
        const re = z[2 * i];
        const im = z[2 * i + 1];
        if (mask[i] || (gradientWeighting && inverseWeight[i] === 0)) {
          norm += re * re + im * im;
          continue;
        }
        let nr: number;
        let ni: number;
        if (gradientWeighting) {
          const s = inverseWeight[i];
          const px = projected[0][c];
          const py = projected[1][c];
          nr = (weightX[i] * px[2 * i] + weightY[i] * py[2 * i]) * s;
          ni = (weightX[i] * px[2 * i + 1] + weightY[i] * py[2 * i + 1]) * s;
          setWeighted(c, i, nr, ni);
        } else {
          nr = projected[0][c][2 * i];
          ni = projected[0][c][2 * i + 1];
        }
        z[2 * i] = nr;
        z[2 * i + 1] = ni;
        diff += (nr - re) ** 2 + (ni - im) ** 2;
        norm += nr * nr + ni * ni;
      }
    }
    return { diff, norm };
  };
  const gram = (target: Float64Array) => lift.gram(target, lifted);
  return {
    kspace: { coils, nx, ny, data: x },
    ...runHankelIterations(lift.size, params, { gram, update }, signal),
  };
}
