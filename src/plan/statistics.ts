/** Mean and spread of one quantity over a plan's seeds. `null` stands for +∞ (see metric-direction.ts). */
export interface Summary {
  mean: number | null;
  /** Sample standard deviation (divisor n − 1); 0 for a single value; null (undefined) when the mean is +∞. */
  sd: number | null;
}

/**
 * Mean as x₀ + Σ(xᵢ − x₀)/n so that equal values give exactly that value (a plain Σxᵢ/n turns three
 * copies of 0.1 into 0.10000000000000002), then the sample standard deviation with divisor n − 1,
 * the common practice for repeated draws. Any +∞ (null) makes the mean +∞ and the spread undefined.
 */
export function summarize(values: readonly (number | null)[]): Summary {
  if (values.length === 0) throw new RangeError('summarize needs at least one value');
  if (values.some((v) => v === null || !Number.isFinite(v))) return { mean: null, sd: null };
  const xs = values as readonly number[];
  return { mean: mean(xs), sd: sampleStandardDeviation(xs) };
}

export function mean(xs: readonly number[]): number {
  const x0 = xs[0];
  let shifted = 0;
  for (const x of xs) shifted += x - x0;
  return x0 + shifted / xs.length;
}

export function sampleStandardDeviation(xs: readonly number[]): number {
  if (xs.length < 2) return 0;
  const m = mean(xs);
  let squares = 0;
  for (const x of xs) squares += (x - m) * (x - m);
  return Math.sqrt(squares / (xs.length - 1));
}
