import { describe, expect, it } from 'vitest';
import { generateMask, parseSampling } from '../../sampling/index.ts';
import { validateMatrix } from '../../src/core/matrix.ts';
import { parseOrThrow } from '../../src/core/zod-problems.ts';
import { type ScanTimeSampling, scanTime as scanTimeParsed } from '../../src/protocol/scan-time.ts';
import { type ProtocolInput, protocolSchema } from '../../src/protocol/schema.ts';
import { caughtValidationError } from '../core/caught-validation-error.ts';

/** Parses matrix and protocol as a request does, then runs the model. */
function scanTime(matrix: { nx: number; ny: number }, protocol: ProtocolInput, sampled?: ScanTimeSampling) {
  return scanTimeParsed(validateMatrix(matrix), parseOrThrow(protocolSchema, protocol, 'protocol'), sampled);
}

const tse = { trMs: 3000, echoTrainLength: 16, echoSpacingMs: 10, slices: 20 } as const;

describe('spin-echo train (RARE) timing, hand-worked (Bernstein, King & Zhou 2004, ch. 16 RARE; relations from memory)', () => {
  it('TR 3000 ms, ETL 16, ES 10 ms, 20 slices, 256 lines → 18 slices per TR, 2 passes, 96 s, TE_eff 90 ms', () => {
    // One slice occupies its echo train: 16 × 10 ms = 160 ms; ⌊3000 / 160⌋ = ⌊18.75⌋ = 18 slices per TR.
    // Passes ⌈20 / 18⌉ = 2. Shots ⌈256 / 16⌉ = 16 TRs per pass. TA = 2 × 16 × 3000 ms × 1 = 96 000 ms = 96 s.
    // Linear ordering: echo n takes lines (n − 1)·16 … n·16 − 1 from the top; the centre row 128 has 128
    // lines ahead of it, so echo ⌊128 / 16⌋ + 1 = 9 acquires it: TE_eff = 9 × 10 ms = 90 ms
    // (the handbook's ES × (ETL/2 + 1) for sequential ordering, from memory).
    const t = scanTime({ nx: 256, ny: 256 }, tse);
    expect(t.slicesPerTr).toBe(18);
    expect(t.passes).toBe(2);
    expect(t.shots).toBe(16);
    expect(t.seconds).toBe(96);
    expect(t.formatted).toBe('1:36');
    expect(t.effectiveTeMs).toBe(90);
  });

  it('centric ordering puts the centre on the first echo: TE_eff = ES = 10 ms, time unchanged', () => {
    const t = scanTime({ nx: 256, ny: 256 }, { ...tse, echoOrder: 'centric' });
    expect(t.effectiveTeMs).toBe(10);
    expect(t.seconds).toBe(96);
  });

  it('sequential ordering, fully sampled: TE_eff = ES × (ETL/2 + 1) for ETL 4, 8, 16, 32 (handbook relation, from memory)', () => {
    for (const etl of [4, 8, 16, 32]) {
      const t = scanTime({ nx: 64, ny: 256 }, { trMs: 5000, echoTrainLength: etl, echoSpacingMs: 12 });
      expect(t.effectiveTeMs).toBe(12 * (etl / 2 + 1));
    }
  });

  it('a per-slice overhead of 40 ms: ⌊3000 / 200⌋ = 15 slices per TR; 30 slices → 2 passes (96 s), 31 → 3 (144 s)', () => {
    const base = { ...tse, sliceOverheadMs: 40 };
    const thirty = scanTime({ nx: 256, ny: 256 }, { ...base, slices: 30 });
    expect(thirty.slicesPerTr).toBe(15);
    expect(thirty.passes).toBe(2);
    expect(thirty.seconds).toBe(96);
    const thirtyOne = scanTime({ nx: 256, ny: 256 }, { ...base, slices: 31 });
    expect(thirtyOne.passes).toBe(3);
    expect(thirtyOne.seconds).toBe(144); // 3 × 16 × 3 s
  });

  it('a requested TE picks the nearest echo: 92 ms → echo 9 (90 ms); 100 ms → echo 10 (100 ms)', () => {
    expect(scanTime({ nx: 256, ny: 256 }, { ...tse, teMs: 92 }).effectiveTeMs).toBe(90);
    expect(scanTime({ nx: 256, ny: 256 }, { ...tse, teMs: 100 }).effectiveTeMs).toBe(100);
  });

  it('a slicesPerPass that fits is used (10 → ⌈20/10⌉ = 2 passes); one above 18 is a 422', () => {
    expect(scanTime({ nx: 256, ny: 256 }, { ...tse, slicesPerPass: 10 }).passes).toBe(2);
    expect(scanTime({ nx: 256, ny: 256 }, { ...tse, slicesPerPass: 5 }).passes).toBe(4);
    const error = caughtValidationError(() => scanTime({ nx: 256, ny: 256 }, { ...tse, slicesPerPass: 19 }));
    expect(error.problems[0].field).toBe('protocol.slicesPerPass');
    expect(error.problems[0].allowed).toBe('1 ≤ slicesPerPass ≤ 18 (or leave it out)');
  });

  it('an echo train longer than TR is a 422 naming the fields (16 × 10 ms = 160 ms > TR 150 ms)', () => {
    const error = caughtValidationError(() => scanTime({ nx: 256, ny: 256 }, { ...tse, trMs: 150 }));
    expect(error.problems.map((p) => p.field)).toEqual([
      'protocol.echoTrainLength',
      'protocol.echoSpacingMs',
      'protocol.trMs',
    ]);
    // Exactly filling TR is allowed: 160 ms in TR 160 ms → 1 slice per TR, 20 passes.
    expect(scanTime({ nx: 256, ny: 256 }, { ...tse, trMs: 160 }).passes).toBe(20);
    const overhead = caughtValidationError(() =>
      scanTime({ nx: 256, ny: 256 }, { ...tse, trMs: 170, sliceOverheadMs: 20 }),
    );
    expect(overhead.problems.map((p) => p.field)).toContain('protocol.sliceOverheadMs');
    const threeD = caughtValidationError(() =>
      scanTime({ nx: 64, ny: 256 }, { dimensions: '3d', trMs: 100, echoTrainLength: 16, echoSpacingMs: 10 }),
    );
    expect(threeD.problems[0].field).toBe('protocol.echoTrainLength');
  });

  it('a TE outside the train (before the first or after the last echo) is a 422 naming protocol.teMs', () => {
    for (const teMs of [5, 170]) {
      const error = caughtValidationError(() => scanTime({ nx: 256, ny: 256 }, { ...tse, teMs }));
      expect(error.problems[0].field).toBe('protocol.teMs');
      expect(error.problems[0].allowed).toMatch(/^10 ≤ teMs ≤ 160/);
    }
  });

  it('without echoSpacingMs the model is the older one: all slices in one TR, TE as given or null', () => {
    const t = scanTime({ nx: 256, ny: 256 }, { trMs: 3000, echoTrainLength: 16, slices: 20 });
    expect(t.slicesPerTr).toBe(20);
    expect(t.passes).toBe(1);
    expect(t.seconds).toBe(48);
    expect(t.effectiveTeMs).toBeNull();
    expect(scanTime({ nx: 256, ny: 256 }, { trMs: 500, teMs: 15 }).effectiveTeMs).toBe(15);
    expect(
      caughtValidationError(() => scanTime({ nx: 256, ny: 256 }, { trMs: 500, teMs: 500 })).problems[0].field,
    ).toBe('protocol.teMs');
  });
});

describe('partial Fourier in the sampling and the scan time', () => {
  const matrix = { nx: 256, ny: 256 };
  const pf = generateMask(
    matrix,
    parseSampling({ pattern: 'cartesian-uniform', acceleration: 1, partialFourier: 0.625 }),
  );

  it('scan time at 0.625 equals the kept rows: 160 lines, 10 shots × 3 s × 2 passes = 60 s', () => {
    const t = scanTime(matrix, tse, pf);
    expect(t.acquired).toBe(160);
    expect(t.seconds).toBe(60);
    // The protocol alias gives the same rows and time.
    const alias = scanTime(matrix, { ...tse, partialFourier: 0.625 });
    expect(alias.acquired).toBe(160);
    expect(alias.seconds).toBe(60);
  });

  it('linear ordering with partial Fourier: 32 rows ahead of the centre (96…127), echo ⌊32/10⌋ + 1 = 4 → 40 ms', () => {
    expect(scanTime(matrix, tse, pf).effectiveTeMs).toBe(40);
    expect(scanTime(matrix, { ...tse, partialFourier: 0.625 }).effectiveTeMs).toBe(40);
  });

  it('the alias agreeing is accepted; disagreeing is a 422 naming both fields', () => {
    expect(scanTime(matrix, { ...tse, partialFourier: 0.625 }, pf).acquired).toBe(160);
    const error = caughtValidationError(() => scanTime(matrix, { ...tse, partialFourier: 0.75 }, pf));
    expect(error.problems.map((p) => p.field)).toEqual([
      'sampling.partialFourier',
      'protocol.partialFourier',
    ]);
  });
});
