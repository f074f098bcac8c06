import { describe, expect, it } from 'vitest';
import { scoreAll } from '../../src/metrics/index.ts';
import { caseImages, fixtures, maskedCases } from './metric-fixtures.ts';

describe('scoreAll (fixtures by tests/reference/generate_fixtures.py: skimage and scipy.ndimage)', () => {
  const c = fixtures.cases[0];
  it(`${c.name}: all four metrics agree with the fixture`, () => {
    const { estimate, reference } = caseImages(c);
    const m = scoreAll(estimate, reference);
    expect(Math.abs(m.nrmse - c.nrmse)).toBeLessThanOrEqual(1e-10);
    expect(Math.abs(m.psnr - c.psnr)).toBeLessThanOrEqual(1e-4);
    expect(Math.abs(m.ssim - c.ssim)).toBeLessThanOrEqual(1e-4);
    expect(Math.abs(m.hfen - c.hfen)).toBeLessThanOrEqual(1e-6);
  });

  const masked = maskedCases[0];
  it(`${masked.name}: the region mask reaches every metric`, () => {
    const { estimate, reference, mask } = caseImages(masked);
    const m = scoreAll(estimate, reference, mask);
    expect(Math.abs(m.nrmse - masked.masked!.nrmse)).toBeLessThanOrEqual(1e-10);
    expect(Math.abs(m.psnr - masked.masked!.psnr)).toBeLessThanOrEqual(1e-4);
    expect(Math.abs(m.ssim - masked.masked!.ssim)).toBeLessThanOrEqual(1e-4);
    expect(Math.abs(m.hfen - masked.masked!.hfen)).toBeLessThanOrEqual(1e-6);
  });
});
