import { type CoilMaps, createMultiCoilArray } from '../encoding/index.ts';
import { pixelCoordinates } from './pixel-coordinates.ts';
import { ringPlacement } from './ring.ts';

export interface GaussianArrayGeometry {
  count: number;
  /** Standard deviation w of each profile, phantom units. */
  width: number;
  ringRadius: number | readonly [number, number];
  startAngleDeg: number;
}

/**
 * Gaussian-profile sensitivities S_c(r) = exp(−|r − r_c|²/(2w²))·e^(iφ_c), centres r_c on the ring and
 * the phase φ_c equal to the coil's angle on the ring, so neighbours differ in phase as loop maps do
 * (a common simulation model; common practice).
 */
export function gaussianArrayMaps(geometry: GaussianArrayGeometry, nx: number, ny: number): CoilMaps {
  const n = nx * ny;
  const { x, y } = pixelCoordinates(nx, ny);
  const ring = ringPlacement(geometry.count, geometry.ringRadius, geometry.startAngleDeg);
  const maps = createMultiCoilArray(geometry.count, nx, ny);
  const inv2w2 = 1 / (2 * geometry.width * geometry.width);
  for (let c = 0; c < geometry.count; c++) {
    const pr = Math.cos(ring.angle[c]);
    const pi = Math.sin(ring.angle[c]);
    const base = 2 * c * n;
    for (let i = 0; i < n; i++) {
      const dx = x[i] - ring.x[c];
      const dy = y[i] - ring.y[c];
      const g = Math.exp(-(dx * dx + dy * dy) * inv2w2);
      maps.data[base + 2 * i] = g * pr;
      maps.data[base + 2 * i + 1] = g * pi;
    }
  }
  return maps;
}
