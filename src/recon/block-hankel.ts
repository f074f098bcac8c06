/**
 * Block-Hankel lifting of a ny×nx complex k-space with a wy×wx window, without forming the matrix.
 * Row p of H(z) is the window at p = (py, px), p ∈ V = [0, ny−wy]×[0, nx−wx] (windows fully inside),
 * column a = (ay, ax) ∈ W = [0, wy)×[0, wx) holds z[p + a]; column index a = ay·wx + ax.
 * Every operation here costs O(N·(2w−1)²) time and O(N) memory, never a dense (N × w²) matrix.
 */
export class BlockHankel {
  readonly nx: number;
  readonly ny: number;
  readonly wx: number;
  readonly wy: number;
  /** Window size n = wy·wx: the Gram matrix is n×n. */
  readonly size: number;
  private readonly prefix: Float64Array;
  /** Kernel K[d] of the rank-projection followed by averaging, d ∈ [−(wy−1), wy−1]×[−(wx−1), wx−1]. */
  private readonly kernel: Float64Array;

  constructor(nx: number, ny: number, wx: number, wy: number) {
    if (wx < 1 || wy < 1 || wx > nx || wy > ny)
      throw new RangeError(`window ${wy}×${wx} must fit in ${ny}×${nx}`);
    this.nx = nx;
    this.ny = ny;
    this.wx = wx;
    this.wy = wy;
    this.size = wx * wy;
    this.prefix = new Float64Array(2 * (nx + 1) * (ny + 1));
    this.kernel = new Float64Array(2 * (2 * wx - 1) * (2 * wy - 1));
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
    for (let dy = 0; dy < wy; dy++) {
      for (let dx = -(wx - 1); dx < wx; dx++) {
        if (dy === 0 && dx < 0) continue;
        // prefix[(r+1)·stride + (c+1)] = Σ_{r' ≤ r, c' ≤ c} conj(z[r',c']) z[r'+dy, c'+dx]
        const c0 = Math.max(0, -dx);
        const c1 = Math.min(nx, nx - dx);
        for (let r = 0; r < ny; r++) {
          let rowRe = 0;
          let rowIm = 0;
          const out = 2 * ((r + 1) * stride);
          const above = 2 * (r * stride);
          prefix[out] = 0;
          prefix[out + 1] = 0;
          const inside = r + dy < ny;
          for (let c = 0; c < nx; c++) {
            if (inside && c >= c0 && c < c1) {
              const i = 2 * (r * nx + c);
              const j = 2 * ((r + dy) * nx + c + dx);
              for (let s = 0; s < arrays.length; s++) {
                const z = arrays[s];
                const ar = z[i];
                const ai = z[i + 1];
                const br = z[j];
                const bi = z[j + 1];
                rowRe += ar * br + ai * bi;
                rowIm += ar * bi - ai * br;
              }
            }
            const o = out + 2 * (c + 1);
            prefix[o] = prefix[above + 2 * (c + 1)] + rowRe;
            prefix[o + 1] = prefix[above + 2 * (c + 1) + 1] + rowIm;
          }
        }
        for (let ay = 0; ay + dy < wy; ay++) {
          for (let ax = Math.max(0, -dx); ax < wx && ax + dx < wx; ax++) {
            // rows ay … ay+vy−1, cols ax … ax+vx−1
            const r0 = ay;
            const r1 = ay + vy;
            const q0 = ax;
            const q1 = ax + vx;
            const k11 = 2 * (r1 * stride + q1);
            const k01 = 2 * (r0 * stride + q1);
            const k10 = 2 * (r1 * stride + q0);
            const k00 = 2 * (r0 * stride + q0);
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
   * interleaved, row-major n×n) and folds it into the averaging kernel K[d] = Σ_b Π[b+d, b].
   * `projector` receives Π (n×n interleaved) for the boundary pixels.
   */
  setProjector(projector: Float64Array, vectors: Float64Array, rank: number): void {
    const { size: n, wx, wy, kernel } = this;
    projector.fill(0);
    for (let a = 0; a < n; a++) {
      for (let b = 0; b < n; b++) {
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
      }
    }
    kernel.fill(0);
    const kw = 2 * wx - 1;
    for (let a = 0; a < n; a++) {
      const ay = Math.floor(a / wx);
      const ax = a - ay * wx;
      for (let b = 0; b < n; b++) {
        const by = Math.floor(b / wx);
        const bx = b - by * wx;
        const k = 2 * ((ay - by + wy - 1) * kw + (ax - bx + wx - 1));
        kernel[k] += projector[2 * (a * n + b)];
        kernel[k + 1] += projector[2 * (a * n + b) + 1];
      }
    }
  }

  /**
   * out ← H†(H(z) Π): the rank projection of every window followed by averaging each k-space
   * sample over the windows that contain it (the adjoint of the lifting divided by the count).
   * Interior samples (covered by all n windows) use the kernel; border samples the exact sum.
   */
  projectAverage(out: Float64Array, z: Float64Array, projector: Float64Array): void {
    const { nx, ny, wx, wy, size: n, kernel } = this;
    const kw = 2 * wx - 1;
    const inv = 1 / n;
    for (let qy = 0; qy < ny; qy++) {
      const rowInterior = qy >= wy - 1 && qy <= ny - wy;
      for (let qx = 0; qx < nx; qx++) {
        const o = 2 * (qy * nx + qx);
        if (rowInterior && qx >= wx - 1 && qx <= nx - wx) {
          let re = 0;
          let im = 0;
          for (let dy = -(wy - 1); dy < wy; dy++) {
            const zRow = 2 * ((qy + dy) * nx + qx);
            const kRow = 2 * ((dy + wy - 1) * kw + wx - 1);
            for (let dx = -(wx - 1); dx < wx; dx++) {
              const zr = z[zRow + 2 * dx];
              const zi = z[zRow + 2 * dx + 1];
              const kr = kernel[kRow + 2 * dx];
              const ki = kernel[kRow + 2 * dx + 1];
              re += kr * zr - ki * zi;
              im += kr * zi + ki * zr;
            }
          }
          out[o] = re * inv;
          out[o + 1] = im * inv;
          continue;
        }
        // Border: windows p = q − b with p ∈ V.
        const by0 = Math.max(0, qy - (ny - wy));
        const by1 = Math.min(wy - 1, qy);
        const bx0 = Math.max(0, qx - (nx - wx));
        const bx1 = Math.min(wx - 1, qx);
        let re = 0;
        let im = 0;
        for (let by = by0; by <= by1; by++) {
          for (let bx = bx0; bx <= bx1; bx++) {
            const b = by * wx + bx;
            const py = qy - by;
            const px = qx - bx;
            for (let ay = 0; ay < wy; ay++) {
              const zRow = 2 * ((py + ay) * nx + px);
              for (let ax = 0; ax < wx; ax++) {
                const a = ay * wx + ax;
                const pr = projector[2 * (a * n + b)];
                const pi = projector[2 * (a * n + b) + 1];
                const zr = z[zRow + 2 * ax];
                const zi = z[zRow + 2 * ax + 1];
                re += pr * zr - pi * zi;
                im += pr * zi + pi * zr;
              }
            }
          }
        }
        const count = (by1 - by0 + 1) * (bx1 - bx0 + 1);
        out[o] = re / count;
        out[o + 1] = im / count;
      }
    }
  }
}
