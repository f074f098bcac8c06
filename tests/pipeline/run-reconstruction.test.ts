import { describe, expect, it } from 'vitest';
import { RASTER_SUPERSAMPLE } from '../../src/acquisition/phantom-source.ts';
import { ValidationError } from '../../src/core/errors.ts';
import { defaultLimits } from '../../src/core/limits.ts';
import type { RealImage } from '../../src/core/real-image.ts';
import { sheppLoganModified } from '../../src/phantoms/shepp-logan.ts';
import {
  noiseSeedFor,
  parseReconstructionRequest,
  runReconstruction,
  sourceSchema,
} from '../../src/pipeline/run-reconstruction.ts';

const matrix = { nx: 64, ny: 64 };

function disc(n: number): RealImage {
  const data = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) if (Math.hypot(i - n / 2, j - n / 2) < n / 3) data[i * n + j] = 1;
  return { nx: n, ny: n, data };
}

describe('runReconstruction', () => {
  it('full sampling, no noise, zero-filled: the reconstruction is the reference (1e-10) and the error map is 0', async () => {
    const out = await runReconstruction(
      {
        source: { phantom: 'shepp-logan-modified' },
        matrix,
        sampling: { pattern: 'cartesian-uniform', acceleration: 1 },
        method: { name: 'zero-filled' },
      },
      undefined,
    );
    expect(out.acceleration.actual).toBe(1);
    expect(out.fraction).toBe(1);
    expect(out.metrics.nrmse).toBeLessThan(1e-10);
    let worst = 0;
    for (const v of out.images.errorMap.data) worst = Math.max(worst, v);
    expect(worst).toBeLessThan(1e-10);
    expect(out.notes).toEqual([]);
    expect(out.images.reconstruction.nx).toBe(64);
  });

  it('reports acceleration, acquired count, timing, method info, and |x̂| − |x| as the error map', async () => {
    const out = await runReconstruction(
      {
        source: { phantom: 'shepp-logan-modified' },
        matrix,
        sampling: { pattern: 'cartesian-random', acceleration: 4, acs: 8, seed: 3 },
        noise: { snr: 30 },
        method: { name: 'cs-tv', iterations: 20 },
      },
      7,
    );
    expect(out.acceleration.requested).toBe(4);
    expect(out.acquired.unit).toBe('lines');
    expect(out.sampled.seed).toBe(7); // the call's seed replaces sampling.seed
    expect(out.timing.reconMs).toBeGreaterThan(0);
    expect(out.info.iterations).toBe(20);
    expect(out.notes.some((n) => n.startsWith('complex Gaussian noise'))).toBe(true);
    const { reconstruction, reference, errorMap } = out.images;
    for (let i = 0; i < errorMap.data.length; i++) {
      expect(errorMap.data[i]).toBeCloseTo(Math.abs(reconstruction.data[i] - reference.data[i]), 14);
    }
  });

  it('is deterministic for a seed and changes with it', async () => {
    const req = {
      source: { phantom: 'shepp-logan-modified' },
      matrix,
      sampling: { pattern: 'poisson-disc' as const, acceleration: 3, acs: 8, seed: 1 },
      noise: { snr: 20 },
      method: { name: 'zero-filled' as const },
    };
    const a = await runReconstruction(req, 5);
    const b = await runReconstruction(req, 5);
    const c = await runReconstruction(req, 6);
    expect(
      Buffer.from(a.images.reconstruction.data.buffer).equals(
        Buffer.from(b.images.reconstruction.data.buffer),
      ),
    ).toBe(true);
    expect(a.metrics.nrmse).not.toBe(c.metrics.nrmse);
    expect(noiseSeedFor(5)).not.toBe(5);
  });

  it('uploaded images: inverse crime noted, resampled to the matrix when sizes differ', async () => {
    const out = await runReconstruction(
      {
        source: { imageId: 'abc' },
        matrix: { nx: 32, ny: 32 },
        sampling: { pattern: 'cartesian-uniform', acceleration: 1 },
        method: { name: 'zero-filled' },
      },
      undefined,
      { loadImage: async () => disc(48) },
    );
    expect(out.notes.some((n) => n.includes('inverse crime'))).toBe(true);
    expect(out.notes.some((n) => n.includes('resampled from 48×48 to 32×32'))).toBe(true);
    expect(out.metrics.nrmse).toBeLessThan(1e-10);
  });

  it('raster k-space mode is flagged as an inverse crime', async () => {
    const rasterMode = (acceleration: number) =>
      runReconstruction(
        {
          source: { phantom: 'shepp-logan-modified', kspace: 'raster' },
          matrix: { nx: 32, ny: 32 },
          sampling: { pattern: 'cartesian-uniform', acceleration },
          method: { name: 'zero-filled' },
        },
        undefined,
      );
    const out = await rasterMode(2);
    expect(out.notes.some((n) => n.includes('inverse crime'))).toBe(true);
    // The crime itself: with every line the reconstruction returns the very raster the data came from
    // (docs/design.md §2.1: 'raster' k-space = F_c(raster), 4× supersampled), not the analytic object.
    const full = await rasterMode(1);
    const raster = sheppLoganModified().rasterize(32, 32, { supersample: RASTER_SUPERSAMPLE });
    let worst = 0;
    for (let i = 0; i < raster.data.length; i++) {
      worst = Math.max(worst, Math.abs(full.images.reference.data[i] - raster.data[i]));
    }
    expect(worst).toBeLessThan(1e-12);
    expect(full.metrics.nrmse).toBeLessThan(1e-12);
  });

  it('bad input gives typed errors naming the field', async () => {
    const base = {
      source: { phantom: 'shepp-logan-modified' },
      matrix,
      sampling: { pattern: 'cartesian-uniform' as const, acceleration: 2 },
      method: { name: 'zero-filled' as const },
    };
    const field = async (p: Promise<unknown>) => {
      try {
        await p;
      } catch (error) {
        expect(error).toBeInstanceOf(ValidationError);
        return (error as ValidationError).problems[0].field;
      }
      throw new Error('expected a ValidationError');
    };
    expect(await field(runReconstruction({ ...base, source: { phantom: 'nope' } }, undefined))).toBe(
      'source.phantom',
    );
    // Request values are checked once, at the edge (the request schema built from the limits).
    const edge = async (input: unknown, limits = defaultLimits) => parseReconstructionRequest(input, limits);
    expect(await field(edge({ ...base, noise: { snr: -1 } }))).toBe('noise.snr');
    // Too small to score: SSIM needs one whole 11×11 window (Wang et al. 2004), so the matrix is named.
    expect(await field(edge({ ...base, matrix: { nx: 10, ny: 32 } }))).toBe('matrix.nx');
    expect(await field(runReconstruction({ ...base, source: { imageId: 'x' } }, undefined))).toBe(
      'source.imageId',
    );
    expect(await field(edge(base, { ...defaultLimits, maxMatrixSide: 32 }))).toBe('matrix.nx');
    expect(
      await field(runReconstruction({ ...base, method: { name: 'cs-tv', lambda: 11 } }, undefined)),
    ).toBe('method.lambda');
    expect(sourceSchema.safeParse({ phantom: 'shepp-logan' }).success).toBe(true);
    expect(sourceSchema.safeParse({ imageId: 'a1' }).success).toBe(true);
    expect(sourceSchema.safeParse({ phantom: 'x', imageId: 'y' }).success).toBe(false);
  });
});
