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
  private readonly prefix: Float64Array;
  /** Window-offset boxes per row / column position (see offsetBoxes). */
  private readonly rowBox: Int32Array;
  private readonly rowBoxes: Int32Array;
  private readonly colBox: Int32Array;
  private readonly colBoxes: Int32Array;
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
    this.prefix = new Float64Array(2 * (nx + 1) * (ny + 1));
    const rows = offsetBoxes(ny, wy);
    const cols = offsetBoxes(nx, wx);
    this.rowBox = rows.boxOf;
    this.rowBoxes = rows.ranges;
    this.colBox = cols.boxOf;
    this.colBoxes = cols.ranges;
    this.kernels = new Float64Array(
      2 * (2 * wx - 1) * (2 * wy - 1) * (rows.ranges.length / 2) * (cols.ranges.length / 2),
    );
  }

  /**
   * gram ← Σ_z H(z)ᴴ H(z) over the given arrays: G[a,b] = Σ_{p∈V} conj(z[p+a]) z[p+b].
   * For each lag d = b − a one product image conj(z[q]) z[q+d] and its 2-D prefix sum give every
   * entry with that lag as one rectangle sum over q ∈ a + V.
   */
  gram(gram: Float64Array, arrays: readonly Float64Array[]): void {
    const { nx, ny, wx, wy, size, prefix } = this;
    const stride = nx + 1;
    const vy = ny - wy + 1;
    const vx = nx - wx + 1;
    const z0 = arrays[0];
    if (arrays.length < 1 || arrays.length > 2) throw new RangeError('gram takes one or two arrays');
    const z1 = arrays.length > 1 ? arrays[1] : undefined;
    for (let dy = 0; dy < wy; dy++) {
      for (let dx = -(wx - 1); dx < wx; dx++) {
        if (dy === 0 && dx < 0) continue;
        // prefix[(r+1)·stride + (c+1)] = Σ_{r' ≤ r, c' ≤ c} conj(z[r',c']) z[r'+dy, c'+dx]
        // (terms whose partner q + d falls outside the grid are zero; no rectangle reads them).
        const c0 = Math.max(0, -dx);
        const c1 = Math.min(nx, nx - dx);
        for (let r = 0; r < ny; r++) {
          let rowRe = 0;
          let rowIm = 0;
          const out = 2 * ((r + 1) * stride);
          const above = 2 * (r * stride);
          prefix[out] = 0;
          prefix[out + 1] = 0;
          let c = 0;
          if (r + dy < ny) {
            for (; c < c0; c++) {
              const o = out + 2 * (c + 1);
              prefix[o] = prefix[above + 2 * (c + 1)];
              prefix[o + 1] = prefix[above + 2 * (c + 1) + 1];
            }
            const offset = 2 * (dy * nx + dx);
            for (; c < c1; c++) {
              const i = 2 * (r * nx + c);
              const j = i + offset;
              let ar = z0[i];
              let ai = z0[i + 1];
              let br = z0[j];
              let bi = z0[j + 1];
              rowRe += ar * br + ai * bi;
              rowIm += ar * bi - ai * br;
              if (z1 !== undefined) {
                ar = z1[i];
                ai = z1[i + 1];
                br = z1[j];
                bi = z1[j + 1];
                rowRe += ar * br + ai * bi;
                rowIm += ar * bi - ai * br;
              }
              const o = out + 2 * (c + 1);
              prefix[o] = prefix[above + 2 * (c + 1)] + rowRe;
              prefix[o + 1] = prefix[above + 2 * (c + 1) + 1] + rowIm;
            }
          }
          for (; c < nx; c++) {
            const o = out + 2 * (c + 1);
            prefix[o] = prefix[above + 2 * (c + 1)] + rowRe;
            prefix[o + 1] = prefix[above + 2 * (c + 1) + 1] + rowIm;
          }
        }
        for (let ay = 0; ay + dy < wy; ay++) {
          for (let ax = Math.max(0, -dx); ax < wx && ax + dx < wx; ax++) {
            // rows ay … ay+vy−1, cols ax … ax+vx−1
            const k11 = 2 * ((ay + vy) * stride + ax + vx);
            const k01 = 2 * (ay * stride + ax + vx);
            const k10 = 2 * ((ay + vy) * stride + ax);
            const k00 = 2 * (ay * stride + ax);
            const re = prefix[k11] - prefix[k01] - prefix[k10] + prefix[k00];
            const im = prefix[k11 + 1] - prefix[k01 + 1] - prefix[k10 + 1] + prefix[k00 + 1];
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
  }

  /**
   * out ← H†(H(z) Π): the rank projection of every window followed by averaging each k-space
   * sample over the windows that contain it (the adjoint of the lifting divided by the count).
   */
  projectAverage(out: Float64Array, z: Float64Array): void {
    const { nx, ny, wx, wy, kernels, rowBoxes, colBoxes, rowBox, colBox } = this;
    const kw = 2 * wx - 1;
    const kernelSize = 2 * kw * (2 * wy - 1);
    const nCol = colBoxes.length / 2;
    for (let qy = 0; qy < ny; qy++) {
      const ry = rowBox[qy];
      const rowCount = rowBoxes[2 * ry + 1] - rowBoxes[2 * ry] + 1;
      const dy0 = Math.max(-(wy - 1), -qy);
      const dy1 = Math.min(wy - 1, ny - 1 - qy);
      for (let qx = 0; qx < nx; qx++) {
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
            const zr = z[zRow + 2 * dx];
            const zi = z[zRow + 2 * dx + 1];
            const kr = kernels[kRow + 2 * dx];
            const ki = kernels[kRow + 2 * dx + 1];
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
