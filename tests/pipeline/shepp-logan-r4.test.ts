import { describe, expect, it } from 'vitest';
import { type ReconstructionOutcome, runReconstruction } from '../../src/pipeline/run-reconstruction.ts';

/**
 * Modified Shepp–Logan (Toft 1996 intensities), analytic k-space on a 128² grid, noiseless,
 * R = 4 with a 12-line / 12×12 calibration centre, seed 1. The method defaults were chosen on the
 * 1974 phantom with seed 11 (src/recon/cs-tv.ts, lowrank-hankel.ts), not on this case.
 * Measured here (NRMSE / SSIM): random lines — zero-filled 0.344 / 0.635, cs-tv 0.134 / 0.916,
 * lowrank-hankel 0.154 / 0.922; Poisson-disc — zero-filled 0.446 / 0.358, cs-tv 0.072 / 0.942,
 * lowrank-hankel 0.103 / 0.808. Assertions keep slack on those margins (docs/references.md §5.2 sanity:
 * TV-CS ≈ 0.3× zero-filled NRMSE at R ≈ 4, [C]).
 */
const matrix = { nx: 128, ny: 128 };

async function run(
  pattern: 'cartesian-random' | 'poisson-disc',
  method: object,
  R = 4,
): Promise<ReconstructionOutcome> {
  return runReconstruction(
    {
      source: { phantom: 'shepp-logan-modified' },
      matrix,
      sampling: { pattern, acceleration: R, acs: 12, seed: 1 },
      method: method as never,
    },
    1,
  );
}

// Bounds: the measured NRMSE ratio (method / zero-filled) times 1.15 and the measured SSIM gain times
// 0.85 (ratios 0.391, 0.447, 0.161, 0.231; gains 0.281, 0.287, 0.584, 0.449). The case is seeded, so
// only a change of method moves these; 15 % leaves room for retuning without hiding a regression.
const margins = {
  'cartesian-random': {
    'cs-tv': { ratio: 0.45, ssimGain: 0.23 },
    'lowrank-hankel': { ratio: 0.52, ssimGain: 0.24 },
  },
  'poisson-disc': {
    'cs-tv': { ratio: 0.19, ssimGain: 0.49 },
    'lowrank-hankel': { ratio: 0.27, ssimGain: 0.38 },
  },
} as const;

describe('modified Shepp–Logan, analytic k-space, R = 4: regularised methods beat zero-filled', () => {
  for (const pattern of ['cartesian-random', 'poisson-disc'] as const) {
    it(`${pattern}: cs-tv and lowrank-hankel (defaults) have clearly lower NRMSE and higher SSIM`, async () => {
      const zf = await run(pattern, { name: 'zero-filled' });
      expect(zf.acceleration.actual).toBeGreaterThan(3.9);
      expect(zf.acceleration.actual).toBeLessThan(4.1);
      for (const name of ['cs-tv', 'lowrank-hankel'] as const) {
        const out = await run(pattern, { name });
        const { ratio, ssimGain } = margins[pattern][name];
        expect(out.metrics.nrmse / zf.metrics.nrmse).toBeLessThan(ratio);
        expect(out.metrics.ssim - zf.metrics.ssim).toBeGreaterThan(ssimGain);
      }
    });
  }

  it('zero-filled NRMSE grows with R (both patterns)', async () => {
    for (const pattern of ['cartesian-random', 'poisson-disc'] as const) {
      let previous = 0;
      for (const R of [1.5, 2, 3, 4, 6]) {
        const out = await run(pattern, { name: 'zero-filled' }, R);
        expect(out.metrics.nrmse).toBeGreaterThan(previous);
        previous = out.metrics.nrmse;
      }
    }
  });
});

describe('with noise (SNR 20), 64², Poisson-disc R = 4: the regularised methods still beat zero-filled', () => {
  // With noise exactness is gone; the check is that regularisation lowers the error versus
  // zero-filled (docs/references.md §5.3, common practice). Measured (seed 2, NRMSE / SSIM): zero-filled
  // 0.496 / 0.461, cs-tv 0.283 / 0.763, lowrank-hankel 0.206 / 0.793. (On random lines at this
  // small matrix lowrank-hankel gains only ≈ 7 %, so that case is reported, not asserted.)
  it('cs-tv and lowrank-hankel have lower NRMSE and higher SSIM than zero-filled', async () => {
    const request = (method: object) =>
      runReconstruction(
        {
          source: { phantom: 'shepp-logan-modified' },
          matrix: { nx: 64, ny: 64 },
          sampling: { pattern: 'poisson-disc', acceleration: 4, acs: 8, seed: 2 },
          noise: { snr: 20 },
          method: method as never,
        },
        2,
      );
    const zf = await request({ name: 'zero-filled' });
    // Measured ratio / gain: cs-tv 0.571 / 0.302, lowrank-hankel 0.415 / 0.332; bounds ×1.15 / ×0.85.
    for (const [name, ratio, ssimGain] of [
      ['cs-tv', 0.66, 0.25],
      ['lowrank-hankel', 0.48, 0.28],
    ] as const) {
      const out = await request({ name });
      expect(out.metrics.nrmse / zf.metrics.nrmse).toBeLessThan(ratio);
      expect(out.metrics.ssim - zf.metrics.ssim).toBeGreaterThan(ssimGain);
    }
  });
});
