import type { SeededRandom } from '../src/core/random.ts';

/**
 * Inclusion probabilities π_i = min(1, s·w_i) with Σ π_i = m exactly (up to rounding), the
 * variable-density PDF of Lustig, Donoho & Pauly 2007 scaled to an expected count of m. The
 * piecewise-linear equation in s is solved exactly rather than by bisection: with the weights
 * sorted in decreasing order, the first k saturate (π = 1) for the smallest k at which
 * s = (m − k)/Σ_{j≥k} w_(j) leaves w_(k)·s ≤ 1. Should m exceed the number of positive weights,
 * those saturate and the rest of m is spread evenly over the zero-weight entries.
 * Requires 0 ≤ m ≤ weights.length and non-negative weights.
 */
export function inclusionProbabilities(weights: Float64Array, m: number): Float64Array {
  const n = weights.length;
  if (!(m >= 0 && m <= n)) throw new RangeError(`m must lie in [0, ${n}], got ${m}`);
  const pi = new Float64Array(n);
  if (m === 0) return pi;
  const order = Array.from({ length: n }, (_, i) => i)
    .filter((i) => weights[i] > 0)
    .sort((a, b) => weights[b] - weights[a] || a - b);
  const positive = order.length;
  const tail = new Float64Array(positive + 1);
  for (let j = positive - 1; j >= 0; j--) tail[j] = tail[j + 1] + weights[order[j]];
  for (let k = 0; k < positive && k < m; k++) {
    const s = (m - k) / tail[k];
    if (weights[order[k]] * s <= 1) {
      for (let j = 0; j < k; j++) pi[order[j]] = 1;
      for (let j = k; j < positive; j++) pi[order[j]] = weights[order[j]] * s;
      return pi;
    }
  }
  for (let j = 0; j < positive; j++) pi[order[j]] = 1;
  const rest = m - positive;
  if (rest > 0) {
    const zero = n - positive;
    for (let i = 0; i < n; i++) if (!(weights[i] > 0)) pi[i] = rest / zero;
  }
  return pi;
}

/**
 * Draws exactly m distinct indices without replacement so that index i is chosen with probability
 * π_i (Σ π = m, each π_i ≤ 1): randomised systematic sampling with probability proportional to
 * size — the units are put in random order, a random start u ∈ [0, 1) is drawn, and a unit is
 * chosen when its stretch of the running sum of π covers one of u, u + 1, …, u + m − 1
 * (Madow 1949; randomised order: Goodman & Kish 1950 — from memory). A rounding shortfall of the
 * running sum (≈ 1e-13) is made up with the most probable units not yet chosen.
 */
export function systematicSample(pi: Float64Array, m: number, rng: SeededRandom): Uint8Array {
  const n = pi.length;
  const order = new Int32Array(n);
  for (let i = 0; i < n; i++) order[i] = i;
  for (let i = n - 1; i > 0; i--) {
    const j = rng.integer(i + 1);
    const t = order[i];
    order[i] = order[j];
    order[j] = t;
  }
  const chosen = new Uint8Array(n);
  let next = rng.uniform();
  let running = 0;
  let count = 0;
  for (let t = 0; t < n && count < m; t++) {
    const i = order[t];
    running += pi[i];
    if (running > next) {
      chosen[i] = 1;
      count++;
      next += 1;
    }
  }
  if (count < m) {
    const rest = Array.from({ length: n }, (_, i) => i)
      .filter((i) => chosen[i] === 0)
      .sort((a, b) => pi[b] - pi[a] || a - b);
    for (let t = 0; count < m; t++, count++) chosen[rest[t]] = 1;
  }
  return chosen;
}
