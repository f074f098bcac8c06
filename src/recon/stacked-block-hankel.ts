import { type FftPlan, fftPlan } from '../core/fft-plan.ts';
import {
  addCornerCorrelation,
  addKernelSum,
  addWrapCorrectedEntry,
  bandLags,
  gatherCorner,
  lagsOverRows,
  rankProjector,
  transformBandLines,
  twiddles,
  type WindowBoxes,
  type WrapBand,
  windowBoxes,
  wrapBand,
} from './block-hankel.ts';
import { Dft2 } from './uncentred-dft2.ts';

/**
 * The coils' block-Hankel matrices side by side (Shin et al. 2014, docs/references.md §5.4):
 *   H = [H(z_1) … H(z_C)],  one row per window p ∈ V (windows fully inside the ny×nx grid, as in
 *   BlockHankel), column (c, a) = c·n + a holding z_c[p + a], n = wy·wx,
 * optionally with K = 2 lifted arrays per coil stacked below each other (the 'gradient'
 * weighting: the rows of H(kx·z) over those of H(ky·z)). Never formed: both products run on FFTs.
 *
 * Gram matrix (C·n)², block (c, d): G_cd[a,b] = Σ_k Σ_{p∈V} conj(z_kc[p+a]) z_kd[p+b], the C(C+1)/2
 * cross-correlations of the coils by the same inclusion–exclusion as BlockHankel.gram:
 *   G_cd[a,b] = R_cd[b−a] − Rows_cd[ay, by, bx−ax] − Columns_cd[ax, bx, by−ay] + Corner_cd[a, b],
 * R_cd the circular cross-correlation read off the cross-power Σ_k conj(Ẑ_kc)·Ẑ_kd at the
 * (2wy−1)(2wx−1) lags (row FFTs, then a direct sum over rows), the bands from line FFTs of the
 * 2wy−2 (2wx−2) rows (columns) where windows wrap, the corner directly.
 *
 * Projection with Π = U_r U_rᴴ ((C·n)², the leading eigenvectors), averaged back per coil:
 *   x̂_kd[q] = (1/#b) Σ_c Σ_δ K^{cd}_box[δ] z_kc[q + δ],  K^{cd}_box[δ] = Σ_{b∈box} Π[(c, b+δ), (d, b)],
 * the single-coil formula with a kernel per coil pair. Interior samples (every window fits) use
 * the full-box kernels through multipliers M_cd = DFT(κ_cd)/(N·n) (κ_cd[−δ] = K^{cd}[δ]); the box
 * is symmetric there, so M_dc = conj(M_cd) and C(C+1)/2 multipliers serve all C² pairs. Samples
 * within w − 1 of an edge are summed directly with their box's kernels.
 *
 * Cost per iteration, in 2D DFTs of the grid (a row or column pass is half of one): K·C forward
 * (gram) and K·C inverse (projection), C(C+1)/2 halves for the cross-power lags and as many for the
 * multipliers, i.e. K + (C + 1)/2 DFT pairs per coil; plus about C²·K·(2wy−1)(2wx−1) complex
 * multiply-adds per border sample and the eigendecomposition of the (C·n)² Gram matrix.
 * Memory: 2·K·C complex planes (the arrays' spectra and the projected spectra) plus O((C·n)²).
 */
export class StackedBlockHankel {
  readonly nx: number;
  readonly ny: number;
  readonly wx: number;
  readonly wy: number;
  readonly coils: number;
  /** Lifted arrays per coil (1, or 2 for the derivative weighting). */
  readonly arrays: number;
  /** Window area n = wy·wx. */
  readonly window: number;
  /** Columns of H: C·n (the Gram matrix is size × size). */
  readonly size: number;
  private readonly dft: Dft2;
  private readonly planX: FftPlan;
  private readonly planY: FftPlan;
  /** e^(−i2πm/ny), m = 0…ny−1. */
  private readonly twiddleY: Float64Array;
  /** Unnormalised 2D DFT of each lifted array, [k][c]. */
  private readonly spectra: Float64Array[][];
  /** Conjugated projected spectra Σ_c Ẑ_kc·M_cd, [k][d]. */
  private readonly projected: Float64Array[][];
  private lifted: readonly (readonly Float64Array[])[] | null = null;
  private readonly crossPower: Float64Array;
  private readonly rowLags: Float64Array;
  private readonly correlation: Float64Array;
  /** Line DFTs of the band rows ([k][c][i] of 2wy−2, length nx) and band columns (length ny). */
  private readonly rowLines: Float64Array;
  private readonly columnLines: Float64Array;
  private readonly rowBand: Float64Array;
  private readonly columnBand: Float64Array;
  /** Corner blocks (2wy−2)×(2wx−2) of each array, [k][c]. */
  private readonly corners: Float64Array;
  private readonly cornerGram: Float64Array;
  private readonly lineX: Float64Array;
  private readonly lineY: Float64Array;
  private readonly lineOut: Float64Array;
  /** Π, (C·n)² complex. */
  private readonly projector: Float64Array;
  /** Kernel rows for a multiplier: 2wy−1 rows of nx, then their row DFTs. */
  private readonly kernelRows: Float64Array;
  private readonly kernelRowSpectra: Float64Array;
  private readonly multiplier: Float64Array;
  private readonly kernel: Float64Array;
  /** Box kernels of one output coil d for every input coil c: [c][box][δ]. */
  private readonly boxKernels: Float64Array;
  private readonly prefix: Float64Array;
  private readonly boxes: WindowBoxes;
  /** One sample's running kernel sum (re, im). */
  private readonly sampleSum = new Float64Array(2);

  constructor(nx: number, ny: number, wx: number, wy: number, coils: number, arrays: 1 | 2) {
    if (wx < 1 || wy < 1 || wx > nx || wy > ny) {
      throw new RangeError(`window ${wy}×${wx} must fit in ${ny}×${nx}`);
    }
    if (!Number.isInteger(coils) || coils < 1) throw new RangeError(`coils must be ≥ 1, got ${coils}`);
    this.nx = nx;
    this.ny = ny;
    this.wx = wx;
    this.wy = wy;
    this.coils = coils;
    this.arrays = arrays;
    this.window = wx * wy;
    this.size = coils * this.window;
    const n = nx * ny;
    const lx = 2 * wx - 1;
    const ly = 2 * wy - 1;
    this.dft = new Dft2(nx, ny);
    this.planX = fftPlan(nx);
    this.planY = fftPlan(ny);
    this.twiddleY = twiddles(ny);
    const planes = () =>
      Array.from({ length: arrays }, () => Array.from({ length: coils }, () => new Float64Array(2 * n)));
    this.spectra = planes();
    this.projected = planes();
    this.crossPower = new Float64Array(2 * n);
    this.rowLags = new Float64Array(2 * ny * lx);
    this.correlation = new Float64Array(2 * ly * lx);
    this.rowLines = new Float64Array(2 * arrays * coils * (2 * wy - 2) * nx);
    this.columnLines = new Float64Array(2 * arrays * coils * (2 * wx - 2) * ny);
    this.rowBand = new Float64Array(2 * wy * wy * lx);
    this.columnBand = new Float64Array(2 * wx * wx * ly);
    this.corners = new Float64Array(2 * arrays * coils * (2 * wy - 2) * (2 * wx - 2));
    this.cornerGram = new Float64Array(2 * this.window * this.window);
    this.lineX = new Float64Array(2 * nx);
    this.lineY = new Float64Array(2 * ny);
    this.lineOut = new Float64Array(2 * Math.max(nx, ny));
    this.projector = new Float64Array(2 * this.size * this.size);
    this.kernelRows = new Float64Array(2 * ly * nx);
    this.kernelRowSpectra = new Float64Array(2 * ly * nx);
    this.multiplier = new Float64Array(2 * n);
    this.kernel = new Float64Array(2 * lx * ly);
    const boxes = windowBoxes(nx, ny, wx, wy);
    this.boxes = boxes;
    const boxCount = (boxes.rowBoxes.length / 2) * (boxes.colBoxes.length / 2);
    this.boxKernels = new Float64Array(2 * coils * boxCount * lx * ly);
    this.prefix = new Float64Array(2 * (wy + 1) * (wx + 1) * lx * ly);
  }

  /**
   * gram ← HᴴH for the lifted arrays `arrays[k][c]` (each ny×nx interleaved complex). Keeps their
   * transforms for the following `project`.
   */
  gram(gram: Float64Array, arrays: readonly (readonly Float64Array[])[]): void {
    const { coils, window: n, size, wx, wy, correlation, rowBand, columnBand, cornerGram } = this;
    if (arrays.length !== this.arrays || arrays.some((row) => row.length !== coils)) {
      throw new RangeError(`gram takes ${this.arrays} × ${coils} arrays`);
    }
    this.lifted = arrays;
    for (let k = 0; k < this.arrays; k++) {
      for (let c = 0; c < coils; c++) this.dft.forward(arrays[k][c], this.spectra[k][c]);
    }
    this.transformBandLines('rows');
    this.transformBandLines('columns');
    this.gatherCorners();
    const entry = new Float64Array(2);
    for (let c = 0; c < coils; c++) {
      for (let d = c; d < coils; d++) {
        this.crossCorrelation(c, d);
        this.bandCorrelation(c, d, 'rows');
        this.bandCorrelation(c, d, 'columns');
        this.cornerCorrelation(c, d);
        for (let a = 0; a < n; a++) {
          for (let b = c === d ? a : 0; b < n; b++) {
            entry.fill(0);
            addWrapCorrectedEntry(entry, correlation, rowBand, columnBand, a, b, wx, wy);
            const g = 2 * (a * n + b);
            const re = entry[0] + cornerGram[g];
            const im = entry[1] + cornerGram[g + 1];
            const i = c * n + a;
            const j = d * n + b;
            gram[2 * (i * size + j)] = re;
            gram[2 * (i * size + j) + 1] = im;
            gram[2 * (j * size + i)] = re;
            gram[2 * (j * size + i) + 1] = -im;
          }
        }
      }
    }
  }

  /** correlation[dy, dx] = Σ_k Σ_q conj(z_kc[q]) z_kd[q + d] (circular), |dy| < wy, |dx| < wx. */
  private crossCorrelation(c: number, d: number): void {
    const { nx, ny, wx, wy, crossPower: p, rowLags, correlation, lineX, lineOut, planX, twiddleY } = this;
    const lx = 2 * wx - 1;
    p.fill(0);
    for (let k = 0; k < this.arrays; k++) {
      const u = this.spectra[k][c];
      const v = this.spectra[k][d];
      for (let i = 0; i < 2 * nx * ny; i += 2) {
        p[i] += u[i] * v[i] + u[i + 1] * v[i + 1];
        p[i + 1] += u[i] * v[i + 1] - u[i + 1] * v[i];
      }
    }
    // rowLags[row, dx] = Σ_kx P[row, kx] e^(+i2π kx·dx/nx) = X[−dx], X the row's forward DFT.
    for (let row = 0; row < ny; row++) {
      lineX.set(p.subarray(2 * row * nx, 2 * (row + 1) * nx));
      planX.forward(lineOut, lineX);
      for (let dx = -(wx - 1); dx < wx; dx++) {
        const m = 2 * (((-dx % nx) + nx) % nx);
        const o = 2 * (row * lx + dx + wx - 1);
        rowLags[o] = lineOut[m];
        rowLags[o + 1] = lineOut[m + 1];
      }
    }
    lagsOverRows(correlation, rowLags, nx, ny, wx, wy, twiddleY);
  }

  /** The row or column wrap band of this grid and window, with its line FFT. */
  private band(axis: 'rows' | 'columns'): WrapBand {
    const byRows = axis === 'rows';
    return wrapBand(byRows, this, byRows ? this.planX : this.planY, byRows ? this.lineX : this.lineY);
  }

  /** Line DFTs of the 2w−2 band rows (or columns) of every lifted array, block k·C + c. */
  private transformBandLines(axis: 'rows' | 'columns'): void {
    const band = this.band(axis);
    const store = axis === 'rows' ? this.rowLines : this.columnLines;
    const arrays = this.lifted ?? [];
    for (let k = 0; k < this.arrays; k++) {
      for (let c = 0; c < this.coils; c++)
        transformBandLines(band, store, k * this.coils + c, arrays[k][c], this.nx);
    }
  }

  /**
   * Wrap-band sums of the pair (c, d), as BlockHankel's bands with u = coil c and v = coil d:
   * band[a, b, δ] = Σ_k Σ_{t<w−1} Σ_e conj(z_kc[ρ(t+a), e]) z_kd[ρ(t+b), e + δ] (rows; columns alike).
   */
  private bandCorrelation(c: number, d: number, axis: 'rows' | 'columns'): void {
    const band = this.band(axis);
    const target = axis === 'rows' ? this.rowBand : this.columnBand;
    target.fill(0);
    if (band.count === 0) return;
    const store = axis === 'rows' ? this.rowLines : this.columnLines;
    bandLags(band, target, store, this.lineOut, {
      arrays: this.arrays,
      coils: this.coils,
      c,
      d,
      mirror: false,
    });
  }

  /** corner_kc[i, j] = z_kc[(vy + i) mod ny, (vx + j) mod nx], i < 2wy−2, j < 2wx−2. */
  private gatherCorners(): void {
    const { nx, ny, wx, wy, coils, corners } = this;
    const size = 2 * (2 * wy - 2) * (2 * wx - 2);
    const arrays = this.lifted ?? [];
    for (let k = 0; k < this.arrays; k++) {
      for (let c = 0; c < coils; c++) {
        const base = (k * coils + c) * size;
        gatherCorner(corners.subarray(base, base + size), arrays[k][c], nx, ny, wx, wy);
      }
    }
  }

  /** cornerGram[a, b] = Σ_k Σ_{t∈[0,wy−1)×[0,wx−1)} conj(corner_kc[t+a]) corner_kd[t+b]. */
  private cornerCorrelation(c: number, d: number): void {
    const { wx, wy, coils, corners, cornerGram } = this;
    const cy = 2 * wy - 2;
    const cx = 2 * wx - 2;
    cornerGram.fill(0);
    if (cy === 0 || cx === 0) return;
    for (let k = 0; k < this.arrays; k++) {
      const u = 2 * (k * coils + c) * cy * cx;
      const v = 2 * (k * coils + d) * cy * cx;
      addCornerCorrelation(cornerGram, corners, u, v, wx, wy, false);
    }
  }

  /**
   * Π ← Σ_{k<rank} u_k u_kᴴ from the leading eigenvectors (columns of `vectors`, interleaved
   * row-major size×size, as HermitianEigenSolver leaves them).
   */
  setProjector(vectors: Float64Array, rank: number): void {
    rankProjector(this.projector, vectors, this.size, rank);
  }

  /**
   * outs[k][d] ← the rank projection of the arrays last given to `gram`, averaged back per coil
   * (see the class comment). `outs` must not be those arrays.
   */
  project(outs: readonly (readonly Float64Array[])[]): void {
    const arrays = this.lifted;
    if (arrays === null) throw new Error('project needs a preceding gram');
    const { coils, nx, ny } = this;
    const n = nx * ny;
    if (this.boxes.fullBox !== null) {
      for (let k = 0; k < this.arrays; k++) for (let d = 0; d < coils; d++) this.projected[k][d].fill(0);
      for (let c = 0; c < coils; c++) {
        for (let d = c; d < coils; d++) {
          this.fullKernel(c, d);
          this.prepareMultiplier();
          const m = this.multiplier;
          for (let k = 0; k < this.arrays; k++) {
            const sc = this.spectra[k][c];
            const sd = this.spectra[k][d];
            const toD = this.projected[k][d];
            const toC = this.projected[k][c];
            for (let i = 0; i < 2 * n; i += 2) {
              const mr = m[i];
              const mi = m[i + 1];
              // Stored conjugated: toD += conj(Ẑ_c·M), toC += conj(Ẑ_d·conj M) = conj(Ẑ_d)·M.
              toD[i] += sc[i] * mr - sc[i + 1] * mi;
              toD[i + 1] -= sc[i] * mi + sc[i + 1] * mr;
              if (c !== d) {
                toC[i] += sd[i] * mr + sd[i + 1] * mi;
                toC[i + 1] += sd[i] * mi - sd[i + 1] * mr;
              }
            }
          }
        }
      }
      // Inverse DFT as conj ∘ DFT ∘ conj (the 1/N is in the multiplier).
      for (let k = 0; k < this.arrays; k++) {
        for (let d = 0; d < coils; d++) {
          this.dft.forward(this.projected[k][d], outs[k][d], { conjugateOutput: true });
        }
      }
    }
    for (let d = 0; d < coils; d++) {
      for (let c = 0; c < coils; c++) this.boxKernelsOf(c, d);
      for (let k = 0; k < this.arrays; k++) this.averageBorder(outs[k][d], arrays[k]);
    }
    this.lifted = null;
  }

  /** kernel[δ] = Σ_{b∈W, b+δ∈W} Π[(c, b+δ), (d, b)] (the full box). */
  private fullKernel(c: number, d: number): void {
    const { wx, wy, window: n, size, projector, kernel } = this;
    const lx = 2 * wx - 1;
    kernel.fill(0);
    for (let b = 0; b < n; b++) {
      const by = Math.floor(b / wx);
      const bx = b - by * wx;
      const column = d * n + b;
      for (let a = 0; a < n; a++) {
        const ay = Math.floor(a / wx);
        const ax = a - ay * wx;
        const o = 2 * ((ay - by + wy - 1) * lx + ax - bx + wx - 1);
        const p = 2 * ((c * n + a) * size + column);
        kernel[o] += projector[p];
        kernel[o + 1] += projector[p + 1];
      }
    }
  }

  /**
   * multiplier ← DFT(κ)/(N·n), κ[−δ mod (ny, nx)] = kernel[δ]: 2wy−1 row DFTs of the kernel's rows,
   * then one column DFT per column (the rows are distinct because ny ≥ 2wy − 1 when a full box exists).
   */
  private prepareMultiplier(): void {
    const { nx, ny, wx, wy, kernel, kernelRows, kernelRowSpectra, multiplier, lineY, lineOut } = this;
    const lx = 2 * wx - 1;
    const ly = 2 * wy - 1;
    const scale = 1 / (nx * ny * this.window);
    kernelRows.fill(0);
    for (let s = 0; s < ly; s++) {
      for (let dx = -(wx - 1); dx < wx; dx++) {
        const col = ((-dx % nx) + nx) % nx;
        const k = 2 * (s * lx + dx + wx - 1);
        kernelRows[2 * (s * nx + col)] += kernel[k] * scale;
        kernelRows[2 * (s * nx + col) + 1] += kernel[k + 1] * scale;
      }
      this.planX.forward(
        kernelRowSpectra.subarray(2 * s * nx, 2 * (s + 1) * nx),
        kernelRows.subarray(2 * s * nx, 2 * (s + 1) * nx),
      );
    }
    for (let f = 0; f < nx; f++) {
      lineY.fill(0);
      for (let s = 0; s < ly; s++) {
        const row = ((-(s - (wy - 1)) % ny) + ny) % ny;
        lineY[2 * row] = kernelRowSpectra[2 * (s * nx + f)];
        lineY[2 * row + 1] = kernelRowSpectra[2 * (s * nx + f) + 1];
      }
      this.planY.forward(lineOut, lineY);
      for (let r = 0; r < ny; r++) {
        multiplier[2 * (r * nx + f)] = lineOut[2 * r];
        multiplier[2 * (r * nx + f) + 1] = lineOut[2 * r + 1];
      }
    }
  }

  /**
   * boxKernels[c][box] for the pair (c, d): K_box[δ] = Σ_{b∈box} Π[(c, b+δ), (d, b)], every box at
   * once from 2D prefix sums over the window offsets b.
   */
  private boxKernelsOf(c: number, d: number): void {
    const { wx, wy, window: n, size, projector, prefix, boxKernels } = this;
    const { rowBoxes, colBoxes } = this.boxes;
    const lx = 2 * wx - 1;
    const kernelSize = 2 * lx * (2 * wy - 1);
    const stride = wx + 1;
    prefix.fill(0);
    // prefix[(by+1)·(wx+1) + bx+1] = Σ_{b'y ≤ by, b'x ≤ bx} T[b'], T[b][δ] = Π[(c, b+δ), (d, b)].
    for (let by = 0; by < wy; by++) {
      for (let bx = 0; bx < wx; bx++) {
        const slot = ((by + 1) * stride + bx + 1) * kernelSize;
        const up = (by * stride + bx + 1) * kernelSize;
        const left = ((by + 1) * stride + bx) * kernelSize;
        const diagonal = (by * stride + bx) * kernelSize;
        for (let i = 0; i < kernelSize; i++) {
          prefix[slot + i] = prefix[up + i] + prefix[left + i] - prefix[diagonal + i];
        }
        const column = d * n + by * wx + bx;
        for (let ay = 0; ay < wy; ay++) {
          for (let ax = 0; ax < wx; ax++) {
            const o = slot + 2 * ((ay - by + wy - 1) * lx + ax - bx + wx - 1);
            const p = 2 * ((c * n + ay * wx + ax) * size + column);
            prefix[o] += projector[p];
            prefix[o + 1] += projector[p + 1];
          }
        }
      }
    }
    const nCol = colBoxes.length / 2;
    const boxCount = (rowBoxes.length / 2) * nCol;
    for (let ry = 0; ry < rowBoxes.length / 2; ry++) {
      const y0 = rowBoxes[2 * ry];
      const y1 = rowBoxes[2 * ry + 1] + 1;
      for (let rx = 0; rx < nCol; rx++) {
        const x0 = colBoxes[2 * rx];
        const x1 = colBoxes[2 * rx + 1] + 1;
        const target = (c * boxCount + ry * nCol + rx) * kernelSize;
        const p11 = (y1 * stride + x1) * kernelSize;
        const p01 = (y0 * stride + x1) * kernelSize;
        const p10 = (y1 * stride + x0) * kernelSize;
        const p00 = (y0 * stride + x0) * kernelSize;
        for (let i = 0; i < kernelSize; i++) {
          boxKernels[target + i] = prefix[p11 + i] - prefix[p01 + i] - prefix[p10 + i] + prefix[p00 + i];
        }
      }
    }
  }

  /**
   * out[q] = (1/#b) Σ_c Σ_δ K^{cd}_box(q)[δ] z_c[q + δ] at every sample outside the interior, with
   * the box kernels of the current output coil d. Along a border row the interior columns share
   * one box, so each kernel tap runs over the whole strip (likewise border columns); the corners,
   * or every sample when no full box exists, are summed sample by sample.
   */
  private averageBorder(out: Float64Array, inputs: readonly Float64Array[]): void {
    const { nx, ny } = this;
    const { rowBox, colBox, fullBox } = this.boxes;
    if (fullBox === null) {
      for (let qy = 0; qy < ny; qy++) for (let qx = 0; qx < nx; qx++) this.averageSample(out, inputs, qy, qx);
      return;
    }
    for (let qy = 0; qy < ny; qy++) {
      if (rowBox[qy] === fullBox.ry) {
        for (let qx = 0; qx < nx; qx++)
          if (colBox[qx] !== fullBox.rx) this.averageStrip(out, inputs, qx, 'column');
        break;
      }
    }
    for (let qy = 0; qy < ny; qy++) {
      if (rowBox[qy] === fullBox.ry) continue;
      this.averageStrip(out, inputs, qy, 'row');
      for (let qx = 0; qx < nx; qx++) if (colBox[qx] !== fullBox.rx) this.averageSample(out, inputs, qy, qx);
    }
  }

  /**
   * The interior part of border row `line` (columns of the full column box) or of border column
   * `line` (rows of the full row box): one box, so out = (1/#b) Σ_c Σ_δ K[δ] z_c[· + δ] tap by tap.
   */
  private averageStrip(
    out: Float64Array,
    inputs: readonly Float64Array[],
    line: number,
    axis: 'row' | 'column',
  ): void {
    const { nx, ny, wx, wy, coils, boxKernels } = this;
    const { rowBox, colBox, rowBoxes, colBoxes } = this.boxes;
    const fullBox = this.boxes.fullBox as { ry: number; rx: number };
    const byRow = axis === 'row';
    const lx = 2 * wx - 1;
    const kernelSize = 2 * lx * (2 * wy - 1);
    const nCol = colBoxes.length / 2;
    const boxCount = (rowBoxes.length / 2) * nCol;
    const ry = byRow ? rowBox[line] : fullBox.ry;
    const rx = byRow ? fullBox.rx : colBox[line];
    const count =
      (rowBoxes[2 * ry + 1] - rowBoxes[2 * ry] + 1) * (colBoxes[2 * rx + 1] - colBoxes[2 * rx] + 1);
    // Positions along the strip: the interior columns (row strip) or rows (column strip).
    const first = byRow ? wx - 1 : wy - 1;
    const last = byRow ? nx - wx : ny - wy;
    const step = byRow ? 2 : 2 * nx;
    const start = 2 * (byRow ? line * nx + first : first * nx + line);
    const end = start + (last - first) * step;
    for (let o = start; o <= end; o += step) {
      out[o] = 0;
      out[o + 1] = 0;
    }
    const dy0 = byRow ? Math.max(-(wy - 1), -line) : -(wy - 1);
    const dy1 = byRow ? Math.min(wy - 1, ny - 1 - line) : wy - 1;
    const dx0 = byRow ? -(wx - 1) : Math.max(-(wx - 1), -line);
    const dx1 = byRow ? wx - 1 : Math.min(wx - 1, nx - 1 - line);
    for (let c = 0; c < coils; c++) {
      const z = inputs[c];
      const base = (c * boxCount + ry * nCol + rx) * kernelSize;
      for (let dy = dy0; dy <= dy1; dy++) {
        for (let dx = dx0; dx <= dx1; dx++) {
          const k = base + 2 * ((dy + wy - 1) * lx + dx + wx - 1);
          const kr = boxKernels[k];
          const ki = boxKernels[k + 1];
          if (kr === 0 && ki === 0) continue;
          const shift = 2 * (dy * nx + dx);
          for (let o = start; o <= end; o += step) {
            const zr = z[o + shift];
            const zi = z[o + shift + 1];
            out[o] += kr * zr - ki * zi;
            out[o + 1] += kr * zi + ki * zr;
          }
        }
      }
    }
    const scale = 1 / count;
    for (let o = start; o <= end; o += step) {
      out[o] *= scale;
      out[o + 1] *= scale;
    }
  }

  /** One sample q = (qy, qx) by the direct sum over its box kernels, coil by coil. */
  private averageSample(out: Float64Array, inputs: readonly Float64Array[], qy: number, qx: number): void {
    const { nx, ny, wx, wy, coils, boxKernels, sampleSum: sum } = this;
    const { rowBox, colBox, rowBoxes, colBoxes } = this.boxes;
    const kernelSize = 2 * (2 * wx - 1) * (2 * wy - 1);
    const nCol = colBoxes.length / 2;
    const boxCount = (rowBoxes.length / 2) * nCol;
    const ry = rowBox[qy];
    const rx = colBox[qx];
    const count =
      (rowBoxes[2 * ry + 1] - rowBoxes[2 * ry] + 1) * (colBoxes[2 * rx + 1] - colBoxes[2 * rx] + 1);
    sum[0] = 0;
    sum[1] = 0;
    for (let c = 0; c < coils; c++) {
      addKernelSum(
        sum,
        boxKernels,
        (c * boxCount + ry * nCol + rx) * kernelSize,
        inputs[c],
        nx,
        ny,
        wx,
        wy,
        qy,
        qx,
      );
    }
    out[2 * (qy * nx + qx)] = sum[0] / count;
    out[2 * (qy * nx + qx) + 1] = sum[1] / count;
  }
}
