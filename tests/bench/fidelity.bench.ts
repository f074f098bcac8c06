import { generateMask } from '../../sampling/index.ts';
import { createComplexImage } from '../../src/core/complex-image.ts';
import { phantomLesionSet, runLesionStudy } from '../../src/fidelity/index.ts';
import { getPhantom } from '../../src/phantoms/index.ts';
import type { ReconInput } from '../../src/recon/method.ts';
import { zeroFilledImage } from '../../src/recon/zero-filled.ts';
import { type BenchRow, medianMs } from './timing.ts';

/**
 * Cost of a lesion study at 256² (modified Shepp–Logan, 6 disc lesions of 4 px at 5 % contrast,
 * random lines R = 4 with 16 ACS rows, σ = mean object intensity / 30): the paired zero-filled
 * reconstructions plus 10 noise replicas, against one zero-filled reconstruction of prepared
 * data. Every run of the study also draws its noise (2·256² normals) and masks the data, which a
 * plain reconstruction of stored k-space does not; the known-σ path needs no replicas.
 */
export async function benchFidelity(): Promise<BenchRow[]> {
  const n = 256;
  const set = phantomLesionSet(getPhantom('shepp-logan-modified'), n, n, {
    count: 6,
    diameter: 4,
    contrast: 0.05,
    shape: 'disc',
    seed: 1,
  });
  const { mask } = generateMask(
    { nx: n, ny: n },
    { pattern: 'cartesian-random', acceleration: 4, acs: 16, seed: 1 },
  );
  const sigma = set.meanIntensity / 30;
  const reconstruct = (input: ReconInput) => zeroFilledImage(input).image;
  const kspace = createComplexImage(n, n);
  for (let i = 0; i < mask.length; i++) {
    if (!mask[i]) continue;
    kspace.data[2 * i] = set.without.data[2 * i];
    kspace.data[2 * i + 1] = set.without.data[2 * i + 1];
  }
  const one = await medianMs(() => reconstruct({ kspace, mask }), 9, 2);
  const base = { ...set, mask, sigma, seed: 3, reconstruct };
  const replicas = await medianMs(
    () => runLesionStudy({ ...base, noise: { kind: 'replicas', count: 10 } }),
    5,
    1,
  );
  const known = await medianMs(() => runLesionStudy({ ...base, noise: { kind: 'zero-filled' } }), 5, 1);
  const setup = await medianMs(
    () =>
      phantomLesionSet(getPhantom('shepp-logan-modified'), n, n, {
        count: 6,
        diameter: 4,
        contrast: 0.05,
        shape: 'disc',
        seed: 1,
      }),
    3,
    1,
  );
  return [
    { name: `zero-filled ${n}×${n}, one reconstruction`, medianMs: one },
    {
      name: `lesion study ${n}×${n}: paired + 10 replicas`,
      medianMs: replicas,
      note: `${(replicas / one).toFixed(1)}× one reconstruction (12 reconstructions + noise draws)`,
    },
    {
      name: `lesion study ${n}×${n}: paired, known σ`,
      medianMs: known,
      note: `${(known / one).toFixed(1)}× one reconstruction (2 reconstructions + 2 FFTs per lesion)`,
    },
    { name: `lesion set ${n}×${n}: phantom + 6 lesions, k-space and templates`, medianMs: setup },
  ];
}
