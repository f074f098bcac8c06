import { describe, expect, it } from 'vitest';
import { acquire, acquireCoils, fullKspaceFromPhantom } from '../../src/acquisition/index.ts';
import { ifft2c } from '../../src/core/centered-fft.ts';
import type { ComplexImage } from '../../src/core/complex-image.ts';
import { getPhantom } from '../../src/phantoms/index.ts';
import { arrayModel, phantomCoilSimulation } from '../../src/pipeline/coil-acquisition.ts';
import { coilImages, combineCoilImages } from '../../src/recon/index.ts';

// SNR keeps its single-coil meaning (docs/design.md §3.5, §3.8): σ = mean |x| over the object / SNR per
// real channel of the optimally combined fully sampled image (Roemer et al. 1990 combination on
// prewhitened data). Measured here from noise alone: (noisy − noiseless) combined image over the object.

const nx = 48;
const ny = 48;
const phantom = getPhantom('shepp-logan-modified');
const everything = new Uint8Array(nx * ny).fill(1);

/** √(mean over the object of (re² + im²)/2): the per-real-channel noise σ of `noisy` against `clean`. */
function measuredSigma(noisy: ComplexImage, clean: ComplexImage, objectMask: Uint8Array): number {
  let sum = 0;
  let count = 0;
  for (let i = 0; i < objectMask.length; i++) {
    if (!objectMask[i]) continue;
    sum +=
      (noisy.data[2 * i] - clean.data[2 * i]) ** 2 + (noisy.data[2 * i + 1] - clean.data[2 * i + 1]) ** 2;
    count++;
  }
  return Math.sqrt(sum / (2 * count));
}

function loops(correlation: number) {
  const model = arrayModel(
    { array: 'loops', count: 8, loopRadius: 0.35, ringRadius: 1.25, correlation },
    nx,
    ny,
  );
  return phantomCoilSimulation({ phantom, nx, ny, mode: 'analytic', ...model });
}

describe('acquireCoils: SNR of the combined image', () => {
  const snr = 20;

  it('1 coil and 8 loops (independent and correlated noise) give the requested σ in the combined image', () => {
    const single = fullKspaceFromPhantom(phantom, nx, ny);
    const one = acquire(single, everything, { snr }, 11);
    const sigmaOne = measuredSigma(ifft2c(one.kspace), single.reference, single.objectMask);
    const measured: number[] = [sigmaOne / one.sigma];
    for (const correlation of [0, 0.3]) {
      const simulation = loops(correlation);
      const acquired = acquireCoils(simulation, everything, { snr }, 11);
      const combined = combineCoilImages(coilImages(acquired.kspace), acquired.maps).image;
      measured.push(measuredSigma(combined, simulation.reference, simulation.objectMask) / acquired.sigma);
      // The target σ itself is the single-coil definition on the multi-coil reference.
      expect(acquired.sigma).toBeGreaterThan(0);
    }
    // Measured ratios 1.031 (1 coil), 1.017 (8 loops, ρ = 0), 1.017 (8 loops, ρ = 0.3; prewhitening
    // turns the same seed into the same white draws). A σ estimate from 1004 object pixels × 2 channels
    // has a relative sd of about 1/√(4·1004) ≈ 1.6 %: 6 % allowed.
    for (const ratio of measured) expect(Math.abs(ratio - 1)).toBeLessThan(0.06);
  });

  it('noiseless: σ = 0 and the fully sampled combination is the reference to rounding', () => {
    const simulation = loops(0);
    const acquired = acquireCoils(simulation, everything, undefined, 1);
    expect(acquired.sigma).toBe(0);
    const combined = combineCoilImages(coilImages(acquired.kspace), acquired.maps).image;
    expect(measuredSigma(combined, simulation.reference, everything)).toBeLessThan(1e-12);
  });

  it('prewhitening makes correlated coil noise white: the sample covariance is σ_c²·I within sampling error', () => {
    const simulation = loops(0.3);
    const acquired = acquireCoils(simulation, everything, { snr: 5 }, 3);
    const noiseless = acquireCoils(simulation, everything, undefined, 3);
    const n = nx * ny;
    const C = 8;
    let worstOff = 0;
    let worstDiag = 0;
    for (let a = 0; a < C; a++) {
      for (let b = 0; b < C; b++) {
        let re = 0;
        let im = 0;
        for (let i = 0; i < n; i++) {
          const pa = 2 * (a * n + i);
          const pb = 2 * (b * n + i);
          const ar = acquired.kspace.data[pa] - noiseless.kspace.data[pa];
          const ai = acquired.kspace.data[pa + 1] - noiseless.kspace.data[pa + 1];
          const br = acquired.kspace.data[pb] - noiseless.kspace.data[pb];
          const bi = acquired.kspace.data[pb + 1] - noiseless.kspace.data[pb + 1];
          re += ar * br + ai * bi;
          im += ai * br - ar * bi;
        }
        const scale = 2 * n * acquired.coilSigma ** 2; // E[n·nᴴ] = 2σ_c² per complex sample
        if (a === b) worstDiag = Math.max(worstDiag, Math.abs(re / scale - 1));
        else worstOff = Math.max(worstOff, Math.hypot(re, im) / scale);
      }
    }
    // Measured: diagonal within 0.039 of 1, off-diagonal ≤ 0.034 (unwhitened, neighbours sit at ρ = 0.3);
    // 2304 samples give a sampling sd of about 1/√2304 ≈ 0.021: 0.1 allowed.
    expect(worstDiag).toBeLessThan(0.1);
    expect(worstOff).toBeLessThan(0.1);
  });
});
