import { describe, expect, it } from 'vitest';
import { ValidationError } from '../../src/core/errors.ts';
import { validateMatrix } from '../../src/core/matrix.ts';
import { parseOrThrow } from '../../src/core/zod-problems.ts';
import { type ScanTimeSampling, scanTime as scanTimeParsed } from '../../src/protocol/scan-time.ts';
import { type ProtocolInput, protocolSchema } from '../../src/protocol/schema.ts';
import { caughtValidationError } from '../core/caught-validation-error.ts';

/**
 * The scan-time model trusts its parsed inputs; a request's matrix and protocol are checked once at
 * the edge (the request schema). This runs both, as a request does.
 */
function scanTime(matrix: { nx: number; ny: number }, protocol: ProtocolInput, sampled?: ScanTimeSampling) {
  return scanTimeParsed(validateMatrix(matrix), parseOrThrow(protocolSchema, protocol, 'protocol'), sampled);
}

/** A Cartesian mask sampling whole phase-encode rows (1 = acquired). */
function lineMask(nx: number, ny: number, rows: number[]): ScanTimeSampling {
  const mask = new Uint8Array(nx * ny);
  for (const row of rows) mask.fill(1, row * nx, (row + 1) * nx);
  return { nx, ny, mask, acquired: { count: rows.length, unit: 'lines' }, representation: 'cartesian' };
}

function range(start: number, stop: number, step = 1): number[] {
  const out: number[] = [];
  for (let i = start; i < stop; i += step) out.push(i);
  return out;
}

function problemOf(fn: () => unknown): { field: string; allowed?: string } {
  return caughtValidationError(fn).problems[0];
}

describe('scan time: worked examples of docs/references.md §8', () => {
  it('[C] 2D SE, TR 500 ms, 256 lines, 1 average → 128 s = 2:08', () => {
    const t = scanTime({ nx: 256, ny: 256 }, { trMs: 500, averages: 1 });
    expect(t.seconds).toBe(128);
    expect(t.formatted).toBe('2:08');
    expect(t.acquired).toBe(256);
    expect(t.unit).toBe('lines');
  });

  it('[P] Radiopaedia "Acquisition time": 2D SE, TR 1000 ms, 128 lines, 2 averages → 256 s = 4:16', () => {
    const t = scanTime({ nx: 128, ny: 128 }, { trMs: 1000, averages: 2 });
    expect(t.seconds).toBe(256);
    expect(t.formatted).toBe('4:16');
  });

  it('[C] spin echo with an echo train, TR 4000 ms, 256 lines, 2 averages, ETL 16 → 128 s = 2:08', () => {
    const t = scanTime({ nx: 256, ny: 256 }, { trMs: 4000, averages: 2, echoTrainLength: 16 });
    expect(t.shots).toBe(16);
    expect(t.seconds).toBe(128);
    expect(t.formatted).toBe('2:08');
  });

  it('[C] spin echo with an echo train, TR 2500 ms, 224 lines, 4 averages, ETL 12: ⌈224/12⌉ = 19 shots → 190 s = 3:10', () => {
    const t = scanTime({ nx: 256, ny: 224 }, { trMs: 2500, averages: 4, echoTrainLength: 12 });
    expect(t.shots).toBe(19);
    expect(t.seconds).toBe(190);
    expect(t.formatted).toBe('3:10');
  });

  it('[C] 3D GRE, TR 10 ms, 256 × 64 (ky × kz), 1 average → 163.84 s = "2:43.8"', () => {
    const t = scanTime({ nx: 64, ny: 256 }, { dimensions: '3d', trMs: 10 });
    expect(t.acquired).toBe(16384);
    expect(t.unit).toBe('points');
    expect(t.seconds).toBeCloseTo(163.84, 12);
    expect(t.formatted).toBe('2:43.8');
  });

  it('[C] same 3D scan with R = 2 (8192 of 16384 points) → 81.92 s', () => {
    // Every second ky row, all kz: 128 rows × 64 points.
    const sampled = lineMask(64, 256, range(0, 256, 2));
    const t = scanTime({ nx: 64, ny: 256 }, { dimensions: '3d', trMs: 10 }, sampled);
    expect(t.acquired).toBe(8192);
    expect(t.seconds).toBeCloseTo(81.92, 12);
  });

  it('[C] same 3D scan with partial Fourier 6/8 in ky (192 × 64) → 122.88 s', () => {
    const t = scanTime({ nx: 64, ny: 256 }, { dimensions: '3d', trMs: 10, partialFourier: 6 / 8 });
    expect(t.acquired).toBe(192 * 64);
    expect(t.seconds).toBeCloseTo(122.88, 12);
  });

  it('[C] 2D SE, TR 500 ms, 256 lines, VD mask with 71 lines → 35.5 s, 72.3 % saved', () => {
    const rows = [...range(0, 256, 8), ...range(100, 144)].filter((v, i, a) => a.indexOf(v) === i);
    expect(rows.length).toBe(71);
    const full = scanTime({ nx: 256, ny: 256 }, { trMs: 500 });
    const t = scanTime({ nx: 256, ny: 256 }, { trMs: 500 }, lineMask(256, 256, rows));
    expect(t.acquired).toBe(71);
    expect(t.seconds).toBe(35.5);
    expect(t.formatted).toBe('0:35.5');
    expect(Number((100 * (1 - t.seconds / full.seconds)).toFixed(1))).toBe(72.3);
  });

  it('[C] radial, TR 5 ms, 403 spokes (N = 256 Nyquist) → 2.015 s', () => {
    const sampled: ScanTimeSampling = {
      nx: 256,
      ny: 256,
      mask: new Uint8Array(256 * 256),
      acquired: { count: 403, unit: 'spokes' },
      representation: 'radial-rasterised',
    };
    const t = scanTime({ nx: 256, ny: 256 }, { trMs: 5 }, sampled);
    expect(t.unit).toBe('spokes');
    expect(t.seconds).toBeCloseTo(2.015, 12);
    expect(t.formatted).toBe('0:02');
  });
});

describe('scan time: slices, partial Fourier and masks (common practice, docs/references.md §8)', () => {
  it('slices do not multiply 2D time while they fit in one TR; extra passes do', () => {
    const one = scanTime({ nx: 256, ny: 256 }, { trMs: 500, slices: 20 });
    expect(one.passes).toBe(1);
    expect(one.seconds).toBe(128);
    // 20 slices, 8 per TR → ⌈20/8⌉ = 3 passes.
    const three = scanTime({ nx: 256, ny: 256 }, { trMs: 500, slices: 20, slicesPerPass: 8 });
    expect(three.passes).toBe(3);
    expect(three.seconds).toBe(384);
  });

  it('partial Fourier keeps ⌈p·N⌉ phase-encode lines (5/8 of 256 = 160; 0.6 of 5 = 3, not 4)', () => {
    expect(scanTime({ nx: 256, ny: 256 }, { trMs: 500, partialFourier: 5 / 8 }).acquired).toBe(160);
    expect(scanTime({ nx: 5, ny: 5 }, { trMs: 500, partialFourier: 0.6 }).acquired).toBe(3);
  });

  it('partial Fourier with a mask counts only sampled rows inside the kept band (which holds the centre row)', () => {
    // ny = 8, p = 0.5: rows 4…7 are kept; the centre row ⌊8/2⌋ = 4 lies in it.
    const sampled = lineMask(8, 8, [0, 2, 4, 6]);
    const t = scanTime({ nx: 8, ny: 8 }, { trMs: 100, partialFourier: 0.5 }, sampled);
    expect(t.acquired).toBe(2);
    expect(t.seconds).toBeCloseTo(0.2, 12);
  });

  it('a 2D point mask costs one line per occupied phase-encode row; in 3D one readout per point', () => {
    const mask = new Uint8Array(16);
    mask[0] = 1;
    mask[1] = 1; // row 0: two points
    mask[9] = 1; // row 2: one point
    const sampled: ScanTimeSampling = {
      nx: 4,
      ny: 4,
      mask,
      acquired: { count: 3, unit: 'points' },
      representation: 'cartesian',
    };
    expect(scanTime({ nx: 4, ny: 4 }, { trMs: 1000 }, sampled).acquired).toBe(2);
    expect(scanTime({ nx: 4, ny: 4 }, { dimensions: '3d', trMs: 1000 }, sampled).acquired).toBe(3);
  });

  it('scan time strictly decreases as uniform line undersampling grows (R = 1, 2, 3, 4, 6, 8)', () => {
    let previous = Number.POSITIVE_INFINITY;
    for (const r of [1, 2, 3, 4, 6, 8]) {
      const t = scanTime({ nx: 96, ny: 96 }, { trMs: 500 }, lineMask(96, 96, range(0, 96, r)));
      expect(t.seconds).toBeLessThan(previous);
      previous = t.seconds;
    }
  });
});

describe('scan time: validation names the field and the allowed range (TR > 0, averages ≥ 1, partial Fourier in [0.5, 1]; docs/design.md §4.1 typed errors)', () => {
  const matrix = { nx: 64, ny: 64 };
  it.each([
    [{ trMs: 0 }, 'protocol.trMs', '> 0'],
    [{ trMs: -5 }, 'protocol.trMs', '> 0'],
    [{ trMs: 500, averages: 0 }, 'protocol.averages', '≥ 1'],
    [{ trMs: 500, averages: 1.5 }, 'protocol.averages', 'an integer'],
    [{ trMs: 500, echoTrainLength: 2.5 }, 'protocol.echoTrainLength', 'an integer'],
    [{ trMs: 500, partialFourier: 0.4 }, 'protocol.partialFourier', '≥ 0.5'],
    [{ trMs: 500, partialFourier: 1.2 }, 'protocol.partialFourier', '≤ 1'],
    [{ trMs: 500, slices: 0 }, 'protocol.slices', '≥ 1'],
    [{ trMs: 500, dimensions: '4d' }, 'protocol.dimensions', 'one of "2d", "3d"'],
    [{ trMs: 500, dimensions: '3d', slices: 4 }, 'protocol.slices', "1 when dimensions is '3d'"],
  ])('%j → %s (%s)', (protocol, field, allowed) => {
    const problem = problemOf(() => scanTime(matrix, protocol as never));
    expect(problem.field).toBe(field);
    expect(problem.allowed).toBe(allowed);
  });

  it('a missing TR is named', () => {
    expect(problemOf(() => scanTime(matrix, {} as never)).field).toBe('protocol.trMs');
  });

  it('an unknown protocol field is rejected rather than ignored, named by its own path', () => {
    expect(problemOf(() => scanTime(matrix, { trMs: 500, tr: 5 } as never)).field).toBe('protocol.tr');
  });

  it('matrix sides must be positive integers and match the mask', () => {
    expect(problemOf(() => scanTime({ nx: 0, ny: 64 }, { trMs: 500 })).field).toBe('matrix.nx');
    expect(problemOf(() => scanTime({ nx: 64, ny: 6.5 }, { trMs: 500 })).field).toBe('matrix.ny');
    expect(problemOf(() => scanTime({ nx: 64, ny: 64 }, { trMs: 500 }, lineMask(32, 32, [0]))).field).toBe(
      'matrix',
    );
  });

  it('radial sampling in 3D is a stack of stars; it rejects partial Fourier, and partitions elsewhere', () => {
    const radial: ScanTimeSampling = {
      nx: 8,
      ny: 8,
      mask: new Uint8Array(64),
      acquired: { count: 13, unit: 'spokes' },
      representation: 'non-cartesian',
    };
    // Stack of stars (common practice): 13 spokes in every one of 16 kz partitions, TR 5 ms each:
    // 13 × 16 × 5 ms = 1.04 s.
    const stack = scanTime({ nx: 8, ny: 8 }, { trMs: 5, dimensions: '3d', partitions: 16 }, radial);
    expect(stack.acquired).toBe(208);
    expect(stack.seconds).toBeCloseTo(1.04, 12);
    expect(problemOf(() => scanTime({ nx: 8, ny: 8 }, { trMs: 5, partitions: 16 }, radial)).field).toBe(
      'protocol.partitions',
    );
    expect(
      problemOf(() => scanTime({ nx: 8, ny: 8 }, { trMs: 5, dimensions: '3d', partitions: 2 })).field,
    ).toBe('protocol.partitions');
    expect(problemOf(() => scanTime({ nx: 8, ny: 8 }, { trMs: 5, partialFourier: 0.75 }, radial)).field).toBe(
      'protocol.partialFourier',
    );
  });
});

// `averages` is DICOM Number of Averages (0018,0083). Source of the expected times: the TA formula
// of docs/references.md §8 (TR × lines × averages).
describe('scan time: averages', () => {
  const matrix = { nx: 128, ny: 128 };

  it('averages defaults to 1: TR 1000 ms × 128 lines = 128 s', () => {
    expect(scanTime(matrix, { trMs: 1000 }).seconds).toBe(128);
  });

  it('3 averages → 384 s', () => {
    expect(scanTime(matrix, { trMs: 1000, averages: 3 }).seconds).toBe(384);
  });

  it('the removed alias nex is an unknown field, named by its own path (docs/design.md §4.3)', () => {
    let problems: { field: string; allowed?: string }[] = [];
    try {
      scanTime(matrix, { trMs: 1000, nex: 3 } as never);
    } catch (error) {
      expect(error).toBeInstanceOf(ValidationError);
      problems = (error as ValidationError).problems;
    }
    expect(problems.map((p) => p.field)).toEqual(['protocol.nex']);
    expect(problems[0].allowed).toBe('the documented fields only');
  });

  it('the parsed protocol carries averages, and parses again to itself', () => {
    const parsed = protocolSchema.parse({ trMs: 1000, averages: 4 });
    expect(parsed.averages).toBe(4);
    expect(protocolSchema.parse(parsed)).toEqual(parsed);
  });
});
