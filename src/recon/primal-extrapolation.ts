/**
 * The over-relaxation step of Chambolle & Pock 2011 with θ = 1, x̄ = x + (x − x_old), and the
 * relative change ‖x − x_old‖/‖x‖ (‖x − x_old‖ when x = 0) the solvers stop on, in one pass.
 */
export function extrapolate(xBar: Float64Array, x: Float64Array, xOld: Float64Array): number {
  let diff = 0;
  let norm = 0;
  for (let i = 0; i < x.length; i++) {
    const v = x[i];
    const dv = v - xOld[i];
    diff += dv * dv;
    norm += v * v;
    xBar[i] = v + dv;
  }
  return norm > 0 ? Math.sqrt(diff / norm) : Math.sqrt(diff);
}
