import { describe, expect, it } from 'vitest';
import { spiralTrajectory } from '../../sampling/trajectories/spiral-trajectory.ts';
import { nrmse } from '../../src/metrics/nrmse.ts';
import { griddingReconstruction } from '../../src/nufft/gridding.ts';
import { PIPE_MENON_KERNEL, pipeMenonWeights } from '../../src/nufft/pipe-menon-weights.ts';
import { nufftPlanFor } from '../../src/nufft/plan-cache.ts';
import { real, sheppLoganReferences } from './shepp-logan-references.ts';

/**
 * Spirals have no analytic DCF here: the Pipe & Menon 1999 weights make them griddable. Modified
 * Shepp–Logan at 64² with exact k-space at the spiral points, 16 interleaves, outermost turn
 * spacing 1/FOV (Nyquist), NRMSE of magnitudes against the Cartesian and disc-limited references.
 */
const side = 64;
const { reference, discReference, inscribed, samplesOf } = sheppLoganReferences(side);

function grid(t: ReturnType<typeof spiralTrajectory>) {
  const weights = pipeMenonWeights(nufftPlanFor(t, side, side, PIPE_MENON_KERNEL));
  return real(griddingReconstruction(nufftPlanFor(t, side, side), samplesOf(t), weights));
}

describe('gridding of spirals with Pipe–Menon weights, modified Shepp–Logan 64²', () => {
  it('variable density (Kim et al. 2003, power 2): close to the disc-limited reference', () => {
    const x = grid(spiralTrajectory({ side, interleaves: 16, density: 'variable', power: 2 }));
    // Measured 0.129 (full reference) and 0.085 (disc-limited).
    expect(nrmse(x, reference)).toBeLessThan(0.15);
    expect(nrmse(x, discReference)).toBeLessThan(0.1);
  });

  it('uniform density at exactly 1/FOV: good inside the inscribed disc, corners alias', () => {
    // Turn spacing 1/FOV everywhere supports an object within the inscribed circle only, as
    // radial without readout oversampling does (gridding-shepp-logan.test.ts).
    const x = grid(spiralTrajectory({ side, interleaves: 16 }));
    // Measured 0.268 over the square, 0.116 inside the disc (against the full reference).
    expect(nrmse(x, reference)).toBeGreaterThan(0.2);
    expect(nrmse(x, reference, inscribed)).toBeLessThan(0.13);
  });

  it('R = 2 (half the interleaves) is clearly worse than Nyquist', () => {
    const nyquist = grid(spiralTrajectory({ side, interleaves: 16, density: 'variable' }));
    const halved = grid(spiralTrajectory({ side, interleaves: 8, density: 'variable', acceleration: 2 }));
    // Measured 0.454 against 0.129.
    expect(nrmse(halved, reference)).toBeGreaterThan(1.5 * nrmse(nyquist, reference));
  });
});
