import { describe, expect, it } from 'vitest';
import { generateMask, type SampledMask } from '../../sampling/index.ts';
import { CancelledError } from '../../src/core/errors.ts';

/**
 * The radius law as documented in sampling/poisson-disc.ts, restated independently here:
 * r(u, v) = s·(1 + ρ)^(p/2), ρ = √(((u − ⌊nx/2⌋)/(nx/2))² + ((v − ⌊ny/2⌋)/(ny/2))²).
 */
function radiusLaw(m: SampledMask, power = 2): (u: number, v: number) => number {
  const s = m.details!.radiusScale as number;
  const cx = Math.floor(m.nx / 2);
  const cy = Math.floor(m.ny / 2);
  return (u, v) => s * (1 + Math.hypot((u - cx) / (m.nx / 2), (v - cy) / (m.ny / 2))) ** (power / 2);
}

function inAcs(m: SampledMask, u: number, v: number): boolean {
  const a = m.acs?.size?.[0] ?? 0;
  const r0 = Math.floor(m.ny / 2) - Math.floor(a / 2);
  const c0 = Math.floor(m.nx / 2) - Math.floor(a / 2);
  return v >= r0 && v < r0 + a && u >= c0 && u < c0 + a;
}

/**
 * Smallest d(a, b) / ((r(a) + r(b))/2) over all pairs of samples not both in the ACS: the
 * variable-density Poisson-disc condition (Bridson 2007 with r growing with |k|, docs/references.md §3.4)
 * holds when this is ≥ 1. Pairs farther apart than the largest radius cannot violate it; pairs up to
 * twice that are checked (and counted) all the same.
 */
function worstSpacing(m: SampledMask, power = 2): { ratio: number; pairs: number } {
  const r = radiusLaw(m, power);
  const { nx, ny, mask } = m;
  const rMax = r(0, 0);
  const reach = Math.ceil(2 * rMax);
  let ratio = Number.POSITIVE_INFINITY;
  let pairs = 0;
  for (let v = 0; v < ny; v++) {
    for (let u = 0; u < nx; u++) {
      if (!mask[v * nx + u]) continue;
      for (let dv = 0; dv <= reach; dv++) {
        for (let du = -reach; du <= reach; du++) {
          if (dv === 0 && du <= 0) continue; // each pair once
          const qu = u + du;
          const qv = v + dv;
          if (qu < 0 || qu >= nx || qv >= ny || !mask[qv * nx + qu]) continue;
          if (inAcs(m, u, v) && inAcs(m, qu, qv)) continue;
          const d = Math.hypot(du, dv);
          if (d > 2 * rMax) continue;
          pairs++;
          ratio = Math.min(ratio, d / ((r(u, v) + r(qu, qv)) / 2));
        }
      }
    }
  }
  return { ratio, pairs };
}

/**
 * The issue asks for the actual R within ±3 % of the request; DEVELOPERS.md documents a search that
 * stops once the count is within 1 % of the target, i.e. R within [1/1.01, 1/0.99] of the request.
 * Measured: ≤ 0.67 % on every case below, so the documented bound is what the tests hold.
 */
const R_TOLERANCE = 1 / 0.99 - 1 + 1e-12;

describe('poisson-disc: variable-density Poisson-disc over the ny×nx plane (Bridson 2007)', () => {
  // The range: R 2–12 on 128² to 320², a representative grid of it.
  const sizes = [128, 200, 320];
  const accelerations = [2, 4, 8, 12];
  for (const n of sizes) {
    it(`actual R within ±1 % (issue: ±3 %) of the request on ${n}×${n} for R = ${accelerations.join(', ')}`, () => {
      for (const R of accelerations) {
        const m = generateMask({ nx: n, ny: n }, { pattern: 'poisson-disc', acceleration: R, seed: 1 });
        const count = m.mask.reduce((a, b) => a + b, 0);
        expect(m.acquired).toEqual({ count, unit: 'points' });
        expect(m.total).toBe(n * n);
        expect(m.acceleration.actual).toBeCloseTo((n * n) / count, 12);
        expect(Math.abs(m.acceleration.actual / R - 1)).toBeLessThanOrEqual(R_TOLERANCE);
      }
    });
  }

  it('within ±1 % with a 24×24 ACS and on a non-square matrix too', () => {
    for (const [nx, ny, R] of [
      [256, 256, 6],
      [320, 160, 4],
      [128, 192, 10],
    ]) {
      const m = generateMask({ nx, ny }, { pattern: 'poisson-disc', acceleration: R, acs: 24, seed: 9 });
      expect(Math.abs(m.acceleration.actual / R - 1)).toBeLessThanOrEqual(R_TOLERANCE);
      expect(m.acs).toEqual({ size: [24, 24] });
      for (let v = 0; v < ny; v++)
        for (let u = 0; u < nx; u++) if (inAcs(m, u, v)) expect(m.mask[v * nx + u]).toBe(1);
    }
  });

  it('within ±1 % for other fall-off powers (0.5, 1, 5, 8) too', () => {
    for (const power of [0.5, 1, 5, 8]) {
      for (const R of [3, 8]) {
        const m = generateMask(
          { nx: 200, ny: 200 },
          { pattern: 'poisson-disc', acceleration: R, seed: 5, density: { power } },
        );
        expect(Math.abs(m.acceleration.actual / R - 1)).toBeLessThanOrEqual(R_TOLERANCE);
        expect(m.details?.densityPower).toBe(power);
      }
    }
  });

  it('minimum distance: no two samples closer than (r(a) + r(b))/2 under the stated radius law', () => {
    for (const [n, R, acs, power] of [
      [128, 4, 0, 2],
      [128, 12, 16, 2],
      [200, 8, 24, 2],
      [160, 3, 0, 4],
      [128, 6, 0, 1],
    ]) {
      const m = generateMask(
        { nx: n, ny: n },
        { pattern: 'poisson-disc', acceleration: R, acs, seed: 4, density: { power } },
      );
      const { ratio, pairs } = worstSpacing(m, power);
      expect(pairs).toBeGreaterThan(1000);
      expect(ratio).toBeGreaterThanOrEqual(1);
    }
  });

  it('coverage: every grid point inside ρ < 0.95 has a sample within 2·r (docs/references.md §3.4, common practice)', () => {
    const m = generateMask({ nx: 200, ny: 200 }, { pattern: 'poisson-disc', acceleration: 8, seed: 2 });
    const r = radiusLaw(m);
    let worst = 0;
    for (let v = 0; v < 200; v++) {
      for (let u = 0; u < 200; u++) {
        if (Math.hypot((u - 100) / 100, (v - 100) / 100) >= 0.95) continue;
        const limit = 2 * r(u, v);
        const reach = Math.ceil(limit);
        let nearest = Number.POSITIVE_INFINITY;
        for (let dv = -reach; dv <= reach; dv++)
          for (let du = -reach; du <= reach; du++)
            if (m.mask[(v + dv) * 200 + u + du]) nearest = Math.min(nearest, Math.hypot(du, dv));
        worst = Math.max(worst, nearest / r(u, v));
      }
    }
    expect(worst).toBeLessThanOrEqual(2);
  });

  it('sampling density follows 1/r² ∝ (1 + ρ)^(−p): ring ρ ∈ [0.2, 0.3) vs [0.8, 0.9) within 10 %', () => {
    // R = 8 keeps r > 1 pixel everywhere, so the grid does not cap the density at 1.
    const n = 320;
    const m = generateMask({ nx: n, ny: n }, { pattern: 'poisson-disc', acceleration: 8, seed: 6 });
    const ring = (a: number, b: number) => {
      let hit = 0;
      let all = 0;
      for (let v = 0; v < n; v++)
        for (let u = 0; u < n; u++) {
          const rho = Math.hypot((u - 160) / 160, (v - 160) / 160);
          if (rho >= a && rho < b) {
            all++;
            hit += m.mask[v * n + u];
          }
        }
      return hit / all;
    };
    const measured = ring(0.2, 0.3) / ring(0.8, 0.9);
    const law = ((1 + 0.85) / (1 + 0.25)) ** 2;
    // Measured −1.4 %. About 756 and 1195 samples fall in the two rings: even Poisson counting noise
    // (an upper bound for the more regular Poisson-disc) gives a spread of ≈ 4.6 %, so 10 % ≈ 2σ.
    expect(Math.abs(measured / law - 1)).toBeLessThan(0.1);
  });

  it('the k-space centre is sampled, and the density map sums to the acquired count', () => {
    const m = generateMask({ nx: 128, ny: 96 }, { pattern: 'poisson-disc', acceleration: 5, seed: 3 });
    expect(m.mask[48 * 128 + 64]).toBe(1);
    const sum = m.density!.reduce((a, b) => a + b, 0);
    expect(sum).toBeCloseTo(m.acquired.count, 6);
    expect(m.density![48 * 128 + 64]).toBeGreaterThan(m.density![0]);
  });

  it('same request, same bytes; another seed gives another mask within ±1 % of the request', () => {
    const request = { pattern: 'poisson-disc', acceleration: 6, acs: 12, seed: 21 } as const;
    const a = generateMask({ nx: 160, ny: 160 }, request);
    const b = generateMask({ nx: 160, ny: 160 }, { ...request });
    expect(Buffer.from(a.mask).equals(Buffer.from(b.mask))).toBe(true);
    expect(a.details).toEqual(b.details);
    const c = generateMask({ nx: 160, ny: 160 }, { ...request, seed: 22 });
    expect(Buffer.from(c.mask).equals(Buffer.from(a.mask))).toBe(false);
    expect(Math.abs(c.acceleration.actual / 6 - 1)).toBeLessThanOrEqual(R_TOLERANCE);
  });

  it('R = 1 samples every point', () => {
    const m = generateMask({ nx: 40, ny: 30 }, { pattern: 'poisson-disc', acceleration: 1, seed: 1 });
    expect(m.mask.every((v) => v === 1)).toBe(true);
    expect(m.acceleration.actual).toBe(1);
  });
});

describe('poisson-disc cancellation', () => {
  it('an aborted signal stops the generation with a CancelledError', () => {
    const controller = new AbortController();
    controller.abort();
    expect(() =>
      generateMask(
        { nx: 128, ny: 128 },
        { pattern: 'poisson-disc', acceleration: 4, seed: 1 },
        undefined,
        controller.signal,
      ),
    ).toThrow(CancelledError);
  });
});
