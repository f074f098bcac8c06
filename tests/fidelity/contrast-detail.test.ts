import { describe, expect, it } from 'vitest';
import { generateMask } from '../../sampling/index.ts';
import { ifft2c } from '../../src/core/centered-fft.ts';
import {
  contrastDetailCells,
  contrastDetailCurve,
  type LesionStudy,
  objectSupport,
  runLesionStudy,
} from '../../src/fidelity/index.ts';
import {
  contrastDetail,
  contrastDetailBackground,
  CONTRAST_DETAIL_LAYOUT as LAYOUT,
} from '../../src/phantoms/contrast-detail.ts';
import { getPhantom, phantomGridKspace } from '../../src/phantoms/index.ts';
import { zeroFilledImage } from '../../src/recon/zero-filled.ts';

describe('contrast-detail phantom', () => {
  it('is in the catalogue: a square background and a 5 × 5 grid of discs, K(0) = Σ intensity × area (closed forms)', () => {
    const phantom = getPhantom('contrast-detail');
    expect(phantom.name).toBe('contrast-detail');
    let expected = LAYOUT.background.width ** 2 * LAYOUT.background.intensity;
    for (const c of LAYOUT.contrasts)
      for (const d of LAYOUT.diameters) expected += c * Math.PI * (d / 2) ** 2;
    const k0 = phantom.kspaceAt([0], [0]);
    expect(Math.abs(k0[0] - expected)).toBeLessThan(1e-14);
    expect(contrastDetail().shapes).toHaveLength(26);
  });

  it('puts each disc on a pixel centre at 128², background 1 plus its contrast there (rows: contrast, columns: diameter)', () => {
    const n = 128;
    const raster = contrastDetail().rasterize(n, n);
    LAYOUT.contrasts.forEach((c, row) => {
      LAYOUT.diameters.forEach((_, col) => {
        const i = 64 - LAYOUT.positions[row] * -64;
        const j = 64 + LAYOUT.positions[col] * 64;
        expect(Number.isInteger(i) && Number.isInteger(j)).toBe(true);
        expect(raster.data[i * n + j]).toBeCloseTo(1 + c, 14);
      });
    });
    expect(raster.data[0]).toBe(0);
  });
});

describe('contrast–detail curve', () => {
  const n = 128;
  const cells = contrastDetailCells(n, n);
  const without = phantomGridKspace(contrastDetailBackground(), n, n);
  const withLesions = phantomGridKspace(contrastDetail(), n, n);
  const reference = ifft2c(without);
  const { mask: objectMask } = objectSupport(reference);
  const sigma = 0.05;
  function study(mask: Uint8Array): LesionStudy {
    return runLesionStudy({
      without,
      withLesions,
      reference,
      objectMask,
      lesions: cells.map((c) => c.lesion),
      templates: cells.map((c) => c.template),
      mask,
      sigma,
      seed: 3,
      noise: { kind: 'zero-filled' },
      reconstruct: (input) => zeroFilledImage(input).image,
    });
  }

  it('the cells are the phantom: with − without = Σ templates exactly (linearity of the analytic k-space)', () => {
    const difference = ifft2c(withLesions);
    for (let i = 0; i < difference.data.length; i++) difference.data[i] -= reference.data[i];
    let worst = 0;
    for (let i = 0; i < difference.data.length; i++) {
      let sum = 0;
      for (const c of cells) sum += c.template.data[i];
      worst = Math.max(worst, Math.abs(difference.data[i] - sum));
    }
    // Measured 1.1e-15.
    expect(worst).toBeLessThan(1e-12);
  });

  it('full sampling: each disc CNR = Σ_disc t/(σ√n) (Rose), and the curve is the smallest contrast of the unbroken resolved run per diameter', () => {
    const full = new Uint8Array(n * n).fill(1);
    const result = study(full);
    // By hand: zero-filled at full sampling returns the data, so r = t + (noise cancels in the
    // pair), the disc sum's noise SD is σ√n (white noise, Parseval).
    const response = ifft2c(withLesions);
    for (let i = 0; i < response.data.length; i++) response.data[i] -= reference.data[i];
    const expectedResolved = cells.map((c, i) => {
      let sum = 0;
      let count = 0;
      const r = c.lesion.diameter / 2;
      for (let di = -Math.floor(r); di <= Math.floor(r); di++) {
        for (let dj = -Math.floor(r); dj <= Math.floor(r); dj++) {
          if (di * di + dj * dj > r * r) continue;
          sum += response.data[2 * ((c.lesion.row + di) * n + c.lesion.col + dj)];
          count++;
        }
      }
      const cnr = sum / (sigma * Math.sqrt(count));
      expect(Math.abs(result.lesions[i].cnr - cnr)).toBeLessThan(1e-9 * Math.max(1, Math.abs(cnr)));
      return cnr >= 5;
    });
    const curve = contrastDetailCurve(
      cells,
      result.lesions.map((l) => l.resolved),
    );
    expect(curve).toEqual(contrastDetailCurve(cells, expectedResolved));
    // Measured at σ = 0.05: 0.05, 0.1, 0.2, 0.4 and null from the largest disc to the smallest
    // (the 0.77-px disc covers one pixel centre).
    expect(curve.map((p) => p.smallestContrast)).toEqual([0.05, 0.1, 0.2, 0.4, null]);
    expect(curve.map((p) => p.diameterPixels)).toEqual(LAYOUT.diameters.map((d) => (d * n) / 2));
  });

  it('uniform R = 2 without ACS halves every response (PSF ½(δ(0) + δ(N/2))), so the curve never falls and rises somewhere', () => {
    const full = study(new Uint8Array(n * n).fill(1));
    const half = study(
      generateMask({ nx: n, ny: n }, { pattern: 'cartesian-uniform', acceleration: 2, acs: 0 }).mask,
    );
    // Aliases land half a field of view away, between disc rows (positions
    // ±0.375, ±0.75, 0 units shifted by 1 unit, 0.125 from the nearest row). Measured |CR − ½| ≤ 0.0151,
    // on the faint bottom rows where the aliased ringing of the 40 % and 20 % discs lands; at full
    // sampling the neighbours' ringing alone moves CR by ≤ 0.0040.
    for (const l of half.lesions) expect(Math.abs(l.contrastRecovery - 0.5)).toBeLessThan(0.02);
    for (const l of full.lesions) expect(Math.abs(l.contrastRecovery - 1)).toBeLessThan(0.005);
    const a = contrastDetailCurve(
      cells,
      full.lesions.map((l) => l.resolved),
    );
    const b = contrastDetailCurve(
      cells,
      half.lesions.map((l) => l.resolved),
    );
    let higher = 0;
    a.forEach((p, i) => {
      const before = p.smallestContrast ?? Number.POSITIVE_INFINITY;
      const after = b[i].smallestContrast ?? Number.POSITIVE_INFINITY;
      expect(after).toBeGreaterThanOrEqual(before);
      if (after > before) higher++;
    });
    expect(higher).toBeGreaterThan(0);
  });

  it('a column whose highest contrast is not resolved has no point; a gap stops the run', () => {
    const resolved = cells.map((c) => c.diameterUnits === LAYOUT.diameters[0] && c.contrast !== 0.1);
    const curve = contrastDetailCurve(cells, resolved);
    expect(curve[0].smallestContrast).toBe(0.2);
    expect(curve.slice(1).every((p) => p.smallestContrast === null)).toBe(true);
  });
});
