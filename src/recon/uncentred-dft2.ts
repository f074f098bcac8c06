import { type FftPlan, fftPlan } from '../core/fft-plan.ts';
import { type ColumnPlan, columnPlan, rowViews, transformColumns } from '../core/plain-fft-2d.ts';

/**
 * Where Dft2.forward copies the row transforms of some rows (taken before the column pass): row r
 * with slotOfRow[r] ≥ 0 goes to into[offset + slot·stride …] (2·nx numbers).
 */
export interface RowCopies {
  slotOfRow: Int32Array;
  into: Float64Array;
  offset: number;
  stride: number;
}

/**
 * Unnormalised 2D DFT, X[k] = Σ_m x[m] e^(−i2π(ky·my/ny + kx·mx/nx)), of interleaved ny×nx arrays:
 * rows to their places (bit-reversed for power-of-two heights), then the columns in place, all
 * columns at once by batched radix-2 stages (plainFft2d's column pass; gathered for other heights).
 * Options fold the pointwise steps of a convolution into the passes: the input rows can be taken
 * as conj(source · m) for a real m, the output conjugated; and the row transforms of chosen rows
 * can be kept (keepRows, without multiplyConj): the line DFTs of those rows at no extra transform.
 * Source and target may be the same array (the rows then go through a scratch array).
 */
export class Dft2 {
  private readonly nx: number;
  private readonly ny: number;
  private readonly planX: FftPlan;
  private readonly planY: FftPlan;
  /** Row places and twiddles of the column pass. */
  private readonly columns: ColumnPlan;
  private readonly scratch: Float64Array;
  private readonly scratchRows: Float64Array[];
  private readonly rowIn: Float64Array;
  private readonly columnIn: Float64Array;
  private readonly columnOut: Float64Array;
  /** forwardToReal: the grid row of each transformed non-zero row. */
  private readonly rowOfSlot: Int32Array;

  constructor(nx: number, ny: number) {
    this.nx = nx;
    this.ny = ny;
    this.planX = fftPlan(nx);
    this.planY = fftPlan(ny);
    this.columns = columnPlan(ny);
    this.scratch = new Float64Array(2 * nx * ny);
    this.scratchRows = rowViews(this.scratch, 2 * nx);
    this.rowIn = new Float64Array(2 * nx);
    this.columnIn = new Float64Array(2 * ny);
    this.columnOut = new Float64Array(2 * ny);
    this.rowOfSlot = new Int32Array(ny);
  }

  forward(
    source: Float64Array,
    target: Float64Array,
    options: { multiplyConj?: Float64Array; conjugateOutput?: boolean; keepRows?: RowCopies } = {},
  ): void {
    const { nx, ny, planX, columns, rowIn } = this;
    const { multiplyConj: m, conjugateOutput, keepRows } = options;
    const sourceRows = this.rowsOf(source);
    // In place, the rows' bit-reversed places would overwrite rows not yet read.
    const work = source === target ? this.scratch : target;
    const workRows = this.rowsOf(work);
    for (let r = 0; r < ny; r++) {
      const into = workRows[columns.place[r]];
      if (m === undefined) {
        planX.forward(into, sourceRows[r]);
        if (keepRows !== undefined && keepRows.slotOfRow[r] >= 0) {
          keepRows.into.set(into, keepRows.offset + keepRows.slotOfRow[r] * keepRows.stride);
        }
        continue;
      }
      for (let c = 0, i = r * nx; c < nx; c++, i++) {
        rowIn[2 * c] = source[2 * i] * m[i];
        rowIn[2 * c + 1] = -source[2 * i + 1] * m[i];
      }
      planX.forward(into, rowIn);
    }
    transformColumns(work, ny, nx, columns);
    if (work === target && !conjugateOutput) return;
    const sign = conjugateOutput ? -1 : 1;
    for (let k = 0; k < 2 * nx * ny; k += 2) {
      target[k] = work[k];
      target[k + 1] = sign * work[k + 1];
    }
  }

  private rowsOf(data: Float64Array): Float64Array[] {
    return rowViews(data, 2 * this.nx);
  }

  /**
   * target (real, ny×nx) ← scale · DFT(x) for an x whose DFT is known to be real (Hermitian
   * symmetric about the origin) and whose non-zero rows are given compactly: grid row r is
   * rows[slotOfRow[r]] (zero where the slot is −1). Only the non-zero rows are transformed and
   * gathered into the columns; columns c and c + 1 go through one complex FFT as
   * col_c + i·col_{c+1}, whose real and imaginary parts are then the two real transforms.
   */
  forwardToReal(rows: Float64Array, slotOfRow: Int32Array, target: Float64Array, scale = 1): void {
    const { nx, ny, planX, planY, scratchRows } = this;
    const sourceRows = this.rowsOf(rows);
    const input = this.columnIn;
    const output = this.columnOut;
    input.fill(0);
    let slots = 0;
    for (let r = 0; r < ny; r++) {
      if (slotOfRow[r] < 0) continue;
      planX.forward(scratchRows[slots], sourceRows[slotOfRow[r]]);
      this.rowOfSlot[slots++] = r;
    }
    const spectra = this.scratch;
    for (let c = 0; c < nx; c += 2) {
      const pair = c + 1 < nx;
      for (let k = 0; k < slots; k++) {
        const r = this.rowOfSlot[k];
        const i = 2 * (k * nx + c);
        input[2 * r] = pair ? spectra[i] - spectra[i + 3] : spectra[i];
        input[2 * r + 1] = pair ? spectra[i + 1] + spectra[i + 2] : spectra[i + 1];
      }
      planY.forward(output, input);
      for (let r = 0; r < ny; r++) {
        target[r * nx + c] = output[2 * r] * scale;
        if (pair) target[r * nx + c + 1] = output[2 * r + 1] * scale;
      }
    }
  }
}
