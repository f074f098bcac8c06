import { type FftPlan, fftPlan } from '../core/fft-plan.ts';
import { Dft2 } from './uncentred-dft2.ts';

/**
 * Block-Hankel lifting of a ny×nx complex k-space with a wy×wx window, without forming the matrix.
 * Row p of H(z) is the window at p = (py, px), p ∈ V = [0, ny−wy]×[0, nx−wx] (windows fully inside),
 * column a = (ay, ax) ∈ W = [0, wy)×[0, wx) holds z[p + a]; column index a = ay·wx + ax.
 * Both products with H are correlations of k-space with itself, so they run on FFTs: the Gram
 * matrix costs one 2D DFT per lifted array plus O(N) and O(w·(nx + ny)) line-DFT work (gram), the
 * projection half a DFT for the kernel, one DFT back per array, line DFTs along the border strips
 * and direct sums at the corners (projectAverage). Both were checked against the patch-loop
 * definitions (tests/recon/block-hankel.test.ts).
 * Memory O(N); never a dense (N × w²) matrix.
 */
export class BlockHankel {
  readonly nx: number;
  readonly ny: number;
  readonly wx: number;
  readonly wy: number;
  /** Window size n = wy·wx: the Gram matrix is n×n. */
  readonly size: number;
  /** Unnormalised 2D DFTs of the arrays last lifted (shared by gram and projection). */
  private readonly spectra: [Float64Array, Float64Array];
  /** Row-and-column 2D DFT with the plans and scratch of this size. */
  private readonly dft: Dft2;
  private liftedArrays: readonly Float64Array[] = [];
  /** e^(−i2πm/ny), m = 0…ny−1. */
  private readonly twiddleY: Float64Array;
  /** Row-wise DFT of the power at lags dx ∈ (−wx, wx): ny × (2wx−1), then the circular autocorrelation. */
  private readonly rowLags: Float64Array;
  private readonly autocorrelation: Float64Array;
  /** Wrap-band correlations: rows (ay, by, dx) and columns (ax, bx, dy), see gram. */
  private readonly rowBand: Float64Array;
  private readonly columnBand: Float64Array;
  /** DFTs of the 2wy−2 band rows / 2wx−2 band columns of each array, and line scratch. */
  private readonly rowSpectra: Float64Array;
  private readonly columnSpectra: Float64Array;
  private readonly lineX: Float64Array;
  private readonly lineY: Float64Array;
  private readonly lineOut: Float64Array;
  private readonly planX: FftPlan;
  private readonly planY: FftPlan;
  /** The (2wy−2)×(2wx−2) wrapped corner block of one array. */
  private readonly corner: Float64Array;
  private readonly boxes: WindowBoxes;
  /** Rows of the interior kernel placed circularly (complex; slot per grid row, −1 for zero rows)
   * and its DFT-domain multiplier (real). */
  private readonly kernelImage: Float64Array;
  private readonly multiplier: Float64Array;
  private readonly kernelRowSlot: Int32Array;
  /**
   * Border lines: the rows the row strips read, [0, 2wy−2) and [ny−2wy+2, ny), which hold the row
   * wrap band, and likewise the columns. Slot per grid line (−1 elsewhere) and the lines' DFTs per
   * lifted array (slot-major, then array), made once per lifting by transformArrays — the rows'
   * kept from the row pass of the 2D DFT — and shared by the wrap bands and the border strips.
   */
  private readonly borderRowSlot: Int32Array;
  private readonly borderRowSpectra: Float64Array;
  private readonly borderColumnSlot: Int32Array;
  private readonly borderColumnSpectra: Float64Array;
  /** Border strips: kernel line, sums. */
  private readonly kernelLine: Float64Array;
  private readonly stripSums: Float64Array;
  /** Prefix sums over window rows of the per-row kernels (setProjector scratch). */
  private readonly rowPrefix: Float64Array;
  /** Averaging kernels K_box[d], d ∈ [−(wy−1), wy−1]×[−(wx−1), wx−1], one per (row box, column box). */
  private readonly kernels: Float64Array;
  /** One sample's running kernel sum (re, im). */
  private readonly sampleSum = new Float64Array(2);

  constructor(nx: number, ny: number, wx: number, wy: number) {
    if (wx < 1 || wy < 1 || wx > nx || wy > ny)
      throw new RangeError(`window ${wy}×${wx} must fit in ${ny}×${nx}`);
    this.nx = nx;
    this.ny = ny;
    this.wx = wx;
    this.wy = wy;
    this.size = wx * wy;
    const lx = 2 * wx - 1;
    const ly = 2 * wy - 1;
    this.spectra = [new Float64Array(2 * nx * ny), new Float64Array(2 * nx * ny)];
    this.dft = new Dft2(nx, ny);
    this.twiddleY = twiddles(ny);
    this.rowLags = new Float64Array(2 * ny * lx);
    this.autocorrelation = new Float64Array(2 * ly * lx);
    this.rowBand = new Float64Array(2 * wy * wy * lx);
    this.columnBand = new Float64Array(2 * wx * wx * ly);
    this.rowSpectra = new Float64Array(2 * 2 * Math.max(0, 2 * wy - 2) * nx);
    this.columnSpectra = new Float64Array(2 * 2 * Math.max(0, 2 * wx - 2) * ny);
    this.lineX = new Float64Array(2 * nx);
    this.lineY = new Float64Array(2 * ny);
    this.lineOut = new Float64Array(2 * Math.max(nx, ny));
    this.planX = fftPlan(nx);
    this.planY = fftPlan(ny);
    this.corner = new Float64Array(2 * Math.max(0, 2 * wy - 2) * Math.max(0, 2 * wx - 2));
    const boxes = windowBoxes(nx, ny, wx, wy);
    this.boxes = boxes;
    this.kernelImage = new Float64Array(2 * Math.min(ny, 2 * wy - 1) * nx);
    this.multiplier = new Float64Array(nx * ny);
    this.kernelRowSlot = new Int32Array(ny);
    this.borderRowSlot = borderSlots(ny, wy);
    this.borderRowSpectra = new Float64Array(
      2 * 2 * nx * this.borderRowSlot.reduce((m, s) => Math.max(m, s + 1), 0),
    );
    this.borderColumnSlot = borderSlots(nx, wx);
    this.borderColumnSpectra = new Float64Array(
      2 * 2 * ny * this.borderColumnSlot.reduce((m, s) => Math.max(m, s + 1), 0),
    );
    this.kernelLine = new Float64Array(2 * Math.max(nx, ny));
    this.stripSums = new Float64Array(2 * 2 * Math.max(nx, ny));
    this.rowPrefix = new Float64Array(2 * (2 * wx - 1) * (2 * wy - 1) * (wy + 1));
    this.kernels = new Float64Array(
      2 * (2 * wx - 1) * (2 * wy - 1) * (boxes.rowBoxes.length / 2) * (boxes.colBoxes.length / 2),
    );
  }

  /**
   * gram ← Σ_z H(z)ᴴ H(z) over the given arrays: G[a,b] = Σ_{p∈V} conj(z[p+a]) z[p+b].
   * Summed over every p of the torus instead of V, the entry depends on d = b − a only: the
   * circular autocorrelation R[d] = Σ_q conj(z[q]) z[q+d], read off the power |F z|² by a DFT
   * at the (2wy−1)(2wx−1) lags needed (Wiener–Khinchin). The windows outside V wrap around and
   * are subtracted: the band rows py ≥ vy (all px) are circular correlations of 2wy−2 k-space
   * rows at lags dx (one short DFT per row pair), the band columns px ≥ vx (all py) likewise,
   * and the (wy−1)(wx−1) windows in both bands were subtracted twice, so they are added back:
   *   G[a,b] = R[b−a] − Rows[ay, by, bx−ax] − Columns[ax, bx, by−ay] + Corner[a, b].
   * The arrays' transforms are kept for projectLifted.
   */
  gram(gram: Float64Array, arrays: readonly Float64Array[]): void {
    if (arrays.length < 1 || arrays.length > 2) throw new RangeError('gram takes one or two arrays');
    this.transformArrays(arrays);
    this.circularAutocorrelation(arrays.length);
    this.bandCorrelations(arrays, 'rows');
    this.bandCorrelations(arrays, 'columns');
    const { wx, wy, size, autocorrelation, rowBand, columnBand, corner } = this;
    const cy = 2 * wy - 2;
    const cx = 2 * wx - 2;
    gram.fill(0);
    // Corner windows, added back: Σ_{t ∈ [0,wy−1)×[0,wx−1)} conj(c[t+a]) c[t+b] over the corner block c.
    if (cy > 0 && cx > 0) {
      for (const z of arrays) {
        gatherCorner(corner, z, this.nx, this.ny, wx, wy);
        addCornerCorrelation(gram, corner, 0, 0, wx, wy, true);
      }
    }
    const entry = new Float64Array(2);
    for (let a = 0; a < size; a++) {
      for (let b = a; b < size; b++) {
        entry[0] = gram[2 * (a * size + b)];
        entry[1] = gram[2 * (a * size + b) + 1];
        addWrapCorrectedEntry(entry, autocorrelation, rowBand, columnBand, a, b, wx, wy);
        const re = entry[0];
        const im = entry[1];
        gram[2 * (a * size + b)] = re;
        gram[2 * (a * size + b) + 1] = im;
        gram[2 * (b * size + a)] = re;
        gram[2 * (b * size + a) + 1] = -im;
      }
    }
  }

  /** spectra[i] ← DFT(arrays[i]) and the border lines' DFTs; remembers the arrays for projectLifted. */
  private transformArrays(arrays: readonly Float64Array[]): void {
    const stride = 2 * arrays.length * this.nx;
    for (let i = 0; i < arrays.length; i++) {
      const keepRows = {
        slotOfRow: this.borderRowSlot,
        into: this.borderRowSpectra,
        offset: 2 * i * this.nx,
        stride,
      };
      this.dft.forward(arrays[i], this.spectra[i], { keepRows });
    }
    const { nx, ny, borderColumnSlot, borderColumnSpectra, lineY, planY } = this;
    for (let c = 0; c < nx; c++) {
      const slot = borderColumnSlot[c];
      if (slot < 0) continue;
      for (let k = 0; k < arrays.length; k++) {
        const at = 2 * (slot * arrays.length + k) * ny;
        transformLine(borderColumnSpectra.subarray(at, at + 2 * ny), lineY, arrays[k], c, false, nx, planY);
      }
    }
    this.liftedArrays = arrays;
  }

  /**
   * autocorrelation[dy, dx] = R[d] for |dy| < wy, |dx| < wx from the power P = Σ|DFT z|²
   * (Wiener–Khinchin): R[d] = (1/N) Σ_k P[k] e^(+i2πk·d/n). Rows of P are real, so two go through
   * one complex FFT; the column direction is a direct sum over the 2wy−1 lags.
   */
  private circularAutocorrelation(count: number): void {
    const { nx, ny, wx, wy, twiddleY, rowLags, autocorrelation, lineX, lineOut, planX } = this;
    const lx = 2 * wx - 1;
    const [s0, s1] = this.spectra;
    // rowLags[row, dx] = Σ_kx P[row, kx] e^(+i2π kx·dx/nx) = X[−dx], X the row's forward DFT. The
    // power rows go straight from the spectra into the line (no N-sized power array).
    for (let row = 0; row < ny; row += 2) {
      const pair = row + 1 < ny;
      powerRows(lineX, s0, count > 1 ? s1 : null, row, pair, nx);
      planX.forward(lineOut, lineX);
      for (let dx = -(wx - 1); dx < wx; dx++) {
        const k = (((-dx % nx) + nx) % nx) * 2;
        const km = (((dx % nx) + nx) % nx) * 2;
        const o = 2 * (row * lx + dx + wx - 1);
        rowLags[o] = (lineOut[k] + lineOut[km]) / 2;
        rowLags[o + 1] = (lineOut[k + 1] - lineOut[km + 1]) / 2;
        if (pair) {
          rowLags[o + 2 * lx] = (lineOut[k + 1] + lineOut[km + 1]) / 2;
          rowLags[o + 2 * lx + 1] = -(lineOut[k] - lineOut[km]) / 2;
        }
      }
    }
    lagsOverRows(autocorrelation, rowLags, nx, ny, wx, wy, twiddleY);
  }

  /**
   * Wrap-band sums. Rows: band[ay, by, dx] = Σ_{t<wy−1} C(ρ(t+ay), ρ(t+by))(dx) with
   * ρ(i) = (vy + i) mod ny the band rows and C(r, s)(dx) = Σ_c conj(z[r,c]) z[s,(c+dx) mod nx]
   * the circular cross-correlation of two rows: one inverse DFT of Σ_t conj(Z_r)·Z_s per (ay, by).
   * Columns: the same with rows and columns exchanged. Summed over the arrays.
   */
  private bandCorrelations(arrays: readonly Float64Array[], axis: 'rows' | 'columns'): void {
    const byRows = axis === 'rows';
    const band = wrapBand(byRows, this, byRows ? this.planX : this.planY, byRows ? this.lineX : this.lineY);
    const target = byRows ? this.rowBand : this.columnBand;
    const spectra = byRows ? this.rowSpectra : this.columnSpectra;
    target.fill(0);
    if (band.count === 0) return;
    // The band's lines are border lines: copy their DFTs into bandLags' layout.
    const slotOf = byRows ? this.borderRowSlot : this.borderColumnSlot;
    const border = byRows ? this.borderRowSpectra : this.borderColumnSpectra;
    const length = band.length;
    for (let k = 0; k < arrays.length; k++) {
      for (let i = 0; i < band.count; i++) {
        const from = 2 * (slotOf[(band.start + i) % band.lines] * arrays.length + k) * length;
        spectra.set(border.subarray(from, from + 2 * length), 2 * (k * band.count + i) * length);
      }
    }
    bandLags(band, target, spectra, this.lineOut, {
      arrays: arrays.length,
      coils: 1,
      c: 0,
      d: 0,
      mirror: true,
    });
  }

  /**
   * Sets the projector Π = Σ_{k<rank} v_k v_kᴴ from the leading eigenvectors (columns of `vectors`,
   * interleaved, row-major n×n) and folds it into averaging kernels: sample q lies in the windows
   * p = q − b for the offsets b whose window fits (b in a box set by q's distance to the edges), so
   *   x̂[q] = (1/#b) Σ_b Σ_a z[q − b + a] Π[a,b] = (1/#b) Σ_d K_box[d] z[q + d],
   *   K_box[d] = Σ_{b ∈ box} Π[b + d, b].
   * One kernel per distinct box (interior samples all share the full box), so every sample costs
   * (2wy−1)(2wx−1) multiply-adds. `projector` is scratch of n×n complex numbers.
   */
  setProjector(projector: Float64Array, vectors: Float64Array, rank: number): void {
    const { size: n, wx, wy, kernels } = this;
    const { rowBoxes, colBoxes } = this.boxes;
    rankProjector(projector, vectors, n, rank);
    // Per column box: the kernel of each window row by (prefix-summed over by), then every row
    // box [b0, b1] as a difference of two prefix sums.
    const kw = 2 * wx - 1;
    const kernelSize = 2 * kw * (2 * wy - 1);
    const nCol = colBoxes.length / 2;
    const prefix = this.rowPrefix;
    for (let rx = 0; rx < nCol; rx++) {
      prefix.fill(0);
      for (let by = 0; by < wy; by++) {
        const slot = (by + 1) * kernelSize;
        for (let bx = colBoxes[2 * rx]; bx <= colBoxes[2 * rx + 1]; bx++) {
          const b = by * wx + bx;
          for (let ay = 0; ay < wy; ay++) {
            for (let ax = 0; ax < wx; ax++) {
              const a = ay * wx + ax;
              const k = slot + 2 * ((ay - by + wy - 1) * kw + (ax - bx + wx - 1));
              prefix[k] += projector[2 * (a * n + b)];
              prefix[k + 1] += projector[2 * (a * n + b) + 1];
            }
          }
        }
        for (let i = 0; i < kernelSize; i++) prefix[slot + i] += prefix[slot - kernelSize + i];
      }
      for (let ry = 0; ry < rowBoxes.length / 2; ry++) {
        const base = (ry * nCol + rx) * kernelSize;
        const high = (rowBoxes[2 * ry + 1] + 1) * kernelSize;
        const low = rowBoxes[2 * ry] * kernelSize;
        for (let i = 0; i < kernelSize; i++) kernels[base + i] = prefix[high + i] - prefix[low + i];
      }
    }
    this.prepareMultiplier();
  }

  /**
   * out ← H†(H(z) Π): the rank projection of every window followed by averaging each k-space
   * sample over the windows that contain it (the adjoint of the lifting divided by the count).
   * Interior samples (all n windows fit) are one linear convolution with the full-box kernel,
   * done as a pointwise product in the image domain (convolution theorem):
   *   F_cᴴ(K ⊛ z) = √N · F_cᴴ(z) · F_cᴴ(S k̃),  k̃[−d mod N] = K[d], S = fftshift,
   * which never wraps for interior samples; the border samples are then summed directly.
   * With `z2`/`out2` the same projection is applied to a second array (stacked derivative weighting).
   */
  projectAverage(out: Float64Array, z: Float64Array, out2?: Float64Array, z2?: Float64Array): void {
    const arrays = out2 !== undefined && z2 !== undefined ? [z, z2] : [z];
    if (this.boxes.fullBox !== null) this.transformArrays(arrays);
    this.liftedArrays = arrays;
    this.projectLifted(out, out2);
  }

  /**
   * projectAverage of the arrays last given to gram (which must be unchanged since), reusing
   * their transforms: one inverse transform per array. Consumes the stored transforms.
   * With `conjugated` the outputs hold the complex conjugates instead, for a caller that folds the
   * conjugation into its next pass: the inverse DFT is conj ∘ DFT ∘ conj, and leaving out the outer
   * conj saves a pass over each array.
   */
  projectLifted(out: Float64Array, out2?: Float64Array, conjugated = false): void {
    const arrays = this.liftedArrays;
    if (arrays.length === 0) throw new Error('projectLifted needs a preceding gram or projectAverage');
    const outs = arrays.length > 1 && out2 !== undefined ? [out, out2] : [out];
    const sign = conjugated ? -1 : 1;
    if (this.boxes.fullBox === null) {
      for (let i = 0; i < outs.length; i++) this.averageBorder(outs[i], arrays[i], 'all', sign);
    } else {
      for (let i = 0; i < outs.length; i++) this.convolveInterior(outs[i], this.spectra[i], conjugated);
      this.averageStrips(outs, arrays, 'rows', sign);
      this.averageStrips(outs, arrays, 'columns', sign);
      for (let i = 0; i < outs.length; i++) this.averageBorder(outs[i], arrays[i], 'corners', sign);
    }
    this.liftedArrays = [];
  }

  /**
   * Multiplier M = DFT(κ)/(N·n) of the full-box kernel placed circularly, κ[−d mod N] = K[d]
   * (after setProjector): then (1/n) Σ_d K[d] z[q + d] = IDFT(DFT(z)·M)[q] wherever q + d does
   * not wrap, i.e. at every interior sample. Π is Hermitian, so K[−d] = conj K[d] (substitute
   * b → b − d in K[d] = Σ_b Π[b+d, b]) and M is real: two columns share one complex FFT.
   */
  private prepareMultiplier(): void {
    const { nx, ny, wx, wy, kernels, kernelImage, multiplier, kernelRowSlot } = this;
    const { colBoxes, fullBox: box } = this.boxes;
    if (box === null) return;
    const kw = 2 * wx - 1;
    const kernelSize = 2 * kw * (2 * wy - 1);
    const base = (box.ry * (colBoxes.length / 2) + box.rx) * kernelSize;
    kernelRowSlot.fill(-1);
    kernelImage.fill(0);
    let slots = 0;
    for (let dy = -(wy - 1); dy < wy; dy++) {
      const row = ((-dy % ny) + ny) % ny;
      if (kernelRowSlot[row] < 0) kernelRowSlot[row] = slots++;
      const slot = kernelRowSlot[row];
      for (let dx = -(wx - 1); dx < wx; dx++) {
        const col = ((-dx % nx) + nx) % nx;
        const k = base + 2 * ((dy + wy - 1) * kw + dx + wx - 1);
        kernelImage[2 * (slot * nx + col)] += kernels[k];
        kernelImage[2 * (slot * nx + col) + 1] += kernels[k + 1];
      }
    }
    this.dft.forwardToReal(kernelImage, kernelRowSlot, multiplier, 1 / (nx * ny * wx * wy));
  }

  /** out ← IDFT(spectrum · multiplier) = conj(DFT(conj(spectrum · multiplier))), or its conjugate. */
  private convolveInterior(out: Float64Array, spectrum: Float64Array, conjugated: boolean): void {
    this.dft.forward(spectrum, out, { multiplyConj: this.multiplier, conjugateOutput: !conjugated });
  }

  /**
   * Border strips by FFTs along the strip. A sample q in a border row (qy < wy−1 or qy > ny−wy)
   * whose column is interior sees all wx column offsets, so its kernel K_box depends on qy only and
   *   Σ_d K_box[d] z[q + d] = Σ_dy (z[qy+dy, ·] ⊛ κ_dy)[qx],  κ_dy[−dx mod nx] = K_box[dy, dx],
   * a circular convolution along the row that does not wrap for interior qx: per border row one
   * product of line spectra per dy and one inverse DFT. Columns likewise ('columns').
   */
  private averageStrips(
    outs: Float64Array[],
    arrays: readonly Float64Array[],
    axis: 'rows' | 'columns',
    sign: number,
  ): void {
    const byRows = axis === 'rows';
    const { nx, ny, wx, wy, kernels } = this;
    const { rowBoxes, colBoxes, rowBox, colBox, fullBox } = this.boxes;
    if (fullBox === null) return;
    const { kernelLine, stripSums, lineOut } = this;
    const plan = byRows ? this.planX : this.planY;
    const line = byRows ? this.lineX : this.lineY;
    const length = byRows ? nx : ny;
    const lines = byRows ? ny : nx;
    const w = byRows ? wy : wx;
    const wAlong = byRows ? wx : wy;
    const boxOf = byRows ? rowBox : colBox;
    const boxes = byRows ? rowBoxes : colBoxes;
    const kw = 2 * wx - 1;
    const kernelSize = 2 * kw * (2 * wy - 1);
    const nCol = colBoxes.length / 2;
    const count = arrays.length;
    // Spectra of every line a border line reads (border lines, made by transformArrays).
    const stripSpectra = byRows ? this.borderRowSpectra : this.borderColumnSpectra;
    const stripSlot = byRows ? this.borderRowSlot : this.borderColumnSlot;
    for (let q = 0; q < lines; q++) {
      if (q >= w - 1 && q <= lines - w) continue;
      const box = boxOf[q];
      const kernelBase = (byRows ? box * nCol + fullBox.rx : fullBox.ry * nCol + box) * kernelSize;
      const samples = (boxes[2 * box + 1] - boxes[2 * box] + 1) * wAlong;
      const d0 = Math.max(-(w - 1), -q);
      const d1 = Math.min(w - 1, lines - 1 - q);
      stripSums.fill(0, 0, 2 * count * length);
      for (let d = d0; d <= d1; d++) {
        kernelLine.fill(0, 0, 2 * length);
        for (let e = -(wAlong - 1); e < wAlong; e++) {
          const k =
            kernelBase + 2 * (byRows ? (d + wy - 1) * kw + e + wx - 1 : (e + wy - 1) * kw + d + wx - 1);
          const m = 2 * (((-e % length) + length) % length);
          kernelLine[m] += kernels[k];
          kernelLine[m + 1] += kernels[k + 1];
        }
        plan.forward(lineOut, kernelLine);
        const slot = stripSlot[q + d];
        for (let k = 0; k < count; k++) {
          const at = 2 * (slot * count + k) * length;
          const sum = 2 * k * length;
          for (let f = 0; f < 2 * length; f += 2) {
            const ar = stripSpectra[at + f];
            const ai = stripSpectra[at + f + 1];
            const br = lineOut[f];
            const bi = lineOut[f + 1];
            stripSums[sum + f] += ar * br - ai * bi;
            stripSums[sum + f + 1] += ar * bi + ai * br;
          }
        }
      }
      // Inverse DFT as conj ∘ forward ∘ conj, scaled by 1/length and the window count.
      const scale = 1 / (length * samples);
      for (let k = 0; k < count; k++) {
        const sum = 2 * k * length;
        for (let f = 0; f < 2 * length; f += 2) {
          line[f] = stripSums[sum + f];
          line[f + 1] = -stripSums[sum + f + 1];
        }
        plan.forward(lineOut, line);
        const out = outs[k];
        for (let c = wAlong - 1; c <= length - wAlong; c++) {
          const o = 2 * (byRows ? q * nx + c : c * nx + q);
          out[o] = lineOut[2 * c] * scale;
          out[o + 1] = -sign * lineOut[2 * c + 1] * scale;
        }
      }
    }
  }

  /**
   * Direct box-kernel sums: every sample ('all', when no sample sees every window) or the corner
   * samples, within w − 1 of two edges ('corners'); imaginary parts times `sign`.
   */
  private averageBorder(out: Float64Array, z: Float64Array, which: 'all' | 'corners', sign: number): void {
    const all = which === 'all';
    const { nx, ny, wx, wy, kernels } = this;
    const { rowBoxes, colBoxes, rowBox, colBox } = this.boxes;
    const kw = 2 * wx - 1;
    const kernelSize = 2 * kw * (2 * wy - 1);
    const nCol = colBoxes.length / 2;
    for (let qy = 0; qy < ny; qy++) {
      const ry = rowBox[qy];
      const rowCount = rowBoxes[2 * ry + 1] - rowBoxes[2 * ry] + 1;
      const borderRow = qy < wy - 1 || qy > ny - wy;
      if (!all && !borderRow) continue;
      for (let qx = 0; qx < nx; qx++) {
        if (!all && qx >= wx - 1 && qx <= nx - wx) {
          qx = nx - wx;
          continue;
        }
        const rx = colBox[qx];
        const count = rowCount * (colBoxes[2 * rx + 1] - colBoxes[2 * rx] + 1);
        const base = (ry * nCol + rx) * kernelSize;
        const sum = this.sampleSum;
        sum[0] = 0;
        sum[1] = 0;
        addKernelSum(sum, kernels, base, z, nx, ny, wx, wy, qy, qx);
        const o = 2 * (qy * nx + qx);
        out[o] = sum[0] / count;
        out[o + 1] = (sign * sum[1]) / count;
      }
    }
  }
}

/**
 * Slot per line of an axis of `lines` lines (window `w`) for the border lines [0, 2w−2) and
 * [lines−2w+2, lines) (each once where they overlap), −1 for the others.
 */
function borderSlots(lines: number, w: number): Int32Array {
  const slot = new Int32Array(lines).fill(-1);
  let slots = 0;
  for (let i = 0; i < lines; i++) if (i < 2 * w - 2 || i >= lines - 2 * w + 2) slot[i] = slots++;
  return slot;
}

/**
 * line ← P[row] + i·P[row + 1] (P[row + 1] = 0 without `pair`), P = |s0|² + |s1|² the power of the
 * spectra (s1 omitted when null), rows of nx.
 */
function powerRows(
  line: Float64Array,
  s0: Float64Array,
  s1: Float64Array | null,
  row: number,
  pair: boolean,
  nx: number,
): void {
  for (let c = 0, j = 2 * row * nx, k = j + 2 * nx; c < nx; c++, j += 2, k += 2) {
    let p = s0[j] * s0[j] + s0[j + 1] * s0[j + 1];
    if (s1 !== null) p += s1[j] * s1[j] + s1[j + 1] * s1[j + 1];
    line[2 * c] = p;
    if (!pair) {
      line[2 * c + 1] = 0;
      continue;
    }
    let q = s0[k] * s0[k] + s0[k + 1] * s0[k + 1];
    if (s1 !== null) q += s1[k] * s1[k] + s1[k + 1] * s1[k + 1];
    line[2 * c + 1] = q;
  }
}

/**
 * sum += Σ_δ K[δ] z[q + δ] over the taps δ ∈ [−(wy−1), wy−1]×[−(wx−1), wx−1] that stay inside the
 * ny×nx grid, K the (2wy−1)×(2wx−1) kernel starting at `base` of `kernels`, q = (qy, qx).
 */
export function addKernelSum(
  sum: Float64Array,
  kernels: Float64Array,
  base: number,
  z: Float64Array,
  nx: number,
  ny: number,
  wx: number,
  wy: number,
  qy: number,
  qx: number,
): void {
  const kw = 2 * wx - 1;
  const dy0 = Math.max(-(wy - 1), -qy);
  const dy1 = Math.min(wy - 1, ny - 1 - qy);
  const dx0 = Math.max(-(wx - 1), -qx);
  const dx1 = Math.min(wx - 1, nx - 1 - qx);
  let re = sum[0];
  let im = sum[1];
  for (let dy = dy0; dy <= dy1; dy++) {
    const zRow = 2 * ((qy + dy) * nx + qx);
    const kRow = base + 2 * ((dy + wy - 1) * kw + wx - 1);
    for (let dx = dx0; dx <= dx1; dx++) {
      const kr = kernels[kRow + 2 * dx];
      const ki = kernels[kRow + 2 * dx + 1];
      const zr = z[zRow + 2 * dx];
      const zi = z[zRow + 2 * dx + 1];
      re += kr * zr - ki * zi;
      im += kr * zi + ki * zr;
    }
  }
  sum[0] = re;
  sum[1] = im;
}

/**
 * entry += R[b−a] − Rows[ay, by, bx−ax] − Columns[ax, bx, by−ay] (added in that order): the part of
 * the Gram entry of windows a and b (wy×wx, row-major) that the whole-torus correlation and the
 * two wrapped bands give (BlockHankel.gram; the corner term is the caller's). `correlation` holds
 * the (2wy−1)×(2wx−1) lags, `rowBand` wy²×(2wx−1) and `columnBand` wx²×(2wy−1), interleaved complex.
 */
export function addWrapCorrectedEntry(
  entry: Float64Array,
  correlation: Float64Array,
  rowBand: Float64Array,
  columnBand: Float64Array,
  a: number,
  b: number,
  wx: number,
  wy: number,
): void {
  const ay = Math.floor(a / wx);
  const ax = a - ay * wx;
  const by = Math.floor(b / wx);
  const bx = b - by * wx;
  const dy = by - ay;
  const dx = bx - ax;
  const lx = 2 * wx - 1;
  const r = 2 * ((dy + wy - 1) * lx + dx + wx - 1);
  const rb = 2 * ((ay * wy + by) * lx + dx + wx - 1);
  const cb = 2 * ((ax * wx + bx) * (2 * wy - 1) + dy + wy - 1);
  entry[0] = entry[0] + correlation[r] - rowBand[rb] - columnBand[cb];
  entry[1] = entry[1] + correlation[r + 1] - rowBand[rb + 1] - columnBand[cb + 1];
}

/** e^(−i2πm/n) for m = 0…n−1, interleaved. */
export function twiddles(n: number): Float64Array {
  const t = new Float64Array(2 * n);
  for (let m = 0; m < n; m++) {
    t[2 * m] = Math.cos((2 * Math.PI * m) / n);
    t[2 * m + 1] = -Math.sin((2 * Math.PI * m) / n);
  }
  return t;
}

/**
 * One wrap band of a wy×wx window on an ny×nx grid: the 2w−2 rows (byRows; w = wy, lines of length
 * nx, lags |δ| < wx along them) or columns from `start` on, modulo the grid, where windows wrap.
 */
export interface WrapBand {
  byRows: boolean;
  w: number;
  /** The window side along the lines: lags δ with |δ| < other. */
  other: number;
  length: number;
  lines: number;
  start: number;
  count: number;
  /** The line FFT (length `length`) and its scratch line. */
  plan: FftPlan;
  line: Float64Array;
}

export function wrapBand(
  byRows: boolean,
  grid: { nx: number; ny: number; wx: number; wy: number },
  plan: FftPlan,
  line: Float64Array,
): WrapBand {
  const w = byRows ? grid.wy : grid.wx;
  const lines = byRows ? grid.ny : grid.nx;
  return {
    byRows,
    w,
    other: byRows ? grid.wx : grid.wy,
    length: byRows ? grid.nx : grid.ny,
    lines,
    start: lines - w + 1,
    count: 2 * w - 2,
    plan,
    line,
  };
}

/** spectra block `block` ← the DFTs of the band's 2w−2 lines of z (block-major, `length` each). */
export function transformBandLines(
  band: WrapBand,
  spectra: Float64Array,
  block: number,
  z: Float64Array,
  nx: number,
): void {
  const { count, length, lines, start } = band;
  for (let i = 0; i < count; i++) {
    const at = 2 * (block * count + i) * length;
    transformLine(
      spectra.subarray(at, at + 2 * length),
      band.line,
      z,
      (start + i) % lines,
      band.byRows,
      nx,
      band.plan,
    );
  }
}

/**
 * target[a, b, δ] = Σ_k Σ_{t<w−1} C(r_k(t+a), s_k(t+b))(δ), |δ| < other, from the line spectra of
 * transformBandLines: r_k the lines of block k·coils + c, s_k those of block k·coils + d, and
 * C(r, s)(δ) = Σ_e conj(r[e]) s[e + δ] the circular cross-correlation (one DFT of Σ conj(R)·S per
 * (a, b)). With `mirror` (for c = d) only b ≥ a is summed and target[b, a, −δ] = conj(target[a, b, δ])
 * gives the rest.
 */
export function bandLags(
  band: WrapBand,
  target: Float64Array,
  spectra: Float64Array,
  out: Float64Array,
  blocks: { arrays: number; coils: number; c: number; d: number; mirror: boolean },
): void {
  const { w, other, length, count, line, plan } = band;
  const { arrays, coils, c, d, mirror } = blocks;
  const lags = 2 * other - 1;
  for (let a = 0; a < w; a++) {
    for (let b = mirror ? a : 0; b < w; b++) {
      // line ← conj(Σ conj(Z_r) Z_s); forward DFT; conj again = inverse DFT of the cross-spectrum.
      line.fill(0);
      for (let k = 0; k < arrays; k++) {
        for (let t = 0; t < w - 1; t++) {
          addConjugatedCrossSpectrum(
            line,
            spectra,
            2 * (((k * coils + c) * count + t + a) * length),
            2 * (((k * coils + d) * count + t + b) * length),
            length,
          );
        }
      }
      plan.forward(out, line);
      for (let delta = -(other - 1); delta < other; delta++) {
        const m = 2 * (((delta % length) + length) % length);
        const re = out[m] / length;
        const im = -out[m + 1] / length;
        const o = 2 * ((a * w + b) * lags + delta + other - 1);
        target[o] = re;
        target[o + 1] = im;
        if (mirror) {
          const oT = 2 * ((b * w + a) * lags - delta + other - 1);
          target[oT] = re;
          target[oT + 1] = -im;
        }
      }
    }
  }
}

/**
 * The window-offset boxes of a wy×wx window sliding over an ny×nx grid: per row and per column
 * position the box of offsets whose window fits (offsetBoxes), and the (row box, column box) of the
 * interior samples, which every window offset fits, or null when no sample sees every window.
 * Shared by BlockHankel and StackedBlockHankel, which average back over the same windows.
 */
export interface WindowBoxes {
  readonly rowBox: Int32Array;
  readonly rowBoxes: Int32Array;
  readonly colBox: Int32Array;
  readonly colBoxes: Int32Array;
  readonly fullBox: { ry: number; rx: number } | null;
}

/** The WindowBoxes of a wy×wx window over an ny×nx grid. */
export function windowBoxes(nx: number, ny: number, wx: number, wy: number): WindowBoxes {
  const rows = offsetBoxes(ny, wy);
  const cols = offsetBoxes(nx, wx);
  return {
    rowBox: rows.boxOf,
    rowBoxes: rows.ranges,
    colBox: cols.boxOf,
    colBoxes: cols.ranges,
    fullBox: fullBoxOf(rows.ranges, cols.ranges, wy, wx),
  };
}

/**
 * The (row box, column box) in which every window offset fits, i.e. that of the interior samples,
 * or null when no sample sees every window (offsetBoxes ranges; each range occurs once).
 */
function fullBoxOf(
  rowBoxes: Int32Array,
  colBoxes: Int32Array,
  wy: number,
  wx: number,
): { ry: number; rx: number } | null {
  const full = (ranges: Int32Array, w: number) => {
    for (let i = 0; i < ranges.length; i += 2) if (ranges[i] === 0 && ranges[i + 1] === w - 1) return i / 2;
    return -1;
  };
  const ry = full(rowBoxes, wy);
  const rx = full(colBoxes, wx);
  return ry < 0 || rx < 0 ? null : { ry, rx };
}

/**
 * spectrum ← the DFT of row `index` (byRows) or column `index` of the ny×nx array z, copied into
 * `line` (the plan's length) first.
 */
export function transformLine(
  spectrum: Float64Array,
  line: Float64Array,
  z: Float64Array,
  index: number,
  byRows: boolean,
  nx: number,
  plan: FftPlan,
): void {
  const length = line.length / 2;
  for (let e = 0; e < length; e++) {
    const src = 2 * (byRows ? index * nx + e : e * nx + index);
    line[2 * e] = z[src];
    line[2 * e + 1] = z[src + 1];
  }
  plan.forward(spectrum, line);
}

/**
 * corner[i, j] = z[(vy + i) mod ny, (vx + j) mod nx] for i < 2wy−2, j < 2wx−2 (vy = ny − wy + 1,
 * vx = nx − wx + 1): the block where the row and column wrap bands of z meet.
 */
export function gatherCorner(
  corner: Float64Array,
  z: Float64Array,
  nx: number,
  ny: number,
  wx: number,
  wy: number,
): void {
  const cy = 2 * wy - 2;
  const cx = 2 * wx - 2;
  const vy = ny - wy + 1;
  const vx = nx - wx + 1;
  for (let i = 0; i < cy; i++) {
    const row = (vy + i) % ny;
    for (let j = 0; j < cx; j++) {
      const src = 2 * (row * nx + ((vx + j) % nx));
      corner[2 * (i * cx + j)] = z[src];
      corner[2 * (i * cx + j) + 1] = z[src + 1];
    }
  }
}

/**
 * target[a, b] += Σ_{t∈[0,wy−1)×[0,wx−1)} conj(u[t+a]) v[t+b] over window offsets a, b (n×n, n = wy·wx),
 * u and v the (2wy−2)×(2wx−2) corner blocks at `uAt` and `vAt` of `corners`; only b ≥ a when
 * `upper` (a Hermitian gram's other half follows by symmetry).
 */
export function addCornerCorrelation(
  target: Float64Array,
  corners: Float64Array,
  uAt: number,
  vAt: number,
  wx: number,
  wy: number,
  upper: boolean,
): void {
  const n = wx * wy;
  const cx = 2 * wx - 2;
  for (let a = 0; a < n; a++) {
    const ay = Math.floor(a / wx);
    const ax = a - ay * wx;
    for (let b = upper ? a : 0; b < n; b++) {
      const by = Math.floor(b / wx);
      const bx = b - by * wx;
      let re = 0;
      let im = 0;
      for (let ty = 0; ty < wy - 1; ty++) {
        let i = uAt + 2 * ((ty + ay) * cx + ax);
        let j = vAt + 2 * ((ty + by) * cx + bx);
        for (let tx = 0; tx < wx - 1; tx++, i += 2, j += 2) {
          re += corners[i] * corners[j] + corners[i + 1] * corners[j + 1];
          im += corners[i] * corners[j + 1] - corners[i + 1] * corners[j];
        }
      }
      target[2 * (a * n + b)] += re;
      target[2 * (a * n + b) + 1] += im;
    }
  }
}

/**
 * For each position along one axis of length `length` (window `w`), the range [b0, b1] of window
 * offsets whose window still fits; positions with the same range share one box index.
 */
function offsetBoxes(length: number, w: number): { boxOf: Int32Array; ranges: Int32Array } {
  const boxOf = new Int32Array(length);
  const found: number[] = [];
  for (let q = 0; q < length; q++) {
    const b0 = Math.max(0, q - (length - w));
    const b1 = Math.min(w - 1, q);
    let index = -1;
    for (let i = 0; i < found.length; i += 2) {
      if (found[i] === b0 && found[i + 1] === b1) {
        index = i / 2;
        break;
      }
    }
    if (index < 0) {
      index = found.length / 2;
      found.push(b0, b1);
    }
    boxOf[q] = index;
  }
  return { boxOf, ranges: Int32Array.from(found) };
}

/**
 * target[dy, dx] = (1/N) Σ_row rowLags[row, dx] e^(+i2π row·dy/ny) for |dy| < wy, |dx| < wx: the
 * column direction of a correlation read off a power spectrum, as a direct sum over the rows
 * (rowLags holds each row's lags dx, 2wx−1 per row; twiddleY = twiddles(ny)).
 */
export function lagsOverRows(
  target: Float64Array,
  rowLags: Float64Array,
  nx: number,
  ny: number,
  wx: number,
  wy: number,
  twiddleY: Float64Array,
): void {
  const lx = 2 * wx - 1;
  const scale = 1 / (nx * ny);
  for (let dy = -(wy - 1); dy < wy; dy++) {
    // e^(+i2π ky·dy/ny) = twiddleY[−ky·dy mod ny].
    const step = ((-dy % ny) + ny) % ny;
    for (let dx = -(wx - 1); dx < wx; dx++) {
      let re = 0;
      let im = 0;
      let t = 0;
      for (let row = 0; row < ny; row++) {
        const qr = rowLags[2 * (row * lx + dx + wx - 1)];
        const qi = rowLags[2 * (row * lx + dx + wx - 1) + 1];
        const wr = twiddleY[2 * t];
        const wi = twiddleY[2 * t + 1];
        re += qr * wr - qi * wi;
        im += qr * wi + qi * wr;
        t += step;
        if (t >= ny) t -= ny;
      }
      target[2 * ((dy + wy - 1) * lx + dx + wx - 1)] = re * scale;
      target[2 * ((dy + wy - 1) * lx + dx + wx - 1) + 1] = im * scale;
    }
  }
}

/**
 * projector ← Σ_{k<rank} v_k v_kᴴ (n×n, interleaved row-major) from the eigenvectors in the columns
 * of `vectors` (as HermitianEigenSolver leaves them); Hermitian, so the lower half is mirrored.
 */
export function rankProjector(projector: Float64Array, vectors: Float64Array, n: number, rank: number): void {
  projector.fill(0);
  for (let a = 0; a < n; a++) {
    for (let b = a; b < n; b++) {
      let re = 0;
      let im = 0;
      for (let k = 0; k < rank; k++) {
        const ur = vectors[2 * (a * n + k)];
        const ui = vectors[2 * (a * n + k) + 1];
        const vr = vectors[2 * (b * n + k)];
        const vi = -vectors[2 * (b * n + k) + 1];
        re += ur * vr - ui * vi;
        im += ur * vi + ui * vr;
      }
      projector[2 * (a * n + b)] = re;
      projector[2 * (a * n + b) + 1] = im;
      projector[2 * (b * n + a)] = re;
      projector[2 * (b * n + a) + 1] = -im;
    }
  }
}

/**
 * line += conj(conj(R)·S) over `length` complex entries, R and S the spectra at offsets r and s of
 * `store`: the band correlations accumulate the conjugated cross-spectrum, so one forward DFT and
 * a conjugation give the inverse DFT.
 */
export function addConjugatedCrossSpectrum(
  line: Float64Array,
  store: Float64Array,
  r: number,
  s: number,
  length: number,
): void {
  for (let f = 0; f < 2 * length; f += 2) {
    const rr = store[r + f];
    const ri = store[r + f + 1];
    const sr = store[s + f];
    const si = store[s + f + 1];
    line[f] += rr * sr + ri * si;
    line[f + 1] -= rr * si - ri * sr;
  }
}
