import { describe, expect, it } from 'vitest';
import { specLabels } from '../../src/plan/labels.ts';

// Source: the project's own labelling rule for table rows (docs/design.md §2.3: one row per pattern × R ×
// method, so repeated methods need labels that tell them apart); inputs are hand-made.

describe('row labels for patterns and methods', () => {
  it('a unique name stands alone; repeated names show the parameters that differ', () => {
    expect(
      specLabels(
        [
          { name: 'zero-filled' },
          { name: 'cs-tv', lambda: 0.01, iterations: 50 },
          { name: 'cs-tv', lambda: 0.1, iterations: 50 },
        ],
        'name',
      ),
    ).toEqual(['zero-filled', 'cs-tv (iterations 50, lambda 0.01)', 'cs-tv (iterations 50, lambda 0.1)']);
  });

  it('nested parameters are dotted; embedded mask images are left out; identical entries get a position', () => {
    expect(
      specLabels(
        [
          { pattern: 'poisson-disc', acs: 24, density: { power: 2 } },
          { pattern: 'poisson-disc', acs: 24, density: { power: 5 } },
          { pattern: 'custom', maskPng: 'AAAA' },
          { pattern: 'custom', maskPng: 'BBBB' },
        ],
        'pattern',
      ),
    ).toEqual([
      'poisson-disc (acs 24, density.power 2)',
      'poisson-disc (acs 24, density.power 5)',
      'custom [3]',
      'custom [4]',
    ]);
  });
});
