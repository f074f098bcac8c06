import { createComplexImage } from '../../src/core/complex-image.ts';
import {
  DEFAULT_LESION_REPLICAS,
  type LesionSpec,
  phantomLesionSet,
  runLesionStudy,
} from '../../src/fidelity/index.ts';
import { getPhantom } from '../../src/phantoms/index.ts';
import { planCells } from '../../src/plan/plan-cells.ts';
import { runCell } from '../../src/plan/run-cell.ts';
import { validatePlan } from '../../src/plan/validate-plan.ts';
import type { ReconInput } from '../../src/recon/method.ts';
import { zeroFilledImage } from '../../src/recon/zero-filled.ts';
import { sheppLoganLesionCase } from '../fidelity/lesion-case.ts';
import { type BenchRow, medianMs, medianWallAndCpuMs } from './timing.ts';

/**
 * Cost of a lesion study at 256² (modified Shepp–Logan, 6 disc lesions of 4 px at 5 % contrast,
 * random lines R = 4 with 16 ACS rows, σ = mean object intensity / 30): the paired zero-filled
 * reconstructions plus 10 noise replicas, against one zero-filled reconstruction of prepared
 * data. Every run of the study also draws its noise (2·256² normals) and masks the data, which a
 * plain reconstruction of stored k-space does not; the known-σ path needs no replicas.
 */
export async function benchFidelity(): Promise<BenchRow[]> {
  const n = 256;
  const lesions: LesionSpec = { count: 6, diameter: 4, contrast: 0.05, shape: 'disc', seed: 1 };
  const { set, mask, sigma } = sheppLoganLesionCase(n, lesions, { acceleration: 4, acs: 16, seed: 1 });
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
    () => phantomLesionSet(getPhantom('shepp-logan-modified'), n, n, lesions),
    3,
    1,
  );
  return [
    ...(await benchLesionCells()),
    { name: `zero-filled ${n}×${n}, one reconstruction`, medianMs: one },
    {
      name: `lesion study ${n}×${n}: paired + 10 replicas`,
      medianMs: replicas,
      note: `${(replicas / one).toFixed(1)}× one reconstruction (12 reconstructions + noise draws)`,
    },
    {
      name: `lesion study ${n}×${n}: paired, known σ`,
      medianMs: known,
      note: `${(known / one).toFixed(1)}× one reconstruction (2 reconstructions + one noise-kernel FFT)`,
    },
    { name: `lesion set ${n}×${n}: phantom + 6 lesions, k-space and templates`, medianMs: setup },
  ];
}

/**
 * The cost of a lesion study per plan cell: one cell (acquisition, reconstruction, scoring) with
 * `lesions` (6 discs of 3 px, 5 %) against the same cell without, at 256², random lines R = 4 with
 * 24 ACS rows, from one run. The study shares the base run (its image is the lesion-free run, its
 * noise draw the with-lesion run's), so it adds one reconstruction, plus the replicas where the
 * noise is not known in closed form (every method but zero-filled, default count) and its own
 * bookkeeping. Each case reports the ratio of medians in CPU time (this process, all threads: the
 * cost) and in wall time, against the goal of at most 3× the plain cell (docs/design.md §3.11,
 * "Cost of a lesion study").
 */
async function benchLesionCells(): Promise<BenchRow[]> {
  const lesions = { count: 6, diameter: 3, contrast: 0.05 };
  const cases = [
    { label: 'zero-filled, SNR 40 (known σ)', method: { name: 'zero-filled' }, noise: { snr: 40 } },
    { label: 'cs-tv 30 iterations, noiseless', method: { name: 'cs-tv', iterations: 30 }, noise: undefined },
    {
      label: `cs-tv 30 iterations, SNR 40 (${DEFAULT_LESION_REPLICAS} replicas, the default)`,
      method: { name: 'cs-tv', iterations: 30 },
      noise: { snr: 40 },
    },
  ];
  const goal = 3;
  const rows: BenchRow[] = [];
  for (const { label, method, noise } of cases) {
    const body = (withLesions: boolean) => ({
      source: { phantom: 'shepp-logan-modified' },
      matrix: { nx: 256, ny: 256 },
      protocol: { trMs: 500 },
      patterns: [{ pattern: 'cartesian-random', acs: 24 }],
      accelerations: [4],
      methods: [method],
      seeds: 1,
      ...(noise ? { noise } : {}),
      ...(withLesions ? { lesions } : {}),
    });
    const plain = await validatePlan(body(false));
    const studied = await validatePlan(body(true));
    const runs = method.name === 'zero-filled' ? 7 : 3;
    const without = await medianWallAndCpuMs(() => runCell(plain, planCells(plain)[1]), runs, 1);
    const withStudy = await medianWallAndCpuMs(() => runCell(studied, planCells(studied)[1]), runs, 1);
    const cpuRatio = withStudy.cpuMs / without.cpuMs;
    const wallRatio = withStudy.wallMs / without.wallMs;
    rows.push(
      {
        name: `plan cell 256², ${label}`,
        medianMs: without.wallMs,
        note: `CPU ${without.cpuMs.toFixed(0)} ms`,
      },
      {
        name: `plan cell 256², ${label}, with 6 lesions`,
        medianMs: withStudy.wallMs,
        note:
          `lesion study cell / plain cell: ${cpuRatio.toFixed(2)}× CPU, ${wallRatio.toFixed(2)}× wall ` +
          `(CPU ${withStudy.cpuMs.toFixed(0)} ms); goal ≤ ${goal}×: ${cpuRatio <= goal ? 'met' : 'not met'}`,
      },
    );
  }
  return rows;
}
