import { parse } from 'csv-parse/sync';
import { beforeAll, describe, expect, it } from 'vitest';
import type { RealVolume } from '../../src/core/real-volume.ts';
import { planCells, runPlan, tableToCsv, validatePlan } from '../../src/plan/index.ts';
import { parseOrThrow, protocolSchema, scanTime } from '../../src/protocol/index.ts';
import { acquisitionScanTime } from '../../src/protocol/volume-scan-time.ts';
import { caughtValidationError } from '../core/caught-validation-error.ts';
import { fixtureVolume, volumePlanBody } from './fixture.ts';

// The volume: 32³ of Debian mricron-data's inia19-t1-brain.nii.gz (tests/volume/fixture.ts).
let volume: RealVolume;
beforeAll(async () => {
  volume = await fixtureVolume();
});

const plan = volumePlanBody('brain');

describe('volume plans: 3D and multi-slice in one table', () => {
  it('one row per acquisition, scan times from the two models, volume scores', async () => {
    const table = await runPlan(plan, { ctx: { loadVolume: async () => volume } });
    expect(table.rows.map((r) => r.key)).toEqual(['reference', 'p0-r0-m0', 'p0-r0-m0-a1']);
    const [reference, threeD, multiSlice] = table.rows;
    expect(reference.acquisition).toBe('3d');
    expect([threeD.acquisition, multiSlice.acquisition]).toEqual(['3d', 'multi-slice']);
    // 3D: TA = TR × ky–kz points × averages (docs/references.md §8): 10 ms × 32·32 points for the reference.
    expect(table.fullySampled.seconds).toBeCloseTo((10 * 32 * 32) / 1000, 12);
    expect(threeD.acquiredUnit).toBe('points');
    expect(threeD.scanSeconds).toBeCloseTo((10 * threeD.acquired) / 1000, 12);
    // Multi-slice: the 2D model (TR × occupied ky lines) × 32 slices, one slice per TR.
    expect(multiSlice.acquiredUnit).toBe('lines');
    expect(multiSlice.scanSeconds).toBeCloseTo((10 * multiSlice.acquired * 32) / 1000, 12);
    // The fully sampled reference is exact; undersampled rows are not.
    expect(reference.metrics.nrmse.mean).toBeLessThan(1e-12);
    expect(threeD.metrics.nrmse.mean).toBeGreaterThan(0.01);
    expect(multiSlice.metrics.nrmse.mean).toBeGreaterThan(0.01);
    // The 2D point-mask warning speaks of protocol.dimensions, which volumes do not read.
    expect(table.notes.some((note) => note.includes('in a 2D protocol'))).toBe(false);
    // The CSV tells the two acquisitions apart: csv-parse (an RFC 4180 reader) finds an acquisition
    // column after coil_count, and the 3D and multi-slice rows differ only there and in their numbers.
    const csv = tableToCsv(table);
    const header = (parse(csv, { to_line: 1 }) as string[][])[0];
    expect(header.slice(header.indexOf('coil_count'), header.indexOf('coil_count') + 3)).toEqual([
      'coil_count',
      'acquisition',
      'reference',
    ]);
    const records = parse(csv, { columns: true }) as Record<string, string>[];
    expect(records.map((r) => r.acquisition)).toEqual(['3d', '3d', 'multi-slice']);
    expect([records[1].pattern, records[1].method]).toEqual([records[2].pattern, records[2].method]);
    expect(Number(records[2].scan_s)).toBeCloseTo(multiSlice.scanSeconds, 3);
  });

  it('the volume scan-time model: 2D model × slices, or what slicesPerPass lets share a TR', () => {
    const protocol = parseOrThrow(protocolSchema, { trMs: 500, slicesPerPass: 8 }, 'protocol');
    const matrix = { nx: 32, ny: 24, nz: 16 };
    const multi = acquisitionScanTime(matrix, protocol, undefined, 'multi-slice');
    // 16 slices, 8 per pass: 2 passes of 24 lines at TR 500 ms (the 2D model with slices = 16).
    expect(multi.seconds).toBeCloseTo(0.5 * 24 * 2, 12);
    const twoD = scanTime({ nx: 32, ny: 24 }, { ...protocol, slices: 16 });
    expect(multi.seconds).toBe(twoD.seconds);
    const full3d = acquisitionScanTime(matrix, protocol, undefined, '3d');
    expect(full3d.seconds).toBeCloseTo(0.5 * 24 * 16, 12);
  });

  it('refuses what volume plans do not support, naming the field', () => {
    const fields = (extra: Record<string, unknown>) =>
      caughtValidationError(() => validatePlan({ ...plan, ...extra }, { checkMasks: false })).problems.map(
        (p) => p.field,
      );
    expect(fields({ source: { phantom: 'shepp-logan' } })).toEqual(['source.phantom']);
    // A valid array (tests/api/coils.test.ts uses the same), refused only because the matrix is a volume.
    const loops = { array: 'loops', count: 8, loopRadius: 0.35, ringRadius: 1.25, correlation: 0.1 };
    expect(fields({ coilArrays: [{ array: 'uniform' }, loops] })).toEqual(['coilArrays[1]']);
    const { acquisitions: _, ...flat } = plan;
    const flatPlan = { ...flat, coilArrays: [{ array: 'uniform' }, loops], matrix: { nx: 32, ny: 32 } };
    expect(() => validatePlan(flatPlan, { checkMasks: false })).not.toThrow();
    expect(fields({ matrix: { nx: 32, ny: 32 } })).toEqual(['acquisitions']);
    expect(fields({ acquisitions: ['3d', '3d'] })).toEqual(['acquisitions']);
    const radial = caughtValidationError(() => validatePlan({ ...plan, patterns: [{ pattern: 'radial' }] }));
    expect(radial.problems[0].field).toBe('patterns[0].trajectory');
  });

  it('expands to (reference + patterns × R × methods × acquisitions) × seeds cells', () => {
    const cells = planCells(validatePlan({ ...plan, seeds: 2 }, { checkMasks: false }));
    expect(cells).toHaveLength((1 + 2) * 2);
    expect(cells.map((c) => c.acquisition)).toEqual(['3d', '3d', '3d', '3d', 'multi-slice', 'multi-slice']);
  });
});
