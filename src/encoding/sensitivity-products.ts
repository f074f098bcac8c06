import type { CoilMaps } from './multi-coil.ts';

/**
 * target[2·offset …] = S_c ⊙ x for coil `coil` of the maps (interleaved complex, one plane of
 * ny·nx pixels): the image a coil sees. Shared by the Cartesian and the trajectory operators.
 */
export function sensitivityProduct(
  maps: CoilMaps,
  coil: number,
  x: Float64Array,
  target: Float64Array,
  offset: number,
): void {
  const n = maps.nx * maps.ny;
  const s = maps.data;
  const base = 2 * coil * n;
  const t = 2 * offset;
  for (let i = 0; i < 2 * n; i += 2) {
    const sr = s[base + i];
    const si = s[base + i + 1];
    const xr = x[i];
    const xi = x[i + 1];
    target[t + i] = sr * xr - si * xi;
    target[t + i + 1] = sr * xi + si * xr;
  }
}

/** target += conj(S_c) ⊙ image: one coil's share of the adjoint's coil combination. */
export function addConjugateSensitivityProduct(
  maps: CoilMaps,
  coil: number,
  image: Float64Array,
  target: Float64Array,
): void {
  const n = maps.nx * maps.ny;
  const s = maps.data;
  const base = 2 * coil * n;
  for (let i = 0; i < 2 * n; i += 2) {
    const sr = s[base + i];
    const si = s[base + i + 1];
    const zr = image[i];
    const zi = image[i + 1];
    target[i] += sr * zr + si * zi;
    target[i + 1] += sr * zi - si * zr;
  }
}

/** max over pixels of Σ_c |S_c|²: ‖x ↦ (S_c x)_c‖², the factor the maps add to a bound of ‖EᴴE‖. */
export function peakSensitivityPower(maps: CoilMaps): number {
  const n = maps.nx * maps.ny;
  let peak = 0;
  for (let i = 0; i < n; i++) {
    let sum = 0;
    for (let c = 0; c < maps.coils; c++) {
      const k = 2 * (c * n + i);
      sum += maps.data[k] ** 2 + maps.data[k + 1] ** 2;
    }
    peak = Math.max(peak, sum);
  }
  return peak;
}
