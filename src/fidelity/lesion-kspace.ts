import { type ComplexImage, createComplexImage } from '../core/complex-image.ts';
import { Ellipse } from '../phantoms/ellipse.ts';
import { gridKx, gridKy, gridScale, pixelX, pixelY } from '../phantoms/grid.ts';
import { addRowTimesColumn, axisPhasors } from '../phantoms/shape.ts';
import { gaussianSigma, type Lesion } from './lesion.ts';

/**
 * A disc lesion as a phantom shape: an ellipse with semi-axes d/nx and d/ny phantom units (a circle
 * of diameter d pixels; pixels are 2/nx × 2/ny units), centred on its pixel.
 */
export function discLesionShape(lesion: Lesion, nx: number, ny: number): Ellipse {
  return new Ellipse({
    x0: pixelX(lesion.col, nx),
    y0: pixelY(lesion.row, ny),
    a: lesion.diameter / nx,
    b: lesion.diameter / ny,
    intensity: lesion.amplitude,
  });
}

/**
 * Adds a Gaussian lesion's exact transform on the grid axes. With sx, sy its standard deviations
 * in phantom units, f = A·exp(−(x−x0)²/(2sx²) − (y−y0)²/(2sy²)) has
 *   F(k) = A·2π·sx·sy·exp(−2π²(sx²kx² + sy²ky²))·e^(−i2π(kx x0 + ky y0))
 * (the Gaussian pair and the shift theorem; any table of Fourier transforms). Separable, so it is
 * one column factor times one row factor.
 */
function addGaussianGridTransform(
  lesion: Lesion,
  kxAxis: Float64Array,
  kyAxis: Float64Array,
  out: Float64Array,
): void {
  const nx = kxAxis.length;
  const ny = kyAxis.length;
  const sigmaPx = gaussianSigma(lesion.diameter);
  const sx = (sigmaPx * 2) / nx;
  const sy = (sigmaPx * 2) / ny;
  const col = axisPhasors(kxAxis, pixelX(lesion.col, nx));
  const row = axisPhasors(kyAxis, pixelY(lesion.row, ny));
  const scale = lesion.amplitude * 2 * Math.PI * sx * sy;
  for (let u = 0; u < nx; u++) {
    const g = scale * Math.exp(-2 * Math.PI * Math.PI * sx * sx * kxAxis[u] * kxAxis[u]);
    col[2 * u] *= g;
    col[2 * u + 1] *= g;
  }
  for (let v = 0; v < ny; v++) {
    const g = Math.exp(-2 * Math.PI * Math.PI * sy * sy * kyAxis[v] * kyAxis[v]);
    const rr = row[2 * v] * g;
    const ri = row[2 * v + 1] * g;
    if (rr === 0 && ri === 0) continue;
    addRowTimesColumn(out, 2 * v * nx, col, rr, ri);
  }
}

/**
 * Exact k-space of a set of lesions on the ny×nx grid, scaled like phantomGridKspace (continuous
 * transform × √(nx·ny)/4, DEVELOPERS.md "Numerical conventions"), so adding it to a phantom's grid
 * k-space inserts the lesions without leaving the analytic model.
 */
export function lesionGridKspace(lesions: readonly Lesion[], nx: number, ny: number): ComplexImage {
  const image = createComplexImage(nx, ny);
  const kxAxis = Float64Array.from({ length: nx }, (_, u) => gridKx(u, nx));
  const kyAxis = Float64Array.from({ length: ny }, (_, v) => gridKy(v, ny));
  for (const lesion of lesions) {
    if (lesion.shape === 'disc') discLesionShape(lesion, nx, ny).addGridTransform(kxAxis, kyAxis, image.data);
    else addGaussianGridTransform(lesion, kxAxis, kyAxis, image.data);
  }
  const scale = gridScale(nx, ny);
  for (let i = 0; i < image.data.length; i++) image.data[i] *= scale;
  return image;
}
