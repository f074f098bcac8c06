import { pixelX, pixelY } from '../phantoms/index.ts';

/** Phantom-frame (x, y) of every pixel centre, row-major ny·nx (DEVELOPERS.md "Numerical conventions"). */
export function pixelCoordinates(nx: number, ny: number): { x: Float64Array; y: Float64Array } {
  const x = new Float64Array(nx * ny);
  const y = new Float64Array(nx * ny);
  for (let i = 0; i < ny; i++) {
    const yi = pixelY(i, ny);
    for (let j = 0; j < nx; j++) {
      x[i * nx + j] = pixelX(j, nx);
      y[i * nx + j] = yi;
    }
  }
  return { x, y };
}
