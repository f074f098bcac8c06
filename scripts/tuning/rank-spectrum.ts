import { derivativeWeights } from '../../src/recon/derivative-weights.ts';
import { HermitianEigenSolver } from '../../src/recon/hermitian-eigen.ts';

// Rank rules from the singular-value spectrum, evaluated against lowrank-hankel's fraction rule
// (src/recon/hankel-rank.ts) by scripts/tuning/hankel-spectrum.ts (docs/tuning/lowrank-hankel-spectrum*.csv,
// held-out.csv). They lost on both the tuning and the held-out anatomy, so the service's default stays
// the fraction rule (docs/design.md §3.12) and these live with the evaluation, not in src/.

/**
 * ω(β) of the optimal hard threshold for singular values when the noise level is unknown,
 * τ = ω(β)·median(σ), β = (short side)/(long side) of the matrix: the cubic approximation
 * ω(β) ≈ 0.56β³ − 0.95β² + 1.82β + 1.43 given by Gavish & Donoho 2014 (docs/references.md §5.3);
 * tests/recon/hankel-rank.test.ts checks it against the exact λ*(β)/√μ_β computed with scipy.
 */
export function hardThresholdCoefficient(beta: number): number {
  if (!(beta > 0 && beta <= 1)) throw new RangeError(`β must lie in (0, 1], got ${beta}`);
  return 0.56 * beta ** 3 - 0.95 * beta ** 2 + 1.82 * beta + 1.43;
}

/** The singular values of the acquired block-Hankel rows and the matrix shape they came from. */
export interface AcquiredHankelSpectrum {
  /** Singular values σ, descending (√ of the Gram eigenvalues, negative rounding noise as 0). */
  singularValues: Float64Array;
  /** Rows of the lifted matrix: complete windows × lifted arrays. */
  rows: number;
  /** Columns: the window area. */
  columns: number;
}

/**
 * The spectrum of the block-Hankel matrix restricted to the windows whose every sample was
 * acquired (wy×wx windows inside the matrix, as BlockHankel lifts them), lifted with the weighting
 * of the completion ('gradient': the kx- and ky-weighted arrays stacked as rows). These rows are
 * exact rows of H(y) for the full k-space, so their spectrum is the data's own, not the mask's:
 * the zero-filled lifting would add the aliasing of the missing samples. O(windows · area²).
 */
export function acquiredHankelSpectrum(
  kspace: Float64Array,
  mask: Uint8Array,
  nx: number,
  ny: number,
  kernel: [number, number],
  weighting: 'none' | 'gradient',
): AcquiredHankelSpectrum {
  const [wy, wx] = kernel;
  const area = wy * wx;
  const lifted = liftedArrays(kspace, nx, ny, weighting);
  const complete = completeWindows(mask, nx, ny, wy, wx);
  const gram = new Float64Array(2 * area * area);
  const window = new Float64Array(2 * area);
  let windows = 0;
  for (let py = 0; py + wy <= ny; py++) {
    for (let px = 0; px + wx <= nx; px++) {
      if (!complete[py * nx + px]) continue;
      windows++;
      for (const z of lifted) {
        for (let ay = 0; ay < wy; ay++) {
          for (let ax = 0; ax < wx; ax++) {
            const source = 2 * ((py + ay) * nx + px + ax);
            const a = ay * wx + ax;
            window[2 * a] = z[source];
            window[2 * a + 1] = z[source + 1];
          }
        }
        // Upper triangle of Σ conj(w_a)·w_b (HermitianEigenSolver reads only that).
        for (let a = 0; a < area; a++) {
          const ar = window[2 * a];
          const ai = window[2 * a + 1];
          for (let b = a; b < area; b++) {
            const br = window[2 * b];
            const bi = window[2 * b + 1];
            gram[2 * (a * area + b)] += ar * br + ai * bi;
            gram[2 * (a * area + b) + 1] += ar * bi - ai * br;
          }
        }
      }
    }
  }
  const eigen = new HermitianEigenSolver(area);
  eigen.solve(gram);
  const singularValues = eigen.values.map((v) => Math.sqrt(Math.max(0, v)));
  return { singularValues, rows: windows * lifted.length, columns: area };
}

/** 1 at the top-left corner (py, px) of every wy×wx window inside the matrix whose samples were all acquired. */
function completeWindows(mask: Uint8Array, nx: number, ny: number, wy: number, wx: number): Uint8Array {
  // Summed-area table of the mask, (ny + 1) × (nx + 1).
  const stride = nx + 1;
  const table = new Int32Array((ny + 1) * stride);
  for (let y = 0; y < ny; y++) {
    let row = 0;
    for (let x = 0; x < nx; x++) {
      row += mask[y * nx + x] ? 1 : 0;
      table[(y + 1) * stride + x + 1] = table[y * stride + x + 1] + row;
    }
  }
  const complete = new Uint8Array(nx * ny);
  for (let py = 0; py + wy <= ny; py++) {
    for (let px = 0; px + wx <= nx; px++) {
      const count =
        table[(py + wy) * stride + px + wx] -
        table[py * stride + px + wx] -
        table[(py + wy) * stride + px] +
        table[py * stride + px];
      if (count === wy * wx) complete[py * nx + px] = 1;
    }
  }
  return complete;
}

function liftedArrays(
  kspace: Float64Array,
  nx: number,
  ny: number,
  weighting: 'none' | 'gradient',
): Float64Array[] {
  if (weighting === 'none') return [kspace];
  const { weightX, weightY } = derivativeWeights(nx, ny);
  const zx = new Float64Array(2 * nx * ny);
  const zy = new Float64Array(2 * nx * ny);
  for (let i = 0; i < nx * ny; i++) {
    zx[2 * i] = weightX[i] * kspace[2 * i];
    zx[2 * i + 1] = weightX[i] * kspace[2 * i + 1];
    zy[2 * i] = weightY[i] * kspace[2 * i];
    zy[2 * i + 1] = weightY[i] * kspace[2 * i + 1];
  }
  return [zx, zy];
}

/**
 * The rank the optimal hard threshold keeps: #{σ_i > ω(β)·median σ} over the min(rows, columns)
 * singular values of the matrix (Gavish & Donoho 2014); null when the matrix has fewer rows than
 * columns' worth of complete windows to estimate it from (β undefined for an empty matrix).
 */
export function hardThresholdRank(spectrum: AcquiredHankelSpectrum): number | null {
  const { singularValues, rows, columns } = spectrum;
  if (rows < columns) return null;
  const beta = columns / rows;
  const sorted = Float64Array.from(singularValues).sort();
  const k = sorted.length;
  const median = k % 2 ? sorted[(k - 1) / 2] : 0.5 * (sorted[k / 2 - 1] + sorted[k / 2]);
  const threshold = hardThresholdCoefficient(beta) * median;
  let rank = 0;
  for (const s of singularValues) if (s > threshold) rank++;
  return Math.max(1, rank);
}
