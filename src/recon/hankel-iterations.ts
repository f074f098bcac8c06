import { throwIfAborted } from '../core/errors.ts';
import { HermitianEigenSolver } from './hermitian-eigen.ts';
import type { HankelSolution, HankelSolveParams } from './lowrank-hankel.ts';

/** Smallest r whose leading eigenvalues keep `energy` of the trace (eigenvalues descending, ≥ 0). */
export function rankForEnergy(values: Float64Array, energy: number): number {
  let total = 0;
  for (let i = 0; i < values.length; i++) total += Math.max(0, values[i]);
  if (total === 0) return 1;
  let kept = 0;
  for (let r = 0; r < values.length; r++) {
    kept += Math.max(0, values[r]);
    if (kept >= energy * total) return r + 1;
  }
  return values.length;
}

/** One solver's side of the loop: its lifted matrix and its data-consistency step. */
export interface HankelStep {
  /** gram ← HᴴH of the current estimate's lifted matrix (size × size, interleaved complex). */
  gram(gram: Float64Array): void;
  /**
   * Truncates the lifted matrix to the leading `rank` eigenvectors (columns of `vectors`), averages
   * back and puts the acquired samples in; returns Σ|x_new − x_old|² and Σ|x_new|² of the estimate.
   */
  update(vectors: Float64Array, rank: number): { diff: number; norm: number };
}

/** The run of the loop: what a solver returns beside its completed k-space. */
export type HankelRun = Omit<HankelSolution<unknown>, 'kspace'>;

/**
 * The alternating-projection loop of structured low-rank completion (Shin et al. 2014,
 * docs/references.md §5.3), shared by the single-coil and the multi-coil solver: per iteration the
 * Gram matrix of the lifted estimate, its eigendecomposition, the rank (`rank` if given, else the
 * smallest keeping `energy` of the spectrum), then the solver's truncation and data consistency.
 * Stops once ‖x_new − x_old‖ / ‖x_new‖ falls below `tolerance` (0 when the estimate is 0).
 */
export function runHankelIterations(
  size: number,
  params: Pick<HankelSolveParams, 'rank' | 'energy' | 'iterations' | 'tolerance'>,
  step: HankelStep,
  signal?: AbortSignal,
): HankelRun {
  const eigen = new HermitianEigenSolver(size);
  const gram = new Float64Array(2 * size * size);
  let run = 0;
  let rank = params.rank ?? size;
  let change = Number.POSITIVE_INFINITY;
  for (let it = 0; it < params.iterations; it++) {
    throwIfAborted(signal);
    step.gram(gram);
    eigen.decompose(gram);
    rank = params.rank ?? rankForEnergy(eigen.values, params.energy);
    // Only the leading `rank` eigenvectors enter the projection; the rest are never formed.
    eigen.leadingVectors(rank);
    const { diff, norm } = step.update(eigen.vectors, rank);
    run = it + 1;
    change = norm > 0 ? Math.sqrt(diff / norm) : 0;
    if (change < params.tolerance) break;
  }
  return { iterations: run, rank, relativeChange: change, spectrum: eigen.values.slice() };
}
