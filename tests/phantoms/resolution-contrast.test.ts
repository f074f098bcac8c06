import { describe, expect, it } from 'vitest';
import { Ellipse } from '../../src/phantoms/ellipse.ts';
import { Rectangle } from '../../src/phantoms/rectangle.ts';
import {
  barGroupCentres,
  RESOLUTION_CONTRAST_LAYOUT as LAYOUT,
  resolutionContrast,
} from '../../src/phantoms/resolution-contrast.ts';

// On a 500-pixel side the pixel centres are x = (j − 250)·0.004, y = −(i − 250)·0.004 (docs/design.md §3.3),
// so every design coordinate below (multiples of 0.02) falls on a pixel centre.
const N = 500;
const colOf = (x: number) => Math.round(250 + x / 0.004);
const rowOf = (y: number) => Math.round(250 - y / 0.004);

describe('resolution-contrast phantom', () => {
  const phantom = resolutionContrast();
  const image = phantom.rasterize(N, N);
  const at = (x: number, y: number) => image.data[rowOf(y) * N + colOf(x)];

  it('is built from one background disc, 2 × 5 groups of 4 bars and 3 × 4 discs', () => {
    const rectangles = phantom.shapes.filter((s) => s instanceof Rectangle);
    const ellipses = phantom.shapes.filter((s) => s instanceof Ellipse);
    expect(rectangles.length).toBe(40);
    expect(ellipses.length).toBe(13);
  });

  it('K(0) equals Σ intensity × area of its shapes (π r² for discs, w × length for bars; docs/references.md §1.2/§1.5)', () => {
    const { background, bars, discs } = LAYOUT;
    let expected = background.intensity * Math.PI * background.radius ** 2;
    for (const w of bars.widths) expected += 2 * bars.perGroup * bars.intensity * w * bars.length;
    for (const c of discs.contrasts)
      for (const r of discs.radii) expected += c * background.intensity * Math.PI * r * r;
    const k0 = phantom.kspaceAt([0], [0]);
    expect(Math.abs(k0[0] - expected)).toBeLessThan(1e-14);
    expect(k0[1]).toBe(0);
    // Midpoint-rule integral of an 8× supersampled raster (independent numerical integration).
    const fine = phantom.rasterize(256, 256, { supersample: 8 });
    const integral = fine.data.reduce((s, v) => s + v, 0) * (2 / 256) ** 2;
    expect(Math.abs(integral - expected) / expected).toBeLessThan(1e-3);
  });

  it('keeps every feature inside the background disc and features apart (max raster value = bar level 1.0)', () => {
    const radius = LAYOUT.background.radius;
    let peak = 0;
    let outsideNonZero = 0;
    let insideBelowBackground = 0;
    for (let i = 0; i < N; i++) {
      for (let j = 0; j < N; j++) {
        const v = image.data[i * N + j];
        peak = Math.max(peak, v);
        const r = Math.hypot((j - 250) * 0.004, -(i - 250) * 0.004);
        if (r > radius + 1e-9) outsideNonZero += v !== 0 ? 1 : 0;
        else insideBelowBackground += v < LAYOUT.background.intensity - 1e-12 ? 1 : 0;
      }
    }
    expect(outsideNonZero).toBe(0);
    expect(insideBelowBackground).toBe(0);
    expect(peak).toBeCloseTo(LAYOUT.background.intensity + LAYOUT.bars.intensity, 12);
    expect(peak).toBeCloseTo(1, 12);
  });

  it('shows each line-pair group as 4 bars along x (upper row) and 4 bars along y (middle row) at n = 500', () => {
    const { widths, perGroup, alongXCentreY, alongYCentreY, length } = LAYOUT.bars;
    const threshold = LAYOUT.background.intensity + 0.5 * LAYOUT.bars.intensity;
    const runsAbove = (values: number[]) =>
      values.filter((v, k) => v > threshold && (k === 0 || values[k - 1] <= threshold)).length;
    barGroupCentres().forEach((cx, g) => {
      const half = (perGroup - 0.5) * widths[g] + 0.02;
      const alongX: number[] = [];
      for (let j = colOf(cx - half); j <= colOf(cx + half); j++)
        alongX.push(image.data[rowOf(alongXCentreY) * N + j]);
      expect(runsAbove(alongX)).toBe(perGroup);
      const alongY: number[] = [];
      for (let i = rowOf(alongYCentreY + half); i <= rowOf(alongYCentreY - half); i++)
        alongY.push(image.data[i * N + colOf(cx)]);
      expect(runsAbove(alongY)).toBe(perGroup);
      // Bars are `length` long: present at the centre line, absent just beyond their ends.
      expect(at(cx, alongXCentreY + 0.5 * length + 0.012) < threshold).toBe(true);
    });
  });

  it('bar widths decrease and straddle the pixel sizes of 128 and 256 grids (w ≥ 2/n to resolve, docs/references.md §1.5)', () => {
    const { widths } = LAYOUT.bars;
    // DEVELOPERS.md: bar groups 0.05 → 0.01 units wide.
    expect([widths[0], widths.at(-1)]).toEqual([0.05, 0.01]);
    for (let g = 1; g < widths.length; g++) expect(widths[g]).toBeLessThan(widths[g - 1]);
    expect(widths.filter((w) => w >= 2 / 128).length).toBe(3); // the two finest are below 2/128
    expect(widths.every((w) => w >= 2 / 256)).toBe(true);
  });

  it('has discs 10 %, 5 %, 2.5 % above the background at their centres, sizes decreasing along each row', () => {
    const { discs, background } = LAYOUT;
    expect(discs.contrasts).toEqual([0.1, 0.05, 0.025]); // DEVELOPERS.md
    discs.rowsY.forEach((y, row) => {
      discs.columnsX.forEach((x) => {
        expect(at(x, y)).toBeCloseTo(background.intensity * (1 + discs.contrasts[row]), 12);
      });
    });
    for (let c = 1; c < discs.radii.length; c++) expect(discs.radii[c]).toBeLessThan(discs.radii[c - 1]);
    // Just outside the largest disc of the top row the background returns.
    expect(at(discs.columnsX[0] + discs.radii[0] + 0.012, discs.rowsY[0])).toBeCloseTo(
      background.intensity,
      12,
    );
  });

  it('is Hermitian, K(−k) = conj K(k) (real object; docs/references.md §1.2, 1e-12)', () => {
    const kx = [0.5, -3.25, 11.5, 40, 7.3];
    const ky = [0, 2.5, -9, 0.5, -64.1];
    const plus = phantom.kspaceAt(kx, ky);
    const minus = phantom.kspaceAt(
      kx.map((k) => -k),
      ky.map((k) => -k),
    );
    for (let i = 0; i < kx.length; i++) {
      expect(Math.abs(plus[2 * i] - minus[2 * i])).toBeLessThan(1e-12);
      expect(Math.abs(plus[2 * i + 1] + minus[2 * i + 1])).toBeLessThan(1e-12);
    }
  });
});
