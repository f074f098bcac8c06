import { describe, expect, it } from 'vitest';
import { radialTrajectory } from '../../sampling/trajectories/radial-trajectory.ts';
import { ValidationError } from '../../src/core/errors.ts';
import { radialRampWeights } from '../../src/nufft/radial-ramp-weights.ts';
import { type ReconstructionRequest, runReconstruction } from '../../src/pipeline/run-reconstruction.ts';

// Receive arrays on non-Cartesian trajectories through the pipeline (docs/design.md §3.8). Checks
// against outside facts: CG-SENSE with the true maps on Nyquist data must do at least as well as
// single-coil gridding (Pruessmann et al. 2001: SENSE at R = 1 is the optimal coil combination of a
// least-squares fit, gridding an approximate inverse); image noise scales linearly with σ = 1/SNR
// for linear methods (definition of SNR, docs/references.md §7); the pseudo-replica g-factor of a
// linear reconstruction (Robson et al. 2008) stays near 1 at R = 1.

const side = 48;
const loops = { array: 'loops', count: 8, loopRadius: 0.35, ringRadius: 1.25 } as const;
const source = { phantom: 'shepp-logan-modified' } as const;
const matrix = { nx: side, ny: side };

function request(overrides: Partial<ReconstructionRequest>): ReconstructionRequest {
  return {
    source,
    matrix,
    sampling: { pattern: 'radial', acceleration: 1 },
    method: { name: 'zero-filled' },
    coils: loops,
    ...overrides,
  } as ReconstructionRequest;
}

async function refusal(req: ReconstructionRequest): Promise<ValidationError> {
  try {
    await runReconstruction(req, undefined);
  } catch (error) {
    if (error instanceof ValidationError) return error;
    throw error;
  }
  throw new Error('expected a ValidationError');
}

describe('receive arrays on trajectories', () => {
  it('Nyquist radial, 8 loops: CG-SENSE with the true maps beats single-coil gridding', async () => {
    const single = await runReconstruction(request({ coils: { array: 'uniform' } }), undefined);
    const gridded = await runReconstruction(request({}), undefined);
    const sense = await runReconstruction(request({ method: { name: 'sense' } }), undefined);
    // Measured at 48²: single-coil gridding 0.131, 8-coil gridding 0.121, CG-SENSE 0.097.
    expect(gridded.info).toMatchObject({ gridding: true, combination: 'sensitivity-weighted', coils: 8 });
    expect(gridded.coils).toMatchObject({ array: 'loops', count: 8 });
    expect(sense.info).toMatchObject({ maps: 'true', coils: 8, dataWeighting: 'radial-ramp' });
    expect(sense.metrics.nrmse).toBeLessThanOrEqual(single.metrics.nrmse);
  });

  it('undersampled radial: sense (true and acs maps) and cs-tv on the NUFFT with maps', async () => {
    const sampling = { pattern: 'radial', acceleration: 4 } as const;
    const zf = await runReconstruction(request({ sampling }), undefined);
    const sense = await runReconstruction(request({ sampling, method: { name: 'sense' } }), undefined);
    const acs = await runReconstruction(
      request({ sampling, method: { name: 'sense', maps: 'acs' } }),
      undefined,
    );
    const tv = await runReconstruction(
      request({ sampling, method: { name: 'cs-tv', iterations: 60 } }),
      undefined,
    );
    // Measured: gridding 0.217, SENSE true maps 0.127, ACS maps 0.155, cs-tv (60 linearised iterations) 0.074.
    expect(acs.info).toMatchObject({ maps: 'acs' });
    expect(tv.info).toMatchObject({ coils: 8, maps: 'given', dataWeighting: 'radial-ramp' });
    expect(sense.metrics.nrmse).toBeLessThan(zf.metrics.nrmse);
    expect(tv.metrics.nrmse).toBeLessThan(zf.metrics.nrmse);
  });

  it('noise: σ is reported and the gridded image noise scales with 1/SNR', async () => {
    const clean = await runReconstruction(request({}), undefined);
    const noise = async (snr: number) => {
      const out = await runReconstruction(request({ noise: { snr } }), undefined);
      let sum = 0;
      for (let i = 0; i < side * side; i++)
        sum += (out.images.zeroFilled.data[i] - clean.images.zeroFilled.data[i]) ** 2;
      return { rms: Math.sqrt(sum / (side * side)), notes: out.notes };
    };
    const a = await noise(20);
    const b = await noise(40);
    // Measured 0.00740 and 0.00366 (RMS over the whole image).
    expect(a.notes.some((n) => n.includes('per coil and sample before prewhitening'))).toBe(true);
    expect(a.rms / b.rms).toBeCloseTo(2, 1);
  });

  it('pseudo-replica g-factor of gridding at R = 1 matches its closed form √(Σw²/N)', async () => {
    // Gridding is linear: pixel noise σ²·Σ_p w_p²·|A_pj|² with |A_pj|² = 1/N for the NDFT (the
    // defining sum, tests/nufft/direct-ndft.ts), combined with the maps to σ_z²/Σ|S_c|²; the fully
    // sampled Cartesian scan has σ²/Σ|S_c|², so g = √(Σ_p w_p² / N) at every pixel (R = 1).
    const out = await runReconstruction(
      request({ noise: { snr: 30 }, gFactor: { replicas: 40 } }),
      undefined,
    );
    const t = radialTrajectory({ side, readoutOversampling: 2 });
    const w = radialRampWeights(t);
    let sum = 0;
    for (const v of w) sum += v * v;
    const expected = Math.sqrt(sum / (side * side));
    expect(out.gFactor).toMatchObject({ method: 'pseudo-replica', replicas: 40 });
    // Measured mean 0.508 against 0.509.
    // Monte-Carlo error per pixel 1/√78 ≈ 11 %; the object mean averages it down.
    expect((out.gFactor as { mean: number }).mean / expected).toBeCloseTo(1, 1);
    const sense = await runReconstruction(
      request({ method: { name: 'sense', iterations: 10 }, noise: { snr: 30 }, gFactor: { replicas: 4 } }),
      undefined,
    );
    expect(sense.gFactor).toMatchObject({ method: 'pseudo-replica', replicas: 4 });
  });

  it('grappa and lowrank-hankel refuse receive-array trajectories naming method.name', async () => {
    for (const name of ['grappa', 'lowrank-hankel'] as const) {
      const error = await refusal(request({ method: { name } }));
      expect(error.problems[0].field).toBe('method.name');
      expect(error.problems[0].message).toContain(name);
    }
  });
});
