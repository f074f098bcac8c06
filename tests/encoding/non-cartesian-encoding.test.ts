import { describe, expect, it } from 'vitest';
import { radialTrajectory } from '../../sampling/trajectories/radial-trajectory.ts';
import { coilArrayMaps } from '../../src/coils/index.ts';
import { createComplexImage } from '../../src/core/complex-image.ts';
import { SeededRandom } from '../../src/core/random.ts';
import { NonCartesianEncoding } from '../../src/encoding/index.ts';
import { nufftPlanFor } from '../../src/nufft/plan-cache.ts';
import { inner } from './helpers.ts';

function randomFill(data: Float64Array, seed: number): Float64Array {
  const rng = new SeededRandom(seed);
  for (let i = 0; i < data.length; i++) data[i] = rng.normal();
  return data;
}

describe('the trajectory encoding operator E = {A S_c}', () => {
  const side = 24;
  const plan = nufftPlanFor(radialTrajectory({ side, spokes: 19, ordering: 'golden' }), side, side);

  it.each([
    ['one coil', undefined],
    [
      'four loops',
      coilArrayMaps({ array: 'loops', count: 4, loopRadius: 0.35, ringRadius: 1.25 }, side, side),
    ],
  ])('%s: ⟨Ex, y⟩ = ⟨x, Eᴴy⟩ to 1e-10 (adjoint identity), EᴴE = Eᴴ(E·)', (_name, maps) => {
    const E = new NonCartesianEncoding(plan, maps);
    const x = createComplexImage(side, side);
    randomFill(x.data, 1);
    const y = E.createData();
    randomFill(y.data, 2);
    const [lr, li] = inner(E.forward(x).data, y.data);
    const [rr, ri] = inner(x.data, E.adjoint(y).data);
    const scale = Math.hypot(lr, li);
    expect(Math.abs(lr - rr) / scale).toBeLessThan(1e-10);
    expect(Math.abs(li - ri) / scale).toBeLessThan(1e-10);
    const viaParts = E.adjoint(E.forward(x));
    const normal = E.normal(x);
    for (let i = 0; i < normal.data.length; i++) expect(normal.data[i]).toBeCloseTo(viaParts.data[i], 12);
  });

  it('one coil without maps is the NUFFT itself', () => {
    const E = new NonCartesianEncoding(plan);
    const x = createComplexImage(side, side);
    randomFill(x.data, 5);
    expect(E.forward(x).data).toEqual(plan.forward(x));
  });
});
