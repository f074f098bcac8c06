import { describe, expect, it } from 'vitest';
import { type CoilArraySpec, coilArrayMaps } from '../../src/coils/coil-array.ts';
import { ValidationError } from '../../src/core/errors.ts';
import type { CoilMaps } from '../../src/encoding/multi-coil.ts';
import { coilFixture, gaussianArrayMaps } from './fixture.ts';

const n = 33; // odd: the pixel grid is symmetric about the centre, so mirrors and 90° turns map pixels onto pixels
const at = (maps: CoilMaps, c: number, i: number, j: number): [number, number] => {
  const k = 2 * (c * maps.nx * maps.ny + i * maps.nx + j);
  return [maps.data[k], maps.data[k + 1]];
};

function loops(count: number, extra: Partial<CoilArraySpec> = {}): CoilArraySpec {
  return { array: 'loops', count, loopRadius: 0.35, ringRadius: 1.25, ...extra } as CoilArraySpec;
}

describe('coil arrays: normalisation', () => {
  for (const spec of [
    loops(8),
    loops(3, { ringRadius: [1.4, 1.1], tiltDeg: 20 }),
    { array: 'gaussian', count: 6, width: 0.5, ringRadius: 1.1 } as CoilArraySpec,
  ]) {
    it(`Σ_c |S_c|² = 1 at every pixel (${spec.array}, ${'count' in spec ? spec.count : 1} coils)`, () => {
      const maps = coilArrayMaps(spec, 24, 20);
      const px = 24 * 20;
      let worst = 0;
      for (let i = 0; i < px; i++) {
        let sum = 0;
        for (let c = 0; c < maps.coils; c++)
          sum += maps.data[2 * (c * px + i)] ** 2 + maps.data[2 * (c * px + i) + 1] ** 2;
        worst = Math.max(worst, Math.abs(sum - 1));
      }
      expect(worst).toBeLessThan(1e-14); // measured ≤ 6.7e-16
    });
  }

  it('uniform is one coil with S = 1', () => {
    const maps = coilArrayMaps({ array: 'uniform' }, 5, 4);
    expect(maps.coils).toBe(1);
    for (let i = 0; i < 20; i++) expect([maps.data[2 * i], maps.data[2 * i + 1]]).toEqual([1, 0]);
  });
});

describe('coil arrays: symmetry of the Biot–Savart maps', () => {
  for (const count of [4, 8]) {
    const maps = coilArrayMaps(loops(count), n, n);
    // Coil c sits at 90° + 360°·c/N. x → −x sends angle φ to 180° − φ (coil −c); y → −y sends φ to −φ
    // (coil N/2 − c). |S| is a field magnitude, so it mirrors with the array.
    it(`${count} loops: |S| mirrors under x → −x and y → −y`, () => {
      let worst = 0;
      for (let c = 0; c < count; c++) {
        const cx = (count - c) % count;
        const cy = (count / 2 - c + count) % count;
        for (let i = 0; i < n; i++) {
          for (let j = 0; j < n; j++) {
            const s = Math.hypot(...at(maps, c, i, j));
            worst = Math.max(worst, Math.abs(s - Math.hypot(...at(maps, cx, i, n - 1 - j))));
            worst = Math.max(worst, Math.abs(s - Math.hypot(...at(maps, cy, n - 1 - i, j))));
          }
        }
      }
      expect(worst).toBeLessThan(1e-12); // measured 1.3e-15 (4 loops), 3.9e-15 (8 loops)
    });

    // A 90° turn (x, y) → (−y, x) carries coil c onto coil c + N/4 and B onto R·B, so
    // B_x − i·B_y picks up e^(−iπ/2) = −i: S_{c+N/4}(R r) = −i·S_c(r). Pixel (i, j) goes to (n−1−j, i).
    it(`${count} loops: a quarter turn maps coil c onto coil c + ${count / 4} times −i`, () => {
      let worst = 0;
      for (let c = 0; c < count; c++) {
        const next = (c + count / 4) % count;
        for (let i = 0; i < n; i++) {
          for (let j = 0; j < n; j++) {
            const [re, im] = at(maps, c, i, j);
            const [tr, ti] = at(maps, next, n - 1 - j, i);
            worst = Math.max(worst, Math.hypot(tr - im, ti + re));
          }
        }
      }
      expect(worst).toBeLessThan(1e-12); // measured 1.1e-15 (4 loops), 7.2e-15 (8 loops)
    });
  }

  it('tilting the loops by +τ or −τ gives the same in-plane maps (mirror z → −z), and differs from τ = 0', () => {
    const up = coilArrayMaps(loops(4, { tiltDeg: 25 }), 17, 17);
    const down = coilArrayMaps(loops(4, { tiltDeg: -25 }), 17, 17);
    const flat = coilArrayMaps(loops(4), 17, 17);
    let same = 0;
    let change = 0;
    for (let i = 0; i < up.data.length; i++) {
      same = Math.max(same, Math.abs(up.data[i] - down.data[i]));
      change = Math.max(change, Math.abs(up.data[i] - flat.data[i]));
    }
    expect(same).toBeLessThan(1e-12); // measured 6.7e-16
    expect(change).toBeGreaterThan(0.01); // measured 0.017
  });

  it('the coil nearest a pixel dominates it (loop at the top is strongest at the top edge)', () => {
    const maps = coilArrayMaps(loops(4), n, n);
    const centre = Math.floor(n / 2);
    // Coil 0 sits at 90° (top, row 0). Its share of the combined sensitivity is largest at the top.
    const top = Math.hypot(...at(maps, 0, 0, centre));
    const bottom = Math.hypot(...at(maps, 0, n - 1, centre));
    expect(top).toBeGreaterThan(0.9); // measured 0.9996
    expect(bottom).toBeLessThan(0.2); // measured 0.0079
  });
});

describe('Gaussian-profile arrays against numpy (generate_coil_fixtures.py)', () => {
  it('normalised maps equal the numpy ones at the sampled pixels to 1e-13', () => {
    const f = coilFixture.gaussian_array;
    const maps = gaussianArrayMaps();
    let worst = 0;
    for (let c = 0; c < f.count; c++) {
      f.samplePixels.forEach((p, k) => {
        const [re, im] = f.mapSamples[c][k];
        const d = 2 * (c * f.nx * f.ny + p);
        worst = Math.max(worst, Math.hypot(maps.data[d] - re, maps.data[d + 1] - im));
      });
    }
    expect(worst).toBeLessThan(1e-13); // measured 1.1e-16
  });
});

describe('coil arrays: bad input names the field', () => {
  const cases: [CoilArraySpec, string][] = [
    [loops(0), 'coils.count'],
    [loops(33), 'coils.count'],
    [loops(2.5), 'coils.count'],
    [loops(4, { loopRadius: 0 }), 'coils.loopRadius'],
    [loops(4, { ringRadius: 0.9 }), 'coils.ringRadius'],
    [loops(4, { ringRadius: [1.2, Number.NaN] }), 'coils.ringRadius.1'],
    [loops(4, { tiltDeg: 90 }), 'coils.tiltDeg'],
    [loops(4, { segments: 101 }), 'coils.segments'],
    [loops(4, { startAngleDeg: Number.POSITIVE_INFINITY }), 'coils.startAngleDeg'],
    [{ array: 'gaussian', count: 4, width: 0.01, ringRadius: 1 }, 'coils.width'],
    [{ array: 'helmet' } as unknown as CoilArraySpec, 'coils.array'],
  ];
  for (const [spec, field] of cases) {
    it(`${field}: ${JSON.stringify(spec)}`, () => {
      try {
        coilArrayMaps(spec, 8, 8);
        expect.unreachable('accepted bad input');
      } catch (error) {
        expect(error).toBeInstanceOf(ValidationError);
        expect((error as ValidationError).problems[0].field).toBe(field);
      }
    });
  }
});
