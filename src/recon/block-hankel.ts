import { fft2c, ifft2c } from '../core/centered-fft.ts';
import { type ComplexImage, createComplexImage } from '../core/complex-image.ts';

/**
 * Block-Hankel lifting of a ny×nx complex k-space with a wy×wx window, without forming the matrix.
 * Row p of H(z) is the window at p = (py, px), p ∈ V = [0, ny−wy]×[0, nx−wx] (windows fully inside),
 * column a = (ay, ax) ∈ W = [0, wy)×[0, wx) holds z[p + a]; column index a = ay·wx + ax.
 * Every operation here costs O(N·(2w−1)²) time and O(N) memory, never a dense (N × w²) matrix.
 * The Gram matrix sums the products of one or two lifted arrays (two for the stacked derivative weighting).
 */
export class BlockHankel {
  readonly nx: number;
  readonly ny: number;
  readonly wx: number;
  readonly wy: number;
  /** Window size n = wy·wx: the Gram matrix is n×n. */
  readonly size: number;
  /** Row boundaries 0…wy−1, vy…vy+wy−1 and column boundaries likewise, where rectangle corners fall. */
  private readonly rowBounds: Int32Array;
  private readonly colBounds: Int32Array;
  /** Position of a boundary value in rowBounds / colBounds. */
  private readonly rowSlot: Int32Array;
  private readonly colSlot: Int32Array;
  /** S(rowBound_i, colBound_j) per lag, interleaved complex, and the running column accumulators. */
  private readonly cornerSums: Float64Array;
  private readonly columnSums: Float64Array;
  /** Window-offset boxes per row / column position (see offsetBoxes). */
  private readonly rowBox: Int32Array;
  private readonly rowBoxes: Int32Array;
  private readonly colBox: Int32Array;
  private readonly colBoxes: Int32Array;
  /** The (row box, column box) of interior samples, or null when no sample sees every window. */
  private readonly fullBox: { ry: number; rx: number } | null;
  /** Image-domain multiplier of the interior kernel and FFT scratch (see projectAverage). */
  private readonly multiplier: ComplexImage;
  private readonly scratch: ComplexImage;
  /** Averaging kernels K_box[d], d ∈ [−(wy−1), wy−1]×[−(wx−1), wx−1], one per (row box, column box). */
  private readonly kernels: Float64Array;

  constructor(nx: number, ny: number, wx: number, wy: number) {
    if (wx < 1 || wy < 1 || wx > nx || wy > ny)
      throw new RangeError(`window ${wy}×${wx} must fit in ${ny}×${nx}`);
    this.nx = nx;
    this.ny = ny;
    this.wx = wx;
    this.wy = wy;
    this.size = wx * wy;
    const vy = ny - wy + 1;
    const vx = nx - wx + 1;
    const rowCorners = cornerBounds(wy, vy, ny);
    const colCorners = cornerBounds(wx, vx, nx);
    this.rowBounds = rowCorners.bounds;
    this.rowSlot = rowCorners.slot;
    this.colBounds = colCorners.bounds;
    this.colSlot = colCorners.slot;
    this.cornerSums = new Float64Array(2 * this.rowBounds.length * this.colBounds.length);
    this.columnSums = new Float64Array(2 * this.colBounds.length);
    const rows = offsetBoxes(ny, wy);
    const cols = offsetBoxes(nx, wx);
    this.rowBox = rows.boxOf;
    this.rowBoxes = rows.ranges;
    this.colBox = cols.boxOf;
    this.colBoxes = cols.ranges;
    let ry = -1;
    let rx = -1;
    for (let i = 0; i < this.rowBoxes.length; i += 2) {
      if (this.rowBoxes[i] === 0 && this.rowBoxes[i + 1] === wy - 1) ry = i / 2;
    }
    for (let i = 0; i < this.colBoxes.length; i += 2) {
      if (this.colBoxes[i] === 0 && this.colBoxes[i + 1] === wx - 1) rx = i / 2;
    }
    this.fullBox = ry < 0 || rx < 0 ? null : { ry, rx };
    this.multiplier = createComplexImage(nx, ny);
    this.scratch = createComplexImage(nx, ny);
    this.kernels = new Float64Array(
      2 * (2 * wx - 1) * (2 * wy - 1) * (rows.ranges.length / 2) * (cols.ranges.length / 2),
    );
  }

  /**
   * gram ← Σ_z H(z)ᴴ H(z) over the given arrays: G[a,b] = Σ_{p∈V} conj(z[p+a]) z[p+b].
   * For each lag d = b − a, every entry with that lag is a rectangle sum over q ∈ a + V of the
   * product image P_d[q] = conj(z[q]) z[q+d]. The rectangles' corners lie on 2·wy row and 2·wx
   * column boundaries only, so one pass over P_d keeps row prefix sums at those columns and
   * accumulates them down the rows: S(r, c) = Σ_{r' < r, c' < c} P_d, read at the boundaries.
   */
  gram(gram: Float64Array, arrays: readonly Float64Array[]): void {
    const { nx, ny, wx, wy, size, rowBounds, colBounds, rowSlot, colSlot, cornerSums, columnSums } = this;
    const vy = ny - wy + 1;
    const vx = nx - wx + 1;
    const nc = colBounds.length;
    if (arrays.length < 1 || arrays.length > 2) throw new RangeError('gram takes one or two arrays');
    const z0 = arrays[0];
    const z1 = arrays.length > 1 ? arrays[1] : z0;
    const weight1 = arrays.length > 1 ? 1 : 0;
    for (let dy = 0; dy < wy; dy++) {
      for (let dx = -(wx - 1); dx < wx; dx++) {
        if (dy === 0 && dx < 0) continue;
        const c0 = Math.max(0, -dx);
        const c1 = Math.min(nx, nx - dx);
        const offset = 2 * (dy * nx + dx);
        columnSums.fill(0);
        let nextRow = 0;
        // Row r contributes to S(r', ·) for r' > r; store S at each row boundary as it is reached.
        for (let r = 0; r <= ny; r++) {
          if (nextRow < rowBounds.length && rowBounds[nextRow] === r) {
            cornerSums.set(columnSums, 2 * nc * nextRow);
            nextRow++;
          }
          if (r === ny || r + dy >= ny) continue;
          let rowRe = 0;
          let rowIm = 0;
          let j = 0;
          while (j < nc && colBounds[j] <= c0) {
            j++;
          }
          const rowStart = 2 * r * nx;
          if (weight1 === 0) {
            for (let c = c0; c < c1; c++) {
              const i = rowStart + 2 * c;
              const k = i + offset;
              const ar = z0[i];
              const ai = z0[i + 1];
              const br = z0[k];
              const bi = z0[k + 1];
              rowRe += ar * br + ai * bi;
              rowIm += ar * bi - ai * br;
              while (j < nc && colBounds[j] === c + 1) {
                columnSums[2 * j] += rowRe;
                columnSums[2 * j + 1] += rowIm;
                j++;
              }
            }
          }
          for (let c = weight1 === 0 ? c1 : c0; c < c1; c++) {
            const i = rowStart + 2 * c;
            const k = i + offset;
            const ar = z0[i];
            const ai = z0[i + 1];
            const br = z0[k];
            const bi = z0[k + 1];
            const er = z1[i];
            const ei = z1[i + 1];
            const fr = z1[k];
            const fi = z1[k + 1];
            rowRe += ar * br + ai * bi + er * fr + ei * fi;
            rowIm += ar * bi - ai * br + er * fi - ei * fr;
            while (j < nc && colBounds[j] === c + 1) {
              columnSums[2 * j] += rowRe;
              columnSums[2 * j + 1] += rowIm;
              j++;
            }
          }
          // Boundaries past the last valid column see the whole row sum.
          for (; j < nc; j++) {
            columnSums[2 * j] += rowRe;
            columnSums[2 * j + 1] += rowIm;
          }
        }
        for (let ay = 0; ay + dy < wy; ay++) {
          for (let ax = Math.max(0, -dx); ax < wx && ax + dx < wx; ax++) {
            // rows ay … ay+vy−1, cols ax … ax+vx−1: corners at boundaries ay, ay+vy and ax, ax+vx.
            const r0 = rowSlot[ay];
            const r1 = rowSlot[ay + vy];
            const q0 = colSlot[ax];
            const q1 = colSlot[ax + vx];
            const k11 = 2 * (r1 * nc + q1);
            const k01 = 2 * (r0 * nc + q1);
            const k10 = 2 * (r1 * nc + q0);
            const k00 = 2 * (r0 * nc + q0);
            const re = cornerSums[k11] - cornerSums[k01] - cornerSums[k10] + cornerSums[k00];
            const im = cornerSums[k11 + 1] - cornerSums[k01 + 1] - cornerSums[k10 + 1] + cornerSums[k00 + 1];
            const a = ay * wx + ax;
            const b = (ay + dy) * wx + ax + dx;
            gram[2 * (a * size + b)] = re;
            gram[2 * (a * size + b) + 1] = im;
            gram[2 * (b * size + a)] = re;
            gram[2 * (b * size + a) + 1] = -im;
          }
        }
      }
    }
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
    const { size: n, wx, wy, kernels, rowBoxes, colBoxes } = this;
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
    kernels.fill(0);
    const kw = 2 * wx - 1;
    const kernelSize = 2 * kw * (2 * wy - 1);
    const nCol = colBoxes.length / 2;
    for (let ry = 0; ry < rowBoxes.length / 2; ry++) {
      for (let rx = 0; rx < nCol; rx++) {
        const base = (ry * nCol + rx) * kernelSize;
        for (let by = rowBoxes[2 * ry]; by <= rowBoxes[2 * ry + 1]; by++) {
          for (let bx = colBoxes[2 * rx]; bx <= colBoxes[2 * rx + 1]; bx++) {
            const b = by * wx + bx;
            for (let ay = 0; ay < wy; ay++) {
              for (let ax = 0; ax < wx; ax++) {
                const a = ay * wx + ax;
                const k = base + 2 * ((ay - by + wy - 1) * kw + (ax - bx + wx - 1));
                kernels[k] += projector[2 * (a * n + b)];
                kernels[k + 1] += projector[2 * (a * n + b) + 1];
              }
            }
          }
        }
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
    const interior = this.interiorBox();
    if (interior !== null) {
      this.convolveInterior(out, z);
      if (out2 !== undefined && z2 !== undefined) this.convolveInterior(out2, z2);
    }
    this.averageBorder(out, z, interior === null);
    if (out2 !== undefined && z2 !== undefined) this.averageBorder(out2, z2, interior === null);
  }

  /** Index of the full box (all window offsets fit) along rows and columns, or null if none. */
  private interiorBox(): { ry: number; rx: number } | null {
    return this.fullBox;
  }

  /** Image-domain multiplier √N · F_cᴴ(S k̃) of the full-box kernel (after setProjector). */
  private prepareMultiplier(): void {
    const { nx, ny, wx, wy, kernels, colBoxes, multiplier } = this;
    const box = this.interiorBox();
    if (box === null) return;
    const kw = 2 * wx - 1;
    const kernelSize = 2 * kw * (2 * wy - 1);
    const base = (box.ry * (colBoxes.length / 2) + box.rx) * kernelSize;
    const m = multiplier.data;
    m.fill(0);
    const hy = Math.floor(ny / 2);
    const hx = Math.floor(nx / 2);
    for (let dy = -(wy - 1); dy < wy; dy++) {
      const row = (((-dy + hy) % ny) + ny) % ny;
      for (let dx = -(wx - 1); dx < wx; dx++) {
        const col = (((-dx + hx) % nx) + nx) % nx;
        const k = base + 2 * ((dy + wy - 1) * kw + dx + wx - 1);
        m[2 * (row * nx + col)] += kernels[k];
        m[2 * (row * nx + col) + 1] += kernels[k + 1];
      }
    }
    ifft2c(multiplier, multiplier);
    const scale = Math.sqrt(nx * ny) / (wx * wy);
    for (let i = 0; i < m.length; i++) m[i] *= scale;
  }

  private convolveInterior(out: Float64Array, z: Float64Array): void {
    const { scratch, multiplier } = this;
    const s = scratch.data;
    const m = multiplier.data;
    s.set(z);
    ifft2c(scratch, scratch);
    for (let i = 0; i < s.length; i += 2) {
      const ar = s[i];
      const ai = s[i + 1];
      const br = m[i];
      const bi = m[i + 1];
      s[i] = ar * br - ai * bi;
      s[i + 1] = ar * bi + ai * br;
    }
    fft2c(scratch, scratch);
    out.set(s);
  }

  /** Direct box-kernel sums for the samples within w − 1 of an edge (or every sample if `all`). */
  private averageBorder(out: Float64Array, z: Float64Array, all: boolean): void {
    const { nx, ny, wx, wy, kernels, rowBoxes, colBoxes, rowBox, colBox } = this;
    const kw = 2 * wx - 1;
    const kernelSize = 2 * kw * (2 * wy - 1);
    const nCol = colBoxes.length / 2;
    for (let qy = 0; qy < ny; qy++) {
      const ry = rowBox[qy];
      const rowCount = rowBoxes[2 * ry + 1] - rowBoxes[2 * ry] + 1;
      const borderRow = all || qy < wy - 1 || qy > ny - wy;
      const dy0 = Math.max(-(wy - 1), -qy);
      const dy1 = Math.min(wy - 1, ny - 1 - qy);
      for (let qx = 0; qx < nx; qx++) {
        if (!borderRow && qx >= wx - 1 && qx <= nx - wx) {
          qx = nx - wx;
          continue;
        }
        const rx = colBox[qx];
        const count = rowCount * (colBoxes[2 * rx + 1] - colBoxes[2 * rx] + 1);
        const base = (ry * nCol + rx) * kernelSize;
        const dx0 = Math.max(-(wx - 1), -qx);
        const dx1 = Math.min(wx - 1, nx - 1 - qx);
        let re = 0;
        let im = 0;
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
        const o = 2 * (qy * nx + qx);
        out[o] = re / count;
        out[o + 1] = im / count;
      }
    }
  }
}

/** Sorted distinct corner boundaries {0…w−1} ∪ {v…v+w−1} of one axis, and value → position. */
function cornerBounds(w: number, v: number, length: number): { bounds: Int32Array; slot: Int32Array } {
  const values = new Set<number>();
  for (let i = 0; i < w; i++) {
    values.add(i);
    values.add(v + i);
  }
  const bounds = Int32Array.from([...values].sort((a, b) => a - b));
  const slot = new Int32Array(length + 1).fill(-1);
  bounds.forEach((value, i) => {
    slot[value] = i;
  });
  return { bounds, slot };
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
