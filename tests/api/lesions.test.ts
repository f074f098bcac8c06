import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { debianFile } from '../io/debian-files.ts';
import { binary, expectDocumented, oneCellPlan, postJson, postProblem, sharedTestApp } from './helpers.ts';

// Lesions in POST /v1/reconstructions (DEVELOPERS.md "Feature fidelity"). Contrast recovery is
// Re⟨r, t⟩/⟨t, t⟩ with t the lesion's own fully sampled noiseless response, so full sampling gives 1
// by construction, and zero-filled uniform R = 2 without ACS gives 1/2 from its point-spread
// function ½(δ(0) + δ(N/2)) (the sampled rows are every other row: the mask is ½(1 + (−1)^v), whose
// inverse DFT is the two deltas; Bracewell, The Fourier Transform and Its Applications, shift theorem).

const base = {
  source: { phantom: 'shepp-logan-modified' },
  matrix: { nx: 64, ny: 64 },
  method: { name: 'zero-filled' },
};
const full = { pattern: 'cartesian-uniform', acceleration: 1 };
const halved = { pattern: 'cartesian-uniform', acceleration: 2 };
/** `count` faint lesions: 3 px across, contrast 0.05, placed by seed 1. */
const faintLesions = (count: number) => ({ count, diameter: 3, contrast: 0.05, seed: 1 });

describe('POST /v1/reconstructions with lesions', () => {
  const t = sharedTestApp({ limits: { maxIterations: 100, maxMatrixSide: 128 } });
  /** POST /v1/reconstructions of `base` with `body`'s fields added or replaced. */
  const reconstructBase = (body: Record<string, unknown>) =>
    postJson(t, '/v1/reconstructions', { ...base, ...body });

  it('phantom, full sampling, noiseless: contrast recovery 1 (one lesion within 1e-6), positions inside the object, lesions.png', async () => {
    const res = await reconstructBase({
      sampling: full,
      lesions: { ...faintLesions(1), shape: 'disc' },
    });
    expect(res.status).toBe(201);
    await expectDocumented('POST', '/v1/reconstructions', res);
    const f = res.body.fidelity;
    // Measured 1.3e-15 from 1.
    expect(Math.abs(f.contrastRecovery.mean - 1)).toBeLessThan(1e-6);
    expect(Math.abs(f.contrastRecovery.min - 1)).toBeLessThan(1e-6);
    expect(f.lesions).toHaveLength(1);
    expect(f.resolved).toBe(1);
    expect(f.falseLesions).toEqual({ count: 0, positions: [] });
    expect(f.detectability.method).toBe('noiseless');
    expect(f.reconstructions).toBe(1); // the lesion-free run is the base run itself
    // The centre lies on the object: the reference there is well above 0.1 × its maximum.
    const png = await t.http().get(res.body.images.reference).buffer(true).parse(binary);
    const { data, info } = await sharp(png.body).raw().toBuffer({ resolveWithObject: true });
    const { row, col } = f.lesions[0];
    expect(data[(row * info.width + col) * info.channels]).toBeGreaterThan(0.1 * 255);
    const lesionsPng = await t.http().get(res.body.images.lesions).buffer(true).parse(binary);
    expect(lesionsPng.status).toBe(200);
    expect((await sharp(lesionsPng.body).metadata()).width).toBe(64);
  });

  it('six lesions at full sampling: each 1 up to its neighbours’ ringing (measured 4.8e-5, asserted 2e-4)', async () => {
    const res = await reconstructBase({
      sampling: full,
      lesions: faintLesions(6),
    });
    expect(res.status).toBe(201);
    for (const lesion of res.body.fidelity.lesions) {
      expect(Math.abs(lesion.contrastRecovery - 1)).toBeLessThan(2e-4);
    }
    const positions = res.body.fidelity.lesions.map((l: { row: number; col: number }) => `${l.row},${l.col}`);
    expect(new Set(positions).size).toBe(6);
  });

  it('zero-filled uniform R = 2 without ACS: contrast recovery 1/2 from the PSF (measured 0.499992, asserted ±1e-4)', async () => {
    const res = await reconstructBase({
      sampling: halved,
      lesions: faintLesions(1),
    });
    expect(res.status).toBe(201);
    expect(res.body.fidelity.contrastRecovery.mean).toBeCloseTo(0.5, 4);
    expect(Math.abs(res.body.fidelity.lesions[0].contrastRecovery - 0.5)).toBeLessThan(1e-4);
  });

  it('noisy cs-tv: replicas as asked, CNR and detectability finite, notes say what was pinned', async () => {
    const res = await reconstructBase({
      sampling: { pattern: 'cartesian-random', acceleration: 2, acs: 8, seed: 2 },
      noise: { snr: 30 },
      method: { name: 'cs-tv', iterations: 30 },
      lesions: { count: 3, diameter: 3, contrast: 0.2, replicas: 4 },
    });
    expect(res.status).toBe(201);
    const f = res.body.fidelity;
    expect(f.detectability).toMatchObject({ method: 'replicas', replicas: 4 });
    expect(f.reconstructions).toBe(1 + 4);
    for (const lesion of f.lesions) {
      expect(Number.isFinite(lesion.cnr)).toBe(true);
      expect(Number.isFinite(lesion.detectability)).toBe(true);
    }
    expect(res.body.notes.join(' ')).toMatch(/absolute λ .*30 iterations, no early stop/);
  });

  it('an upload: lesions rasterised with supersampled edges (notes), full sampling recovers 1', async () => {
    const upload = await t
      .http()
      .post('/v1/images')
      .attach('file', debianFile('pydicom', 'MR_small.dcm'), 'm.dcm');
    expect(upload.status).toBe(201);
    const res = await reconstructBase({
      source: { imageId: upload.body.id },
      sampling: full,
      lesions: { count: 2, diameter: 2, contrast: -0.2, shape: 'gaussian', seed: 4 },
    });
    expect(res.status).toBe(201);
    expect(res.body.notes.join(' ')).toMatch(/lesions rasterised with 8×8 supersampled edges/);
    // The template is the lesion's raster, which the discrete forward model and full sampling return exactly, up to rounding.
    expect(Math.abs(res.body.fidelity.contrastRecovery.min - 1)).toBeLessThan(1e-9);
  });

  it('bad lesion fields are named (422 out of range, 400 unknown key): lesions.count, lesions.diameter, lesions.contrast, lesions.shape, lesions.replicas; too many for the object', async () => {
    const send = (lesions: object) => ({ ...base, sampling: full, lesions });
    const ok = { count: 2, diameter: 3, contrast: 0.05 };
    await postProblem(t, '/v1/reconstructions', send({ ...ok, count: 0 }), 422, 'lesions.count');
    await postProblem(t, '/v1/reconstructions', send({ ...ok, diameter: 500 }), 422, 'lesions.diameter');
    await postProblem(t, '/v1/reconstructions', send({ ...ok, contrast: 0 }), 422, 'lesions.contrast');
    await postProblem(t, '/v1/reconstructions', send({ ...ok, shape: 'square' }), 422, 'lesions.shape');
    await postProblem(t, '/v1/reconstructions', send({ ...ok, replicas: 1 }), 422, 'lesions.replicas');
    await postProblem(t, '/v1/reconstructions', send({ ...ok, colour: 'red' }), 400, 'lesions.colour');
    const crowded = await postProblem(
      t,
      '/v1/reconstructions',
      send({ count: 64, diameter: 6, contrast: 0.05 }),
      422,
      'lesions.count',
    );
    expect(crowded.errors[0].message).toMatch(/could be placed/);
  });

  it('a plan with lesions and two task-score targets: 202, done, rows with fidelity, the recommendation honours both and names the deciding one', async () => {
    const res = await postJson(t, '/v1/plans', {
      source: base.source,
      matrix: base.matrix,
      protocol: { trMs: 500 },
      patterns: [{ pattern: 'cartesian-uniform' }, { pattern: 'cartesian-random', acs: 8 }],
      accelerations: [2, 4],
      methods: [{ name: 'zero-filled' }],
      seeds: 1,
      lesions: { count: 2, diameter: 3, contrast: 0.2, seed: 1 },
      targets: [
        { metric: 'contrastRecovery', atLeast: 0.6 },
        { metric: 'falseLesions', atMost: 25 },
      ],
    });
    expect(res.status).toBe(202);
    let done = await t.http().get(res.headers.location);
    for (let i = 0; i < 2400 && !['done', 'failed', 'cancelled'].includes(done.body.status); i++) {
      await new Promise((resolve) => setTimeout(resolve, 25));
      done = await t.http().get(res.headers.location);
    }
    expect(done.body.status).toBe('done');
    await expectDocumented('GET', res.headers.location, done);
    const { rows, recommendation } = done.body.table;
    for (const row of rows) expect(row.fidelity.contrastRecovery.mean).toBeGreaterThan(0);
    expect(recommendation.targets).toHaveLength(2);
    // Measured (noiseless, so deterministic): uniform R 2 / 4 recover 0.500 / 0.250 with 8 / 11 false
    // lesions (aliasing ghosts), random lines R 2 / 4 0.864 / 0.584 with 23 / 16. Only random R = 2 meets
    // both; the 8 s rows fail contrast recovery alone, so that target decided it.
    expect(recommendation.overall.key).toBe('p1-r0-m0');
    const picked = rows[recommendation.overall.rowIndex];
    expect(picked.fidelity.contrastRecovery.mean).toBeGreaterThanOrEqual(0.6);
    expect(picked.fidelity.falseLesions.mean).toBeLessThanOrEqual(25);
    expect(recommendation.decidedBy).toEqual({ metric: 'contrastRecovery', atLeast: 0.6 });
    expect(recommendation.statement).toMatch(
      /^Shortest scan meeting contrast recovery ≥ 0\.6 and false lesions ≤ 25: .* Decided by contrast recovery ≥ 0\.6: without it, .*R = 4.* would be chosen\.$/,
    );
    const csv = await t.http().get(`${res.headers.location}/table.csv`);
    expect(csv.text.split('\r\n')[0]).toContain(
      'contrast_recovery_mean,contrast_recovery_sd,false_lesions_mean',
    );
  });

  it('plans: a task-score target without lesions is a 422 on targets[0].metric; lesions that do not fit, on lesions.count', async () => {
    const plan = { ...oneCellPlan, source: base.source, matrix: base.matrix };
    await postProblem(
      t,
      '/v1/plans',
      { ...plan, targets: [{ metric: 'falseLesions', atMost: 0 }] },
      422,
      'targets[0].metric',
    );
    await postProblem(
      t,
      '/v1/plans',
      { ...plan, lesions: { count: 64, diameter: 6, contrast: 0.05 } },
      422,
      'lesions.count',
    );
  });
});
