import { ifft2c } from '../core/centered-fft.ts';
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

/** The image circularly shifted by (rows, cols): out[(i + rows) mod ny][(j + cols) mod nx] = in[i][j]. */
function rolled(image: ComplexImage, rows: number, cols: number): ComplexImage {
  const { nx, ny } = image;
  const out = createComplexImage(nx, ny);
  for (let i = 0; i < ny; i++) {
    const target = (((i + rows) % ny) + ny) % ny;
    for (let j = 0; j < nx; j++) {
      const p = 2 * (target * nx + ((((j + cols) % nx) + nx) % nx));
      const q = 2 * (i * nx + j);
      out.data[p] = image.data[q];
      out.data[p + 1] = image.data[q + 1];
    }
  }
  return out;
}

/**
 * The summed exact grid k-space of a set of lesions and each lesion's template t = ifft2c(its grid
 * k-space), the transform evaluated once per kind of lesion (shape, diameter, amplitude) at the
 * centre pixel. A lesion elsewhere differs by the shift theorem's phase e^(−i2π(kx·Δx + ky·Δy)),
 * separable on the grid, and, its shift being whole pixels, its template is the centred one rolled by
 * those pixels (the grid phase is exactly a circular shift of the centred DFT).
 */
export function lesionKspaceAndTemplates(
  lesions: readonly Lesion[],
  nx: number,
  ny: number,
): { kspace: ComplexImage; templates: ComplexImage[] } {
  const kxAxis = Float64Array.from({ length: nx }, (_, u) => gridKx(u, nx));
  const kyAxis = Float64Array.from({ length: ny }, (_, v) => gridKy(v, ny));
  const cy = Math.floor(ny / 2);
  const cx = Math.floor(nx / 2);
  const kinds = new Map<string, { kspace: ComplexImage; template: ComplexImage }>();
  const kspace = createComplexImage(nx, ny);
  const templates = lesions.map((lesion) => {
    const key = `${lesion.shape}|${lesion.diameter}|${lesion.amplitude}`;
    let kind = kinds.get(key);
    if (!kind) {
      const centred = lesionGridKspace([{ ...lesion, row: cy, col: cx }], nx, ny);
      kind = { kspace: centred, template: ifft2c(centred) };
      kinds.set(key, kind);
    }
    const col = axisPhasors(kxAxis, pixelX(lesion.col, nx) - pixelX(cx, nx));
    const row = axisPhasors(kyAxis, pixelY(lesion.row, ny) - pixelY(cy, ny));
    const k = kind.kspace.data;
    for (let v = 0; v < ny; v++) {
      const rr = row[2 * v];
      const ri = row[2 * v + 1];
      for (let u = 0; u < nx; u++) {
        const pr = rr * col[2 * u] - ri * col[2 * u + 1];
        const pi = rr * col[2 * u + 1] + ri * col[2 * u];
        const p = 2 * (v * nx + u);
        kspace.data[p] += k[p] * pr - k[p + 1] * pi;
        kspace.data[p + 1] += k[p] * pi + k[p + 1] * pr;
      }
    }
    return rolled(kind.template, lesion.row - cy, lesion.col - cx);
  });
  return { kspace, templates };
}
