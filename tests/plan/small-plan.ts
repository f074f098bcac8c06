/**
 * The small sweep the plan tests share: modified Shepp–Logan on 32×32, TR 500 ms (so the fully
 * sampled 2D scan is 32 × 0.5 s = 16 s, docs/references.md §8), cartesian-uniform and cartesian-random
 * with 4 ACS lines, R 2, 3, 4, zero-filled, 2 seeds. Tests override what they vary.
 */
export function smallPlanBody(overrides: Record<string, unknown> = {}) {
  return {
    source: { phantom: 'shepp-logan-modified' },
    matrix: { nx: 32, ny: 32 },
    protocol: { trMs: 500 },
    patterns: [
      { pattern: 'cartesian-uniform', acs: 4 },
      { pattern: 'cartesian-random', acs: 4 },
    ],
    accelerations: [2, 3, 4],
    methods: [{ name: 'zero-filled' }],
    seeds: 2,
    ...overrides,
  };
}

/**
 * A plan whose cells are slow enough (cs-tv, 300 iterations on 48×48) that a test can act while it
 * runs: 1 pattern × 3 R × 3 seeds + 3 reference cells = 12 cells. Tests override what they vary.
 */
export function slowPlanBody(overrides: Record<string, unknown> = {}) {
  return smallPlanBody({
    matrix: { nx: 48, ny: 48 },
    patterns: [{ pattern: 'cartesian-random', acs: 4 }],
    methods: [{ name: 'cs-tv', iterations: 300 }],
    seeds: 3,
    ...overrides,
  });
}
