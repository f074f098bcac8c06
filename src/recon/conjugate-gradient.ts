import { throwIfAborted } from '../core/errors.ts';

export interface ConjugateGradientResult {
  iterations: number;
  /** ‖b − A x‖ / ‖b‖ at the end (the recursively updated residual; 0 when b = 0). */
  residual: number;
  converged: boolean;
}

/**
 * Conjugate gradients (Hestenes & Stiefel 1952) for A x = b with A Hermitian positive
 * (semi-)definite on complex vectors stored interleaved re/im. For Hermitian A the step sizes
 * α = ⟨r, r⟩/⟨p, A p⟩ and β are real, so every inner product is the real dot product of the
 * interleaved arrays. Starts from the given x (usually 0), stops after `iterations` or when
 * ‖r‖ ≤ tolerance·‖b‖. `apply(v, out)` writes A v into out and must not keep either array.
 */
export function conjugateGradient(
  apply: (v: Float64Array, out: Float64Array) => void,
  b: Float64Array,
  x: Float64Array,
  options: { iterations: number; tolerance: number; signal?: AbortSignal },
): ConjugateGradientResult {
  const length = b.length;
  const r = new Float64Array(length);
  const p = new Float64Array(length);
  const q = new Float64Array(length);
  apply(x, q);
  for (let i = 0; i < length; i++) r[i] = b[i] - q[i];
  p.set(r);
  const bNorm = Math.sqrt(dot(b, b));
  if (bNorm === 0) {
    x.fill(0);
    return { iterations: 0, residual: 0, converged: true };
  }
  let rr = dot(r, r);
  let run = 0;
  for (let it = 0; it < options.iterations; it++) {
    if (Math.sqrt(rr) <= options.tolerance * bNorm) break;
    throwIfAborted(options.signal);
    apply(p, q);
    const pq = dot(p, q);
    if (!(pq > 0)) break; // p lies in A's null space: nothing left to reduce along it.
    const alpha = rr / pq;
    for (let i = 0; i < length; i++) {
      x[i] += alpha * p[i];
      r[i] -= alpha * q[i];
    }
    const next = dot(r, r);
    const beta = next / rr;
    rr = next;
    for (let i = 0; i < length; i++) p[i] = r[i] + beta * p[i];
    run = it + 1;
  }
  const residual = Math.sqrt(rr) / bNorm;
  return { iterations: run, residual, converged: residual <= options.tolerance };
}

function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}
