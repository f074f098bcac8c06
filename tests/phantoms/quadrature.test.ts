import { describe, expect, it } from 'vitest';
import { gaussLegendre } from './quadrature.ts';

// The phantom tests lean on these rules as their independent reference, so check the rules first.
describe('Gauss–Legendre reference rule', () => {
  it('integrates x^(2n−2) over [−1, 1] to 2/(2n − 1) (exact for degree ≤ 2n − 1; textbook property)', () => {
    for (const n of [5, 16, 48]) {
      const { nodes, weights } = gaussLegendre(n);
      let sum = 0;
      for (let i = 0; i < n; i++) sum += weights[i] * nodes[i] ** (2 * n - 2);
      expect(Math.abs(sum - 2 / (2 * n - 1))).toBeLessThan(1e-14);
    }
  });

  it('integrates cos over [−1, 1] to 2 sin 1 (closed form)', () => {
    const { nodes, weights } = gaussLegendre(20);
    let sum = 0;
    for (let i = 0; i < nodes.length; i++) sum += weights[i] * Math.cos(nodes[i]);
    expect(Math.abs(sum - 2 * Math.sin(1))).toBeLessThan(1e-15);
  });
});
