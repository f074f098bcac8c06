import type { ComplexImage } from '../core/complex-image.ts';
import type { CoilSamples, EncodingOperator } from '../encoding/index.ts';

/**
 * Solves (I + τ EᴴE) x = b for x by conjugate gradients (Hestenes & Stiefel 1952), the proximal
 * step of the data term ½‖E x − y‖² with b = v + τ Eᴴy. I + τEᴴE is Hermitian positive definite
 * with eigenvalues in [1, 1 + τ‖E‖²], so CG contracts the error by at least
 * (√κ − 1)/(√κ + 1), κ = 1 + τ‖E‖², per step (Golub & Van Loan, "Matrix Computations", §11.3 — from memory; docs/references.md §5.4); on an operator
 * with two distinct eigenvalues (one coil, S = 1: EᴴE = F⁻¹MF) it is exact after two steps.
 * `x` holds the warm start on entry and the solution on return. Stops when ‖b − A x‖ ≤
 * tolerance·‖b‖ or after `maxSteps`; each step costs one normal-operator product. The operator's
 * scratch and the solver's own vectors are reused across calls (not re-entrant).
 */
export class NormalProxSolver {
  private readonly operator: EncodingOperator<CoilSamples>;
  private readonly residual: Float64Array;
  private readonly direction: ComplexImage;
  private readonly product: ComplexImage;

  constructor(operator: EncodingOperator<CoilSamples>) {
    this.operator = operator;
    this.direction = operator.createImage();
    this.product = operator.createImage();
    this.residual = new Float64Array(this.direction.data.length);
  }

  /** Returns the CG steps taken. */
  solve(x: ComplexImage, b: Float64Array, tau: number, tolerance: number, maxSteps: number): number {
    const { operator, residual: r, direction: p, product: ap } = this;
    const xd = x.data;
    const pd = p.data;
    const apd = ap.data;
    const length = xd.length;
    let bb = 0;
    for (let i = 0; i < length; i++) bb += b[i] * b[i];
    const threshold = tolerance * tolerance * bb;
    operator.normal(x, ap);
    let rr = 0;
    for (let i = 0; i < length; i++) {
      const v = b[i] - xd[i] - tau * apd[i];
      r[i] = v;
      pd[i] = v;
      rr += v * v;
    }
    let steps = 0;
    while (rr > threshold && steps < maxSteps) {
      operator.normal(p, ap);
      let pap = 0;
      for (let i = 0; i < length; i++) {
        const a = pd[i] + tau * apd[i];
        apd[i] = a;
        pap += pd[i] * a;
      }
      if (!(pap > 0)) break;
      const alpha = rr / pap;
      let next = 0;
      for (let i = 0; i < length; i++) {
        xd[i] += alpha * pd[i];
        const v = r[i] - alpha * apd[i];
        r[i] = v;
        next += v * v;
      }
      const beta = next / rr;
      for (let i = 0; i < length; i++) pd[i] = r[i] + beta * pd[i];
      rr = next;
      steps++;
    }
    return steps;
  }
}
