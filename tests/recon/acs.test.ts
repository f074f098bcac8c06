import { describe, expect, it } from 'vitest';
import { generateMask } from '../../sampling/index.ts';
import { requireAcsBlock } from '../../src/recon/acs-region.ts';
import { estimateAcsMaps, findAcsBlock } from '../../src/recon/index.ts';
import { caughtValidationError } from '../core/caught-validation-error.ts';
import { encodedKspace, loopMaps, phantomRaster, uniformLines } from './coil-helpers.ts';
import { fullMask } from './helpers.ts';

describe('ACS block: the largest fully sampled centred rectangle (Griswold et al. 2002; docs/references.md §3.2)', () => {
  it('uniform lines with 24 ACS rows: the ACS rows plus the regular row that touches them', () => {
    // Rows 52…75 are the ACS (centredBlockStart(128, 24) = 52); at R = 4 the nearest regular rows are
    // 48 and 76 (offsets ±16 and +12 from row 64): 76 is adjacent, 48 is not.
    expect(findAcsBlock(uniformLines(128, 4, 24), 128, 128)).toEqual({
      rowStart: 52,
      rows: 25,
      colStart: 0,
      cols: 128,
    });
    // R = 3 without ACS: rows 64 ± 3k, no two adjacent, so one row.
    expect(findAcsBlock(uniformLines(96, 3, 0), 96, 96)).toEqual({
      rowStart: 48,
      rows: 1,
      colStart: 0,
      cols: 96,
    });
  });

  it('a Poisson-disc mask holds at least its acs × acs square; a full mask is one block', () => {
    const sampled = generateMask(
      { nx: 64, ny: 64 },
      { pattern: 'poisson-disc', acceleration: 4, acs: 16, seed: 2 },
    );
    const block = findAcsBlock(sampled.mask, 64, 64);
    expect(block).not.toBeNull();
    expect((block?.rows ?? 0) * (block?.cols ?? 0)).toBeGreaterThanOrEqual(256);
    expect(block?.rowStart).toBeLessThanOrEqual(24);
    expect((block?.rowStart ?? 0) + (block?.rows ?? 0)).toBeGreaterThanOrEqual(40);
    expect(findAcsBlock(fullMask(20, 12), 20, 12)).toEqual({ rowStart: 0, rows: 12, colStart: 0, cols: 20 });
  });

  it('no centre sample: no block; too small a block is refused naming sampling.acs', () => {
    const mask = fullMask(16, 16);
    mask[8 * 16 + 8] = 0;
    expect(findAcsBlock(mask, 16, 16)).toBeNull();
    const error = caughtValidationError(() => requireAcsBlock(uniformLines(64, 2, 0), 64, 64, 4, 4, 'SENSE'));
    expect(error.problems[0].field).toBe('sampling.acs');
  });

  it('ACS maps of noiseless data: Σ|S_c|² = 1 on their support and S_c ∝ the true map up to one phase per pixel', () => {
    const n = 64;
    const maps = loopMaps(n);
    const mask = uniformLines(n, 2, 24);
    const y = encodedKspace(phantomRaster(n), mask, maps);
    const block = findAcsBlock(mask, n, n);
    if (!block) throw new Error('no ACS block');
    const estimate = estimateAcsMaps(y, block);
    const px = n * n;
    let inside = 0;
    let worstNorm = 0;
    let worstAngle = 0;
    for (let i = 0; i < px; i++) {
      let power = 0;
      let re = 0;
      let im = 0;
      for (let c = 0; c < 8; c++) {
        const k = 2 * (c * px + i);
        power += estimate.data[k] ** 2 + estimate.data[k + 1] ** 2;
        // ⟨S_true, S_est⟩ = Σ conj(S_true)·S_est: magnitude 1 when the two differ by a phase only.
        re += maps.data[k] * estimate.data[k] + maps.data[k + 1] * estimate.data[k + 1];
        im += maps.data[k] * estimate.data[k + 1] - maps.data[k + 1] * estimate.data[k];
      }
      if (power === 0) continue;
      inside++;
      worstNorm = Math.max(worstNorm, Math.abs(power - 1));
      worstAngle = Math.max(worstAngle, 1 - Math.hypot(re, im));
    }
    expect(inside).toBeGreaterThan(0.5 * px);
    expect(worstNorm).toBeLessThan(1e-12);
    // Low-resolution maps blur across edges: measured worst 1 − |⟨S, Ŝ⟩| = 0.247 (at object edges), a known limit of low-resolution maps.
    expect(worstAngle).toBeLessThan(0.27);
  });
});
