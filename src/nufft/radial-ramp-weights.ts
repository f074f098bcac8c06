import type { RadialTrajectory } from '../../sampling/trajectories/radial-trajectory.ts';

/**
 * Angular share of each full spoke in radians: half the gap to the previous plus half the gap to
 * the next spoke, with the angles taken modulo π (a full spoke at θ is the line at θ + π too) and
 * the gap across 0/π closing the circle. The shares add up to π; uniform angles give π/S each.
 */
export function spokeAngularShares(angles: Float64Array): Float64Array {
  const count = angles.length;
  const shares = new Float64Array(count);
  if (count === 1) {
    shares[0] = Math.PI;
    return shares;
  }
  const order = Array.from({ length: count }, (_, s) => s);
  const folded = Float64Array.from(angles, (t) => t - Math.PI * Math.floor(t / Math.PI));
  order.sort((a, b) => folded[a] - folded[b]);
  for (let r = 0; r < count; r++) {
    const previous = folded[order[(r - 1 + count) % count]] - (r === 0 ? Math.PI : 0);
    const next = folded[order[(r + 1) % count]] + (r === count - 1 ? Math.PI : 0);
    shares[order[r]] = (next - previous) / 2;
  }
  return shares;
}

/**
 * Analytic density compensation for full spokes (common practice): the k-space area each sample
 * stands for, in (cycles per FOV)², so that Σ w·(…) is a Riemann sum with the Cartesian grid's unit
 * cell. A sample at radius r on a spoke with angular share Δθ covers r·Δk·Δθ (Δk the spacing along
 * the spoke), so w ∝ |k| (the ramp); with S uniform spokes Δθ = π/S and w(r) = π·r·Δk/S. The
 * centre disc of radius Δk/2 is shared by the S spoke centres, so w(0) = π·(Δk/2)²/S, which is
 * w(Δk)/4 for uniform spokes. For golden-angle orders the shares follow the actual angular gaps.
 */
export function radialRampWeights(trajectory: RadialTrajectory): Float64Array {
  const { kx, ky, readouts: spokes, samplesPerReadout: samples, readoutSpacing: dk } = trajectory;
  const shares = spokeAngularShares(trajectory.angles);
  const weights = new Float64Array(kx.length);
  const centre = (Math.PI * dk * dk) / (4 * spokes);
  for (let s = 0; s < spokes; s++) {
    for (let j = 0; j < samples; j++) {
      const p = s * samples + j;
      const r = Math.hypot(kx[p], ky[p]);
      weights[p] = r < 1e-12 * dk ? centre : r * dk * shares[s];
    }
  }
  return weights;
}
