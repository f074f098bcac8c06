import type { RadialTrajectory } from '../../sampling/trajectories/radial-trajectory.ts';

/**
 * Analytic density compensation for full spokes (common practice): the k-space area each sample
 * stands for, in (cycles per FOV)², so that Σ w·(…) is a Riemann sum with the Cartesian grid's unit
 * cell. A ring of radius r carries 2·S samples of S spokes, spacing Δk along the spoke, so
 * w(r) = π·r·Δk/S (the ramp, ∝ |k|); the centre disc of radius Δk/2 is shared by the S spoke
 * centres, so w(0) = π·(Δk/2)²/S = w(Δk)/4. Exact for uniform angles; for golden-angle orders it
 * is the usual approximation (the angular gaps are then not all equal).
 */
export function radialRampWeights(trajectory: RadialTrajectory): Float64Array {
  const { kx, ky, readouts: spokes, readoutSpacing: dk } = trajectory;
  const weights = new Float64Array(kx.length);
  const centre = (Math.PI * dk * dk) / (4 * spokes);
  for (let p = 0; p < kx.length; p++) {
    const r = Math.hypot(kx[p], ky[p]);
    weights[p] = r < 1e-12 * dk ? centre : (Math.PI * r * dk) / spokes;
  }
  return weights;
}
