import { describe, expect, it } from 'vitest';
import { fft2c } from '../../src/core/centered-fft.ts';
import { defaultLimits } from '../../src/core/limits.ts';
import { createMultiCoilArray } from '../../src/encoding/index.ts';
import { pinnedReconstruction } from '../../src/pipeline/pinned-method.ts';
import { type MethodSpec, reconstruct, replicaReconstructor } from '../../src/recon/index.ts';
import { relativeError } from '../error-measures.ts';
import { lineMask } from '../recon/coil-problem.ts';
import { randomComplexImage } from '../recon/helpers.ts';

// Paired lesion runs and noise replicas must differ from the base run only in their data
// (docs/design.md §3.11 and the pseudo-replica definition): the base run's λ and the number of
// iterations it ran, with no early stop. Check: on the base data they reproduce the base image,
// which they can only do by running exactly the base run's iteration count.

const n = 32;
const image = randomComplexImage(n, n, 9);
const mask = lineMask(n, 'cartesian-random', 2, 4);
const kspace = fft2c(image);
for (let i = 0; i < mask.length; i++) if (!mask[i]) kspace.data.fill(0, 2 * i, 2 * i + 2);
const input = { kspace, mask };

type IterativeSpec = Extract<MethodSpec, { name: 'cs-tv' | 'cs-wavelet' }>;

const cases: IterativeSpec[] = [
  // A loose tolerance stops cs-tv well before its cap; cs-wavelet runs to its cap with cycle spinning.
  { name: 'cs-tv', lambda: 0.01, iterations: 300, tolerance: 1e-3 },
  { name: 'cs-wavelet', lambda: 0.01, tvLambda: 0.005, iterations: 300, tolerance: 1e-3 },
  { name: 'cs-wavelet', lambda: 0.01, iterations: 40 },
];

describe('paired runs and replicas reuse the base run’s λ and iterations run, without early stop', () => {
  for (const spec of cases) {
    it(`${JSON.stringify(spec)}`, () => {
      const base = reconstruct(input, spec);
      const ran = base.info.iterations as number;
      if (spec.tolerance) {
        expect(base.info.converged).toBe(true);
        expect(ran).toBeLessThan(spec.iterations as number);
      }
      const pinned = pinnedReconstruction(spec, base.info, { limits: defaultLimits });
      expect(pinned.description).toContain(`${ran} iterations, no early stop`);
      // λ goes through absolute and back (λ_abs / peak), so equal to rounding, not bit for bit.
      expect(relativeError(pinned.reconstruct(input).data, base.image.data)).toBeLessThan(1e-12);
      const replica = replicaReconstructor(input, spec, base.info, defaultLimits);
      const coil = createMultiCoilArray(1, n, n);
      coil.data.set(kspace.data);
      expect(relativeError(replica(coil, mask).data, base.image.data)).toBeLessThan(1e-12);
      // One iteration more or fewer gives another image: the count is what makes them equal.
      const other = reconstruct(input, { ...spec, iterations: ran + 1, tolerance: 0 });
      expect(relativeError(other.image.data, base.image.data)).toBeGreaterThan(1e-9);
    });
  }
});
