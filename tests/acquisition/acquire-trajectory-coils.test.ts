import { describe, expect, it } from 'vitest';
import { radialTrajectory } from '../../sampling/trajectories/radial-trajectory.ts';
import {
  acquireTrajectory,
  acquireTrajectoryCoils,
  type CoilSimulation,
  fullKspaceFromPhantom,
} from '../../src/acquisition/index.ts';
import {
  analyticCoilSamplesAt,
  CoilNoise,
  evaluateTrigPolynomial,
  fitTrigPolynomial,
} from '../../src/coils/index.ts';
import { complexFromReal } from '../../src/core/complex-image.ts';
import { createMultiCoilArray } from '../../src/encoding/index.ts';
import { nufftPlanFor } from '../../src/nufft/index.ts';
import { getPhantom } from '../../src/phantoms/index.ts';
import {
  arrayModel,
  COIL_FIT,
  imageCoilSimulation,
  phantomCoilSimulation,
} from '../../src/pipeline/coil-acquisition.ts';
import { relativeError } from '../error-measures.ts';
import { directNdft } from '../nufft/direct-ndft.ts';

// Receive-array samples on a non-Cartesian trajectory (docs/design.md §3.8). Independent checks:
// the direct non-uniform DFT of the coil image (tests/nufft/direct-ndft.ts, the defining sum), and
// the single-coil trajectory acquisition, which one coil with S = 1 must repeat bit for bit.

const side = 48;
const phantom = getPhantom('shepp-logan-modified');
const loopsSpec = { array: 'loops', count: 8, loopRadius: 0.35, ringRadius: 1.25 } as const;

/** The points of a Nyquist radial trajectory within |k| ≤ radius cycles per FOV. */
function centralPoints(radius: number) {
  const t = radialTrajectory({ side, spokes: 12, readoutOversampling: 1 });
  const kx: number[] = [];
  const ky: number[] = [];
  for (let i = 0; i < t.kx.length; i++) {
    if (Math.hypot(t.kx[i], t.ky[i]) <= radius) {
      kx.push(t.kx[i]);
      ky.push(t.ky[i]);
    }
  }
  return { kx: Float64Array.from(kx), ky: Float64Array.from(ky) };
}

describe('receive-array samples at trajectory points', () => {
  it('analytic coil samples match the direct NDFT of (fitted map × fine raster) at low frequencies', () => {
    const model = arrayModel(loopsSpec, side, side);
    const simulation = phantomCoilSimulation({ phantom, nx: side, ny: side, mode: 'analytic', ...model });
    const { kx, ky } = centralPoints(8);
    const samples = simulation.kspaceAt?.(kx, ky) as Float64Array;
    // The same fit the simulation makes, evaluated on a 4× finer grid, times a supersampled raster:
    // a quadrature of ∫ S_fit·f e^(−i2πk·x) dx that never uses the shift formula.
    const fine = 4 * side;
    const fit = fitTrigPolynomial(model.maps, { order: COIL_FIT.order, periodFactor: COIL_FIT.periodFactor });
    const fineMaps = evaluateTrigPolynomial(fit, fine, fine);
    const raster = phantom.rasterize(fine, fine, { supersample: 8 });
    const n = fine * fine;
    const count = kx.length;
    const worst = { fit: 0, arrayMaps: 0 };
    const trueFine = arrayModel(loopsSpec, fine, fine).maps;
    for (let c = 0; c < loopsSpec.count; c++) {
      const analytic = samples.subarray(2 * c * count, 2 * (c + 1) * count);
      for (const [key, maps] of [
        ['fit', fineMaps],
        ['arrayMaps', trueFine],
      ] as const) {
        const image = complexFromReal(raster.data, fine, fine);
        for (let i = 0; i < n; i++) {
          const sr = maps.data[2 * (c * n + i)];
          const si = maps.data[2 * (c * n + i) + 1];
          const v = image.data[2 * i];
          image.data[2 * i] = sr * v;
          image.data[2 * i + 1] = si * v;
        }
        // Orthonormal scale √(N²)/4·K: the fine grid's NDFT is fine/side times the simulation's.
        const direct = directNdft(image, kx, ky).map((v) => (v * side) / fine);
        worst[key] = Math.max(worst[key], relativeError(analytic, direct));
      }
    }
    // Against the same fitted maps only the raster quadrature differs: measured 5.9e-4.
    expect(worst.fit).toBeLessThan(1e-3);
    // Against the array's own maps the fit error adds (fitError 0.63 % over the object): measured 3.3e-3.
    expect(worst.arrayMaps).toBeLessThan(worst.fit + 2 * (simulation.fitError as number));
  });

  it('uploads: the NUFFT of S_c·x agrees with the direct NDFT to the NUFFT accuracy (inverse crime)', () => {
    const image = phantom.rasterize(side, side, { supersample: 4 });
    const model = arrayModel(loopsSpec, side, side);
    const simulation = imageCoilSimulation(image, model.maps, model.noise);
    const t = radialTrajectory({ side, spokes: 16 });
    const plan = nufftPlanFor(t, side, side);
    const out = acquireTrajectoryCoils(simulation, t, plan, undefined, 1);
    expect(out.inverseCrime).toBe(true);
    const n = side * side;
    for (const c of [0, 5]) {
      const coil = complexFromReal(image.data, side, side);
      for (let i = 0; i < n; i++) {
        const v = coil.data[2 * i];
        coil.data[2 * i] = model.maps.data[2 * (c * n + i)] * v;
        coil.data[2 * i + 1] = model.maps.data[2 * (c * n + i) + 1] * v;
      }
      const direct = directNdft(coil, t.kx, t.ky);
      const nufft = out.samples.data.subarray(2 * c * plan.count, 2 * (c + 1) * plan.count);
      // W = 4, α = 2: expected relative error 6.3e-4 (src/nufft/accuracy-table.ts).
      expect(relativeError(nufft, direct)).toBeLessThan(2 * plan.expectedRelativeError);
    }
  });

  it('one coil with S = 1 repeats the single-coil trajectory samples and noise bit for bit', () => {
    const full = fullKspaceFromPhantom(phantom, side, side);
    const t = radialTrajectory({ side, spokes: 30 });
    const plan = nufftPlanFor(t, side, side);
    const unit = { coils: 1, order: 0, periodFactor: 2, coefficients: Float64Array.of(1, 0) };
    const maps = createMultiCoilArray(1, side, side);
    for (let i = 0; i < side * side; i++) maps.data[2 * i] = 1;
    const simulation: CoilSimulation = {
      kspace: { coils: 1, ...full.kspace },
      maps,
      noise: CoilNoise.ring(1, 0),
      reference: full.reference,
      objectMask: full.objectMask,
      inverseCrime: false,
      kspaceAt: (kx, ky) => analyticCoilSamplesAt(phantom, unit, kx, ky, side, side),
    };
    for (const noise of [undefined, { snr: 20 }]) {
      const single = acquireTrajectory(full, t, plan, noise, 77);
      const coils = acquireTrajectoryCoils(simulation, t, plan, noise, 77);
      expect(coils.sigma).toBe(single.sigma);
      expect(coils.coilSigma).toBe(single.sigma);
      expect(Buffer.from(coils.samples.data.buffer).equals(Buffer.from(single.samples.buffer))).toBe(true);
    }
  });

  it('correlated coil noise: prewhitened samples have white unit-diagonal noise of σ_c', () => {
    const spec = { ...loopsSpec, correlation: 0.3 };
    const model = arrayModel(spec, side, side);
    const simulation = phantomCoilSimulation({ phantom, nx: side, ny: side, mode: 'analytic', ...model });
    const t = radialTrajectory({ side, spokes: 60 });
    const plan = nufftPlanFor(t, side, side);
    const out = acquireTrajectoryCoils(simulation, t, plan, { snr: 10 }, 5);
    // Noise after prewhitening is CN(0, 2σ_c²I): per real channel σ_c in every coil, uncorrelated.
    const count = plan.count;
    const noise = out.samples.data.map((v, i) => v - out.full.data[i]);
    for (const c of [0, 3]) {
      let power = 0;
      for (let i = 0; i < 2 * count; i++) power += noise[2 * c * count + i] ** 2;
      expect(Math.sqrt(power / (2 * count)) / out.coilSigma).toBeCloseTo(1, 1);
    }
    let cross = 0;
    for (let i = 0; i < 2 * count; i++) cross += noise[i] * noise[2 * count + i];
    // The sample correlation of N independent pairs has standard deviation 1/√N: five of them.
    expect(Math.abs(cross / (2 * count)) / out.coilSigma ** 2).toBeLessThan(5 / Math.sqrt(2 * count));
  });
});
