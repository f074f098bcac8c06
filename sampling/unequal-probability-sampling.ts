import type { SeededRandom } from '../src/core/random.ts';

/**
 * Inclusion probabilities π_i = min(1, s·w_i) with Σ π_i = m exactly (up to rounding), the
 * variable-density PDF of Lustig, Donoho & Pauly 2007 scaled to an expected count of m. The
 * piecewise-linear equation in s is solved exactly rather than by bisection, by capping: with S the
 * set of saturated entries (π = 1), s = (m − |S|)/Σ_{i∉S} w_i; entries whose s·w_i reaches 1 join S
 * and s is recomputed until S stops growing (s only grows, so S never loses a member). Should m
 * exceed the number of positive weights, those saturate and the rest of m is spread evenly over
 * the zero-weight entries. Requires 0 ≤ m ≤ weights.length and non-negative weights.
 */
export function inclusionProbabilities(weights: Float64Array, m: number): Float64Array {
  const n = weights.length;
  if (!(m >= 0 && m <= n)) throw new RangeError(`m must lie in [0, ${n}], got ${m}`);
  const pi = new Float64Array(n);
  if (m === 0) return pi;
  const saturated = new Uint8Array(n);
  let positive = 0;
  for (let i = 0; i < n; i++) if (weights[i] > 0) positive++;
  if (positive <= m) {
    const zero = n - positive;
    for (let i = 0; i < n; i++) pi[i] = weights[i] > 0 ? 1 : (m - positive) / zero;
    return pi;
  }
  let capped = 0;
  let scale = 0;
  for (;;) {
    let free = 0;
    for (let i = 0; i < n; i++) if (saturated[i] === 0) free += weights[i];
    scale = (m - capped) / free;
    let grew = false;
    for (let i = 0; i < n; i++) {
      if (saturated[i] === 0 && weights[i] * scale >= 1) {
        saturated[i] = 1;
        capped++;
        grew = true;
      }
    }
    if (!grew) break;
  }
  for (let i = 0; i < n; i++) pi[i] = saturated[i] === 1 ? 1 : weights[i] * scale;
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
