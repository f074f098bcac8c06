import { describe, expect, it } from 'vitest';
import { acquireRawLines, whitenedRawKspace } from '../../src/acquisition/index.ts';
import { checkPrewhitening } from '../../src/io/ismrmrd/import-raw-kspace.ts';

const coils = 4;
const nx = 64;
const ny = 64;

describe('acquireRawLines', () => {
  it('keeps the acquired lines exactly and zeros the rest when no noise is asked for', () => {
    const full = { coils, nx, ny, data: Float64Array.from({ length: 2 * coils * nx * ny }, (_, i) => i + 1) };
    const mask = new Uint8Array(nx * ny);
    for (let row = 0; row < ny; row += 2) mask.fill(1, row * nx, (row + 1) * nx);
    const out = acquireRawLines(full, mask, 0, 1);
    for (let c = 0; c < coils; c++) {
      for (let i = 0; i < nx * ny; i++) {
        const at = 2 * (c * nx * ny + i);
        expect(out.data[at]).toBe(mask[i] ? full.data[at] : 0);
        expect(out.data[at + 1]).toBe(mask[i] ? full.data[at + 1] : 0);
      }
    }
  });

  it('adds white noise of the requested σ per real channel, the same at a point whatever the mask', () => {
    const full = { coils, nx, ny, data: new Float64Array(2 * coils * nx * ny) };
    const all = new Uint8Array(nx * ny).fill(1);
    const sigma = 0.5;
    const noisy = acquireRawLines(full, all, sigma, 7);
    let sum = 0;
    for (const v of noisy.data) sum += v * v;
    // Sample standard deviation over N = 32 768 normals: standard error σ/√(2N) ≈ 0.002 (common practice).
    expect(Math.abs(Math.sqrt(sum / noisy.data.length) - sigma)).toBeLessThan(0.01);
    const half = new Uint8Array(nx * ny);
    half.fill(1, 0, (nx * ny) / 2);
    const part = acquireRawLines(full, half, sigma, 7);
    expect(part.data.subarray(0, nx * ny)).toEqual(noisy.data.subarray(0, nx * ny));
  });
});

describe('whitenedRawKspace', () => {
  it('multiplies every coil vector by L⁻¹ of Ψ = L·Lᴴ, and copies the data when Ψ is unknown', () => {
    // Ψ = [[4, 2], [2, 5]] (real): L = [[2, 0], [1, 2]]; L⁻¹·(2, 3) = (1, 1) (worked by hand).
    const covariance = Float64Array.of(4, 0, 2, 0, 2, 0, 5, 0);
    const kspace = { coils: 2, nx: 1, ny: 1, data: Float64Array.of(2, 0, 3, 0) };
    const white = whitenedRawKspace({ kspace, noiseCovariance: covariance });
    expect(Array.from(white.data)).toEqual([1, 0, 1, 0]);
    expect(Array.from(kspace.data)).toEqual([2, 0, 3, 0]);
    const copy = whitenedRawKspace({ kspace, noiseCovariance: null });
    expect(copy.data).not.toBe(kspace.data);
    expect(Array.from(copy.data)).toEqual([2, 0, 3, 0]);
  });

  it('refuses a covariance that is not positive definite, naming source.rawId', () => {
    const kspace = { coils: 2, nx: 1, ny: 1, data: new Float64Array(4) };
    const singular = Float64Array.of(1, 0, 1, 0, 1, 0, 1, 0);
    expect(() => whitenedRawKspace({ kspace, noiseCovariance: singular })).toThrow(/source\.rawId/);
  });
});

describe('checkPrewhitening (import of the noise scans)', () => {
  it('accepts a positive definite covariance and refuses a singular one naming file.data.noise', () => {
    expect(() => checkPrewhitening(Float64Array.of(4, 0, 2, 0, 2, 0, 5, 0), 2, 128)).not.toThrow();
    // One noise sample for two coils: rank one, Ψ = v·vᴴ.
    expect(() => checkPrewhitening(Float64Array.of(1, 0, 1, 0, 1, 0, 1, 0), 2, 1)).toThrow(
      /file\.data\.noise/,
    );
  });
});
