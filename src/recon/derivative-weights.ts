/**
 * The k-space weights of the 'gradient' lifting: kx, ky in grid units (u − ⌊nx/2⌋, ⌊ny/2⌋ − v),
 * the spectral factor of ∂/∂x and ∂/∂y up to i2π/2 (Ongie & Jacob 2016), and 1/(kx² + ky²) for the
 * least-squares recovery (kx·ẑx + ky·ẑy)/(kx² + ky²), 0 at the DC sample where both vanish.
 */
export function derivativeWeights(
  nx: number,
  ny: number,
): {
  weightX: Float64Array;
  weightY: Float64Array;
  inverseWeight: Float64Array;
  /** weightX along one row (it depends on the column u only) and weightY down one column (row v only). */
  columnWeight: Float64Array;
  rowWeight: Float64Array;
} {
  const n = nx * ny;
  const weightX = new Float64Array(n);
  const weightY = new Float64Array(n);
  const inverseWeight = new Float64Array(n);
  const cx = Math.floor(nx / 2);
  const cy = Math.floor(ny / 2);
  for (let v = 0; v < ny; v++) {
    for (let u = 0; u < nx; u++) {
      const i = v * nx + u;
      weightX[i] = u - cx;
      weightY[i] = cy - v;
      const w2 = weightX[i] * weightX[i] + weightY[i] * weightY[i];
      inverseWeight[i] = w2 > 0 ? 1 / w2 : 0;
    }
  }
  return {
    weightX,
    weightY,
    inverseWeight,
    columnWeight: weightX.slice(0, nx),
    rowWeight: Float64Array.from({ length: ny }, (_, v) => weightY[v * nx]),
  };
}
