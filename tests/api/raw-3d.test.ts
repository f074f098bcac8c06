import { execFileSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseReconstructionRequest, runReconstruction } from '../../src/pipeline/run-reconstruction.ts';
import {
  raw3dBytes,
  raw3dFileName,
  raw3dMissingFileName,
  raw3dReference as reference,
} from '../io/ismrmrd/raw-3d-fixture.ts';
import { binary, expectDocumented, expectProblem, finishedPlanBody, sharedTestApp } from './helpers.ts';

// The 3D file of tests/reference/generate_ismrmrd_3d_fixture.py (h5py: 4 coils, 2× readout
// oversampling, 16 × 16 × 12, noise scans, invented identifiers). Two worker threads, so the
// planes of a volume are split over the pool (src/services/volume-runs.ts).
const t = sharedTestApp({ workers: 2 });
const post = (name: string) => t.http().post('/v1/raw').attach('file', raw3dBytes(name), name);
const matrix = { nx: reference.nx, ny: reference.ny, nz: reference.nz };
const volumeRequest = (rawId: string, extra: Record<string, unknown> = {}) => ({
  source: { rawId },
  matrix,
  sampling: { pattern: 'poisson-disc', acceleration: 4, seed: 2 },
  method: { name: 'zero-filled' },
  ...extra,
});

describe('3D raw data over HTTP', () => {
  it('imports the 3D file with the coils, matrix, partitions and samples of its header (documented)', async () => {
    const res = await post(raw3dFileName);
    expect(res.status).toBe(201);
    await expectDocumented('POST', '/v1/raw', res);
    expect(res.body).toMatchObject({
      nx: reference.nx,
      ny: reference.ny,
      nz: reference.nz,
      coils: reference.coils,
      readoutOversampling: reference.readoutOversampling,
      readoutSamples: reference.readoutSamples,
      noiseScans: reference.records.noise,
      noiseSamples: reference.noiseSamples,
      imagingRecords: reference.records.imaging,
    });
    const info = await t.http().get(`/v1/raw/${res.body.id}`);
    expect(info.body.nz).toBe(reference.nz);
    const stored = t.app.services.store.getRawKspace(res.body.id)!;
    expect(stored.nz).toBe(reference.nz);
    expect(stored.kspace.data.length).toBe(2 * reference.coils * reference.nx * reference.ny * reference.nz);
  });

  it('a missing ky–kz point is a 422 naming kspace_encode_step_2 and the count acquired', async () => {
    const problem = expectProblem(
      await post(raw3dMissingFileName),
      422,
      'file.data.head.idx.kspace_encode_step_2',
    );
    const total = reference.ny * reference.nz;
    expect(problem.errors[0].message).toContain(`${total - 1} of ${total} ky–kz points`);
  });

  it('reconstructs the volume on the pool as in one thread; identifiers reach no answer, file or log', async () => {
    const imported = await post(raw3dFileName);
    const id = imported.body.id as string;
    const res = await t.http().post('/v1/reconstructions').send(volumeRequest(id));
    expect(res.status).toBe(201);
    await expectDocumented('POST', '/v1/reconstructions', res);
    expect(res.body.volume.acquisition).toBe('3d');
    expect(res.body.volume.slices.nrmse).toHaveLength(reference.nx);
    expect(res.body.info.combination).toBe('root-sum-of-squares');
    const raw = t.app.services.store.getRawKspace(id)!;
    const direct = await runReconstruction(parseReconstructionRequest(volumeRequest(id)), undefined, {
      loadRaw: async () => raw,
    });
    expect(res.body.metrics).toEqual(direct.metrics);
    expect(res.body.volume.slices.ssim).toEqual(direct.volume?.slices.ssim);

    const answers = JSON.stringify([imported.body, res.body, (await t.http().get(`/v1/raw/${id}`)).body]);
    const files = readdirSync(t.dataDir).map((name) => readFileSync(join(t.dataDir, name)));
    const logs = t.logs.join('\n');
    expect(logs.length).toBeGreaterThan(0);
    expect(reference.identifiers.every((word) => raw3dBytes(raw3dFileName).includes(word))).toBe(true);
    for (const word of reference.identifiers) {
      expect(answers).not.toContain(word);
      expect(files.some((file) => file.includes(word))).toBe(false);
      expect(logs).not.toContain(word);
    }
    // Deleting the data deletes the volume result made from it, as for 2D raw data.
    expect(t.app.services.store.inputsOf('result', res.body.id)).toEqual([{ kind: 'raw', id }]);
    expect((await t.http().delete(`/v1/raw/${id}`)).status).toBe(204);
    expect(t.app.services.store.getRawKspace(id)).toBeUndefined();
    expect(t.app.services.store.getResult(res.body.id)).toBeUndefined();
  });

  it("images.nii and the 4-coil acquisition export: numpy's zero-filled RSS volume is the service's", async () => {
    const id = (await post(raw3dFileName)).body.id as string;
    const res = await t
      .http()
      .post('/v1/reconstructions')
      .send(volumeRequest(id, { noise: { snr: 20 } }));
    expect(res.status).toBe(201);
    const header = (await t.http().get(res.body.acquisition.json)).body;
    expect(header).toMatchObject({
      matrix,
      volume: { acquisition: '3d' },
      coils: reference.coils,
      samples: { dims: [reference.nx, reference.ny, reference.nz, reference.coils] },
      noise: { prewhitened: true },
    });
    // Prewhitened scan noise (unit variance per complex sample) plus the added 2σ², σ from the note.
    const note = (res.body.notes as string[]).find((n) => n.includes('σ ='));
    const sigma = Number(note?.match(/σ = ([\d.e+-]+)/)?.[1]);
    expect(sigma).toBeGreaterThan(0);
    expect(Math.abs((header.noise.variancePerSample - 1) / (2 * sigma ** 2) - 1)).toBeLessThan(1.5e-3);
    const folder = mkdtempSync(join(tmpdir(), 'kspace-raw-3d-acquisition-'));
    for (const name of ['acquisition.nii', 'acquisition.json', 'images.nii']) {
      const file = await t.http().get(`/v1/results/${res.body.id}/${name}`).buffer(true).parse(binary);
      expect(file.status).toBe(200);
      writeFileSync(join(folder, name), file.body as Buffer);
    }
    const nii = readFileSync(join(folder, 'images.nii'));
    // NIfTI-1 dim (nifti1.h): [4, nx, ny, nz, volumes].
    expect([0, 1, 2, 3, 4].map((i) => nii.readInt16LE(40 + 2 * i))).toEqual([4, 16, 16, 12, 4]);
    // nibabel + numpy (tests/reference/volume_acquisition_check.py): RSS over coils of the inverse 3D DFT.
    const script = new URL('../reference/volume_acquisition_check.py', import.meta.url).pathname;
    const facts = JSON.parse(execFileSync('/usr/bin/python3', [script, folder], { encoding: 'utf8' }));
    expect(facts).toMatchObject({ dtype: 'complex64', shape: [16, 16, 12, 4] });
    expect(facts.heldOutsideTable).toBe(0);
    expect(facts.tableWithoutData).toBe(0);
    expect(facts.maxRelativeDifference).toBeLessThan(1e-5);
  });

  it('refuses multi-slice (acquisition), a 2D matrix (matrix), and multi-slice in a plan (acquisitions)', async () => {
    const id = (await post(raw3dFileName)).body.id as string;
    const send = (body: object) => t.http().post('/v1/reconstructions').send(body);
    const slices = expectProblem(
      await send(volumeRequest(id, { acquisition: 'multi-slice' })),
      422,
      'acquisition',
    );
    expect(slices.errors[0].message).toMatch(/3D acquisition/);
    expectProblem(await send(volumeRequest(id, { matrix: { nx: 16, ny: 16 } })), 422, 'matrix');
    // 2D raw data (the ismrmrd-tools file, 64×64) are no volume source: 422 naming matrix.
    const flat = await t
      .http()
      .post('/v1/raw')
      .attach(
        'file',
        readFileSync(new URL('../fixtures/ismrmrd/shepp-logan-4coil.h5', import.meta.url)),
        'a.h5',
      );
    const flatVolume = volumeRequest(flat.body.id, { matrix: { nx: 64, ny: 64, nz: 12 } });
    expect(expectProblem(await send(flatVolume), 422, 'matrix').errors[0].allowed).toBe('{ nx: 64, ny: 64 }');
    const plan = {
      source: { rawId: id },
      matrix,
      protocol: { trMs: 10 },
      patterns: [{ pattern: 'poisson-disc' }],
      accelerations: [4],
      methods: [{ name: 'zero-filled' }],
      seeds: 1,
    };
    const planned = await t
      .http()
      .post('/v1/plans')
      .send({ ...plan, acquisitions: ['3d', 'multi-slice'] });
    expectProblem(planned, 422, 'acquisitions[1]');
    // A 3D plan runs, and its cell is the single reconstruction of the same pattern and seed.
    const submitted = await t.http().post('/v1/plans').send(plan);
    expect(submitted.status).toBe(202);
    const body = await finishedPlanBody(t, submitted.body.id);
    expect(body.status).toBe('done');
    const cell = body.table.rows.find((row: { reference: boolean }) => !row.reference);
    expect(cell.acquisition).toBe('3d');
    const single = await send(
      volumeRequest(id, { sampling: { pattern: 'poisson-disc', acceleration: 4, seed: 1 } }),
    );
    expect(cell.metrics.nrmse.mean).toBeCloseTo(single.body.metrics.nrmse, 12);
  });
});
