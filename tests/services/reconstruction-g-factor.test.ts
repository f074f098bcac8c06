import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, describe, expect, it } from 'vitest';
import { generateMask, maskDiagnostics } from '../../sampling/index.ts';
import { CoilNoise } from '../../src/coils/index.ts';
import { defaultLimits } from '../../src/core/limits.ts';
import { Store } from '../../src/jobs/store.ts';
import type { WorkerPool } from '../../src/jobs/worker-pool.ts';
import { reconstructionGFactor } from '../../src/pipeline/coil-g-factor.ts';
import { parseReconstructionRequest, runReconstruction } from '../../src/pipeline/run-reconstruction.ts';
import { G_FACTOR_WHITE } from '../../src/render/coil-montage.ts';
import { ReconstructionService } from '../../src/services/reconstructions.ts';
import { coilFixture, gaussianArrayMaps } from '../coils/fixture.ts';

// The response and images of a reconstruction that has a g-factor (docs/design.md §3.8), through the
// service's own rendering and storing. No method with an analytic g-factor is registered on its own
// here, so the worker's answer is a real single-coil outcome with the g-factor facts that
// reconstructionGFactor gives for the numpy fixture's 4 Gaussian coils (ring Ψ, R = 2, 32²).

describe('ReconstructionService with a g-factor', () => {
  const dataDir = mkdtempSync(join(tmpdir(), 'kspace-gfactor-'));
  const store = new Store(dataDir);
  afterAll(() => store.close());

  it('answers gFactor, snrRetained and the coil-maps and g-factor images; g-factor.png is linear to g = 3', async () => {
    const f = coilFixture.gaussian_array;
    const request = parseReconstructionRequest({
      source: { phantom: 'shepp-logan-modified' },
      matrix: { nx: f.nx, ny: f.ny },
      sampling: { pattern: 'cartesian-uniform', acceleration: 2 },
      method: { name: 'zero-filled' },
    });
    const outcome = await runReconstruction(request, undefined);
    const maps = gaussianArrayMaps();
    CoilNoise.ring(f.count, f.correlation).prewhiten(maps);
    const g = reconstructionGFactor({
      method: 'sense',
      sampled: generateMask({ nx: f.nx, ny: f.ny }, { pattern: 'cartesian-uniform', acceleration: 2 }),
      maps,
      objectMask: Uint8Array.from(f.disc),
    });
    if (!g) throw new Error('the fixture has an analytic g-factor');
    const { map, snrRetained, ...summary } = g;
    const withG = {
      ...outcome,
      coils: { array: 'gaussian' as const, count: f.count, label: '4 gaussian' },
      gFactor: summary,
      snrRetained,
      images: { ...outcome.images, coilMaps: maps, gFactor: { nx: f.nx, ny: f.ny, data: map } },
    };
    const pool = {
      runForRequest: async () => ({
        outcome: withG,
        diagnostics: maskDiagnostics(outcome.sampled),
        zeroFilledMetrics: outcome.metrics,
      }),
    } as unknown as WorkerPool;
    const service = new ReconstructionService({ pool, store, limits: defaultLimits });
    const body = await service.create(request, { owner: null, scope: 'all' });
    if ('missingImage' in body) throw new Error('no upload here');
    expect(body.gFactor).toEqual({ ...summary, replicas: null });
    expect(body.gFactor?.max).toBeCloseTo(f.summaryRing.max, 10);
    expect(body.snrRetained?.min).toBeCloseTo(1 / (f.summaryRing.max * Math.SQRT2), 10);
    expect(body.coils).toEqual({ array: 'gaussian', count: 4, label: '4 gaussian' });
    expect(body.images.gFactor).toBe(`/v1/results/${body.id}/g-factor.png`);
    expect(body.images.coilMaps).toBe(`/v1/results/${body.id}/coil-maps.png`);
    const png = store.getResultImage(body.id, 'g-factor');
    if (!png) throw new Error('g-factor.png stored');
    const { data, info } = await sharp(png).raw().toBuffer({ resolveWithObject: true });
    expect([info.width, info.height]).toEqual([f.nx, f.ny]);
    for (let i = 0; i < map.length; i++) {
      expect(data[i * info.channels]).toBe(
        Math.round((255 * Math.min(map[i], G_FACTOR_WHITE)) / G_FACTOR_WHITE),
      );
    }
    const montage = await sharp(store.getResultImage(body.id, 'coil-maps')).metadata();
    expect([montage.width, montage.height]).toEqual([2 * f.nx, 2 * f.ny]); // 4 coils: 2 × 2 tiles
  });
});
