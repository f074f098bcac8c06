import { describe, expect, it } from 'vitest';
import {
  generateMask,
  parseSampling,
  resolveSampling,
  type SamplingSpec,
  samplingSchema,
} from '../../sampling/index.ts';
import { LimitError, ValidationError } from '../../src/core/errors.ts';
import { defaultLimits, type Limits } from '../../src/core/limits.ts';
import { validateMatrix } from '../../src/core/matrix.ts';

/** Runs `fn`, expects a ValidationError, returns its problems (fields and allowed ranges). */
function problemsOf(fn: () => unknown): { field: string; message: string; allowed?: string }[] {
  try {
    fn();
  } catch (error) {
    expect(error).toBeInstanceOf(ValidationError);
    return (error as ValidationError).problems;
  }
  throw new Error('expected a ValidationError, nothing was thrown');
}

const square = { nx: 64, ny: 64 };
/**
 * The generators trust their typed inputs: a request's matrix and spec are checked once, at the
 * edge (validateMatrix + parseSampling, as the HTTP schema does), then the generator checks what
 * needs the matrix. These run both, as a request does.
 */
function generateChecked(matrix: { nx: number; ny: number }, s: SamplingSpec, limits?: Limits) {
  return generateMask(validateMatrix(matrix, limits), parseSampling(s), limits);
}
async function resolveChecked(matrix: { nx: number; ny: number }, s: SamplingSpec, limits?: Limits) {
  return resolveSampling(validateMatrix(matrix, limits), parseSampling(s), limits);
}

const spec = (s: Record<string, unknown>) => s as unknown as SamplingSpec;

// Every rule below is the "bad input" list; the error must name the field and the allowed range.
describe('bad sampling input gives a ValidationError naming the field and the allowed range', () => {
  it('R < 1', () => {
    const [p] = problemsOf(() =>
      generateChecked(square, spec({ pattern: 'cartesian-uniform', acceleration: 0.9 })),
    );
    expect(p.field).toBe('sampling.acceleration');
    expect(p.allowed).toBe('≥ 1');
  });

  it('R that is not a finite number', () => {
    for (const acceleration of [Number.NaN, Number.POSITIVE_INFINITY, '4']) {
      const [p] = problemsOf(() => generateChecked(square, spec({ pattern: 'radial', acceleration })));
      expect(p.field).toBe('sampling.acceleration');
    }
  });

  it('R higher than the matrix allows (each family counts in its own unit)', () => {
    const lines = problemsOf(() =>
      generateChecked(square, spec({ pattern: 'cartesian-uniform', acceleration: 65 })),
    );
    expect(lines[0]).toMatchObject({ field: 'sampling.acceleration', allowed: '1 ≤ acceleration ≤ 64 (ny)' });
    const random = problemsOf(() =>
      generateChecked(square, spec({ pattern: 'cartesian-random', acceleration: 100, seed: 1 })),
    );
    expect(random[0].field).toBe('sampling.acceleration');
    const points = problemsOf(() =>
      generateChecked({ nx: 8, ny: 8 }, spec({ pattern: 'poisson-disc', acceleration: 65, seed: 1 })),
    );
    expect(points[0]).toMatchObject({
      field: 'sampling.acceleration',
      allowed: '1 ≤ acceleration ≤ 64 (nx·ny)',
    });
    // 64 → ⌈π/2·64⌉ = 101 Nyquist spokes (docs/references.md §3.5 rule).
    const spokes = problemsOf(() => generateChecked(square, spec({ pattern: 'radial', acceleration: 102 })));
    expect(spokes[0].field).toBe('sampling.acceleration');
    expect(spokes[0].allowed).toContain('≤ 101');
  });

  it('ACS larger than the matrix', () => {
    const lines = problemsOf(() =>
      generateChecked(square, spec({ pattern: 'cartesian-uniform', acceleration: 1, acs: 65 })),
    );
    expect(lines[0]).toMatchObject({ field: 'sampling.acs', allowed: '0 ≤ acs ≤ 64 (ny)' });
    const squareAcs = problemsOf(() =>
      generateChecked(
        { nx: 64, ny: 32 },
        spec({ pattern: 'poisson-disc', acceleration: 1, acs: 33, seed: 1 }),
      ),
    );
    expect(squareAcs[0]).toMatchObject({ field: 'sampling.acs', allowed: '0 ≤ acs ≤ 32 (min(nx, ny))' });
  });

  it('ACS that does not fit in the line budget round(ny/R) (docs/references.md §3.2)', () => {
    // ny = 64, R = 8 → 8 lines < 12 ACS lines; R must stay ≤ 64/11.5 = 5.565 for 12 ACS lines.
    const problems = problemsOf(() =>
      generateChecked(square, spec({ pattern: 'cartesian-uniform', acceleration: 8, acs: 12 })),
    );
    expect(problems.map((p) => p.field)).toEqual(['sampling.acceleration', 'sampling.acs']);
    expect(problems[0].allowed).toContain('≤ 5.565');
    expect(problems[1].allowed).toContain('0 ≤ acs ≤ 8');
  });

  it('ACS that leaves no line (or point) to draw at random', () => {
    // round(64/4) = 16 lines, all taken by 16 ACS lines.
    const lines = problemsOf(() =>
      generateChecked(square, spec({ pattern: 'cartesian-random', acceleration: 4, acs: 16, seed: 1 })),
    );
    expect(lines.map((p) => p.field)).toContain('sampling.acs');
    expect(lines.find((p) => p.field === 'sampling.acs')?.allowed).toContain('0 ≤ acs ≤ 15');
    // round(4096/4) = 1024 points = a 32×32 ACS square.
    const points = problemsOf(() =>
      generateChecked(square, spec({ pattern: 'poisson-disc', acceleration: 4, acs: 32, seed: 1 })),
    );
    expect(points[0]).toMatchObject({
      field: 'sampling.acs',
      allowed: '0 ≤ acs ≤ 31 (acs² < round(nx·ny / R))',
    });
  });

  it('ACS that is negative or not an integer', () => {
    for (const [acs, allowed] of [
      [-1, '≥ 0'],
      [2.5, 'an integer'],
    ] as const) {
      const [p] = problemsOf(() =>
        generateChecked(square, spec({ pattern: 'cartesian-uniform', acceleration: 2, acs })),
      );
      expect(p).toMatchObject({ field: 'sampling.acs', allowed });
    }
  });

  it('matrix beyond the configured limits is a LimitError naming matrix.nx / matrix.ny', () => {
    const limits = { ...defaultLimits, maxMatrixSide: 128 };
    let caught: unknown;
    try {
      generateChecked({ nx: 129, ny: 64 }, spec({ pattern: 'cartesian-uniform', acceleration: 2 }), limits);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(LimitError);
    expect((caught as LimitError).problems[0]).toMatchObject({
      field: 'matrix.nx',
      allowed: '≤ 128',
    });
  });

  it('non-integer, zero or non-numeric matrix sizes', () => {
    for (const matrix of [
      { nx: 64.5, ny: 64 },
      { nx: 64, ny: 0 },
      { nx: '64', ny: 64 },
    ]) {
      const problems = problemsOf(() =>
        generateChecked(matrix as { nx: number; ny: number }, spec({ pattern: 'radial', acceleration: 2 })),
      );
      expect(problems[0].field).toMatch(/^matrix\.n[xy]$/);
      expect(problems[0].allowed).toMatch(/^(an integer|≥ 1|a value of type number)$/);
    }
  });

  it('unknown or missing pattern', () => {
    for (const s of [{ pattern: 'zigzag', acceleration: 2 }, { acceleration: 2 }]) {
      const [p] = problemsOf(() => generateChecked(square, spec(s)));
      expect(p.field).toBe('sampling.pattern');
      expect(p.allowed).toContain('"poisson-disc"');
    }
  });

  it('missing seed where one is required, and seeds out of range', () => {
    for (const pattern of ['cartesian-random', 'poisson-disc']) {
      const [p] = problemsOf(() => generateChecked(square, spec({ pattern, acceleration: 2 })));
      expect(p).toMatchObject({ field: 'sampling.seed', allowed: 'integer, 0 ≤ seed ≤ 4294967295' });
    }
    for (const seed of [-1, 1.5, 2 ** 32]) {
      const [p] = problemsOf(() =>
        generateChecked(square, spec({ pattern: 'cartesian-random', acceleration: 2, seed })),
      );
      expect(p.field).toBe('sampling.seed');
    }
    // Deterministic patterns need no seed and report none.
    expect(generateChecked(square, spec({ pattern: 'cartesian-uniform', acceleration: 2 })).seed).toBeNull();
    expect(
      generateChecked(square, spec({ pattern: 'radial', acceleration: 2, angles: 'golden' })).seed,
    ).toBeNull();
  });

  it('bad density power and radial angle ordering', () => {
    const [power] = problemsOf(() =>
      generateChecked(
        square,
        spec({ pattern: 'cartesian-random', acceleration: 2, seed: 1, density: { power: -1 } }),
      ),
    );
    expect(power).toMatchObject({ field: 'sampling.density.power', allowed: '≥ 0' });
    // Poisson-disc needs some fall-off and at most 8 (sampling/schema.ts states why).
    for (const [value, allowed] of [
      [0, '≥ 0.5'],
      [9, '≤ 8'],
    ] as const) {
      const [p] = problemsOf(() =>
        generateChecked(
          square,
          spec({ pattern: 'poisson-disc', acceleration: 2, seed: 1, density: { power: value } }),
        ),
      );
      expect(p).toMatchObject({ field: 'sampling.density.power', allowed });
    }
    const [angles] = problemsOf(() =>
      generateChecked(square, spec({ pattern: 'radial', acceleration: 2, angles: 'spiral' })),
    );
    expect(angles.field).toBe('sampling.angles');
    expect(angles.allowed).toBe('one of "uniform", "golden", "tiny-golden"');
  });

  it('a custom mask through the synchronous generator is refused with a typed error', () => {
    const [p] = problemsOf(() =>
      generateChecked(square, spec({ pattern: 'custom', maskPng: 'iVBORw0KGgo=' })),
    );
    expect(p.field).toBe('sampling.pattern');
  });

  it('a custom mask that is not base64 / not a PNG', async () => {
    await expect(
      resolveChecked(square, spec({ pattern: 'custom', maskPng: 'not base64!' })),
    ).rejects.toMatchObject({
      problems: [{ field: 'sampling.maskPng' }],
    });
    const text = Buffer.from('plain text, not an image').toString('base64');
    await expect(resolveChecked(square, spec({ pattern: 'custom', maskPng: text }))).rejects.toMatchObject({
      problems: [{ field: 'sampling.maskPng', allowed: 'a base64 PNG' }],
    });
  });

  it('the schema accepts the docs/design.md §4.3 example piece unchanged', () => {
    const piece = {
      pattern: 'cartesian-random',
      acceleration: 4,
      acs: 24,
      seed: 1,
      density: { power: 2 },
    };
    expect(samplingSchema.parse(piece)).toEqual(piece);
  });
});
