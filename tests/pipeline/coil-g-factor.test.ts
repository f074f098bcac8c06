import { describe, expect, it } from 'vitest';
import { generateMask } from '../../sampling/index.ts';
import { CoilNoise } from '../../src/coils/index.ts';
import { reconstructionGFactor, uniformLatticeStep } from '../../src/pipeline/coil-g-factor.ts';
import { runReconstruction } from '../../src/pipeline/run-reconstruction.ts';
import { coilFixture, gaussianArrayMaps } from '../coils/fixture.ts';

// The g-factor a reconstruction reports, through the pipeline's one call site. Check values: the
// numpy fixture of tests/reference/generate_coil_fixtures.py (SENSE g-factor of Pruessmann, Weiger,
// Scheidegger & Boesiger 1999 for 4 Gaussian coils, 32², R = 2, ring noise covariance ρ = 0.2).

describe('reconstructionGFactor', () => {
  const f = coilFixture.gaussian_array;
  const disc = Uint8Array.from(f.disc);
  const uniform = (acceleration: number, acs?: number) =>
    generateMask(
      { nx: f.nx, ny: f.ny },
      { pattern: 'cartesian-uniform', acceleration, ...(acs === undefined ? {} : { acs }) },
    );

  it('SENSE on prewhitened maps (Ψ = I there) equals the numpy g-factor with the ring Ψ to 1e-10', () => {
    const maps = gaussianArrayMaps();
    CoilNoise.ring(f.count, f.correlation).prewhiten(maps);
    const g = reconstructionGFactor({ method: 'sense', sampled: uniform(2), maps, objectMask: disc });
    expect(g).toBeDefined();
    expect(g?.method).toBe('analytic');
    expect(g?.replicas).toBeNull();
    expect(Math.abs((g?.mean ?? 0) - f.summaryRing.mean)).toBeLessThan(1e-10);
    expect(Math.abs((g?.p95 ?? 0) - f.summaryRing.p95)).toBeLessThan(1e-10);
    expect(Math.abs((g?.max ?? 0) - f.summaryRing.max)).toBeLessThan(1e-10);
    let worst = 0;
    for (let i = 0; i < f.gRing.length; i++) worst = Math.max(worst, Math.abs((g?.map[i] ?? 0) - f.gRing[i]));
    expect(worst).toBeLessThan(1e-10);
    // SNR retained 1/(g·√R) (Pruessmann et al. 1999): its minimum is 1/(g_max·√2).
    expect(g?.snrRetained.min).toBeCloseTo(1 / (f.summaryRing.max * Math.SQRT2), 12);
    expect(g?.snrRetained.mean).toBeLessThan(1 / Math.SQRT2);
  });

  it('no g-factor for a method without an analytic form, nor for a mask that is not a uniform lattice', () => {
    const maps = gaussianArrayMaps();
    expect(
      reconstructionGFactor({ method: 'zero-filled', sampled: uniform(2), maps, objectMask: disc }),
    ).toBeUndefined();
    expect(
      reconstructionGFactor({ method: 'sense', sampled: uniform(2, 4), maps, objectMask: disc }),
    ).toBeUndefined();
    // R above the coil count cannot be unfolded: no analytic g-factor either.
    expect(
      reconstructionGFactor({ method: 'sense', sampled: uniform(8), maps, objectMask: disc }),
    ).toBeUndefined();
  });

  it('orthogonal sensitivities across each fold give g = 1 exactly (Pruessmann et al. 1999)', () => {
    // Coil 0 = 1/√2 everywhere; coil 1 = +1/√2 in the top half, −1/√2 in the bottom half: the two
    // pixels of every R = 2 fold (rows i and i + ny/2) have orthogonal sensitivity vectors.
    const nx = 8;
    const ny = 8;
    const data = new Float64Array(2 * 2 * nx * ny);
    for (let i = 0; i < nx * ny; i++) {
      data[2 * i] = Math.SQRT1_2;
      data[2 * (nx * ny + i)] = i < (nx * ny) / 2 ? Math.SQRT1_2 : -Math.SQRT1_2;
    }
    const sampled = generateMask({ nx, ny }, { pattern: 'cartesian-uniform', acceleration: 2 });
    const g = reconstructionGFactor({
      method: 'sense',
      sampled,
      maps: { coils: 2, nx, ny, data },
      objectMask: new Uint8Array(nx * ny).fill(1),
    });
    expect(g?.max).toBeCloseTo(1, 14);
    expect(g?.mean).toBeCloseTo(1, 14);
    expect(g?.snrRetained.mean).toBeCloseTo(Math.SQRT1_2, 14);
  });
});

describe('uniformLatticeStep', () => {
  it('finds R for every-R-th-row masks through the centre row, and refuses anything else', () => {
    const m = { nx: 16, ny: 16 };
    expect(uniformLatticeStep(generateMask(m, { pattern: 'cartesian-uniform', acceleration: 1 }))).toBe(1);
    expect(uniformLatticeStep(generateMask(m, { pattern: 'cartesian-uniform', acceleration: 4 }))).toBe(4);
    expect(uniformLatticeStep(generateMask(m, { pattern: 'cartesian-uniform', acceleration: 3 }))).toBeNull();
    expect(
      uniformLatticeStep(generateMask(m, { pattern: 'cartesian-uniform', acceleration: 2, acs: 4 })),
    ).toBeNull();
    expect(
      uniformLatticeStep(generateMask(m, { pattern: 'cartesian-random', acceleration: 2, seed: 1 })),
    ).toBeNull();
  });
});

describe('g-factor through a reconstruction request', () => {
  const request = (method: { name: 'sense' } | { name: 'grappa' }, extra: object = {}) =>
    runReconstruction(
      {
        source: { phantom: 'shepp-logan-modified' },
        matrix: { nx: 64, ny: 64 },
        sampling: { pattern: 'cartesian-uniform', acceleration: 2, acs: 16 },
        method,
        noise: { snr: 40 },
        coils: { array: 'loops', count: 8, loopRadius: 0.35, ringRadius: 1.25 },
        ...extra,
      },
      1,
    );

  it('no closed form (ACS lines in the mask): pseudo-replica only when replicas are asked for', async () => {
    expect((await request({ name: 'grappa' })).gFactor).toBeUndefined();
    const out = await request({ name: 'grappa' }, { gFactor: { replicas: 10 } });
    expect(out.gFactor).toMatchObject({ method: 'pseudo-replica', replicas: 10 });
    // Measured mean 1.17 (g ≥ 1 expected on average for GRAPPA at R = 2 with 8 coils; Robson et
    // al. 2008 report g of the same order), max 3.1 at the object's edge where 10 replicas are noisy.
    expect(out.gFactor?.mean).toBeGreaterThan(0.9);
    expect(out.gFactor?.mean).toBeLessThan(1.5);
    // SNR retained is 1/(g·√R) pixel by pixel, so its mean is at most 1/(min g·√2).
    expect(out.snrRetained?.mean).toBeGreaterThan(0);
    expect(out.images.gFactor?.data.length).toBe(64 * 64);
  });

  it('SENSE on every second row keeps the analytic form, whatever the replicas', async () => {
    const out = await runReconstruction(
      {
        source: { phantom: 'shepp-logan-modified' },
        matrix: { nx: 64, ny: 64 },
        sampling: { pattern: 'cartesian-uniform', acceleration: 2 },
        method: { name: 'sense' },
        coils: { array: 'loops', count: 8, loopRadius: 0.35, ringRadius: 1.25 },
        gFactor: { replicas: 10 },
      },
      1,
    );
    expect(out.gFactor).toMatchObject({ method: 'analytic', replicas: null });
    // Measured mean 1.034, max 1.078 for 8 loops at R = 2 (64²).
    expect(out.gFactor?.mean).toBeGreaterThanOrEqual(1);
    expect(out.gFactor?.max).toBeLessThan(1.2);
  });
});
