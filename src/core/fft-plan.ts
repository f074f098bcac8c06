// fft.js indexes its buffers only, so Float64Array works; its declarations take `any` for them.
import FFT from 'fft.js';

/**
 * One-dimensional unnormalised forward DFT of any length N,
 *   X[k] = Σ_n x[n] e^(−i2π nk/N),
 * on interleaved complex buffers. Powers of two go straight to fft.js (radix-4). A length
 * N = P·Q with P a power of two and Q odd is split once, Cooley–Tukey style, into Q transforms of
 * length P, twiddles, and P transforms of length Q (butterflies for Q = 3 and 5, a direct sum for
 * other Q ≤ 32; so the common MR sizes 320 = 64·5 and 384 = 128·3 cost little more than a power
 * of two). Odd lengths up to 32 use a direct table;
 * longer odd lengths use Bluestein's chirp-z identity nk = (n² + k² − (k − n)²)/2, which turns the
 * DFT into a linear convolution done with a power-of-two fft.js transform of length M ≥ 2N − 1
 * (Bluestein 1970). Chirp exponents use n² mod 2N so they stay exact for large N.
 * A plan owns its scratch buffers: it is not re-entrant, which is fine on one thread.
 */
export interface FftPlan {
  readonly size: number;
  /** Transforms `input` (2N numbers) into `output` (2N numbers); the two must differ. */
  forward(output: Float64Array, input: Float64Array): void;
}

const isPowerOfTwo = (n: number): boolean => n > 0 && (n & (n - 1)) === 0;

function radixPlan(size: number): FftPlan {
  const fft = new FFT(size);
  return {
    size,
    forward(output, input) {
      fft.transform(output, input);
    },
  };
}

function trivialPlan(): FftPlan {
  return {
    size: 1,
    forward(output, input) {
      output[0] = input[0];
      output[1] = input[1];
    },
  };
}

/** out[k] = x[k]·y[k] for the first `count` interleaved complex numbers; out may be x or y. */
function multiplyComplex(out: Float64Array, x: Float64Array, y: Float64Array, count: number): void {
  for (let k = 0; k < count; k++) {
    const xr = x[2 * k];
    const xi = x[2 * k + 1];
    const yr = y[2 * k];
    const yi = y[2 * k + 1];
    out[2 * k] = xr * yr - xi * yi;
    out[2 * k + 1] = xr * yi + xi * yr;
  }
}

function bluesteinPlan(size: number): FftPlan {
  let m = 1;
  while (m < 2 * size - 1) m *= 2;
  const inner = new FFT(m);
  // chirp[n] = e^(−iπ n²/N), with n² reduced mod 2N.
  const chirp = new Float64Array(2 * size);
  for (let n = 0; n < size; n++) {
    const phase = (-Math.PI * ((n * n) % (2 * size))) / size;
    chirp[2 * n] = Math.cos(phase);
    chirp[2 * n + 1] = Math.sin(phase);
  }
  // b[m] = conj(chirp[|m|]) for m = −(N−1)…(N−1), negative indices wrapped to M − |m|.
  const b = new Float64Array(2 * m);
  for (let n = 0; n < size; n++) {
    b[2 * n] = chirp[2 * n];
    b[2 * n + 1] = -chirp[2 * n + 1];
    if (n > 0) {
      b[2 * (m - n)] = chirp[2 * n];
      b[2 * (m - n) + 1] = -chirp[2 * n + 1];
    }
  }
  const bHat = new Float64Array(2 * m);
  inner.transform(bHat, b);
  const a = new Float64Array(2 * m);
  const aHat = new Float64Array(2 * m);
  const conv = new Float64Array(2 * m);
  return {
    size,
    forward(output, input) {
      a.fill(0);
      multiplyComplex(a, input, chirp, size);
      inner.transform(aHat, a);
      multiplyComplex(aHat, aHat, bHat, m);
      // fft.js's inverse includes the 1/M factor the convolution theorem needs.
      inner.inverseTransform(conv, aHat);
      multiplyComplex(output, conv, chirp, size);
    },
  };
}

/** The n distinct twiddles e^(−i2πj/n), j = 0…n−1, of a length-n DFT as cos and sin tables. */
function dftTwiddles(n: number): { cos: Float64Array; sin: Float64Array } {
  const cos = new Float64Array(n);
  const sin = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    cos[j] = Math.cos((-2 * Math.PI * j) / n);
    sin[j] = Math.sin((-2 * Math.PI * j) / n);
  }
  return { cos, sin };
}

/** Direct O(N²) DFT with a precomputed table of the N distinct twiddles, for short odd lengths. */
function directPlan(size: number): FftPlan {
  const { cos, sin } = dftTwiddles(size);
  return {
    size,
    forward(output, input) {
      for (let k = 0; k < size; k++) {
        let re = 0;
        let im = 0;
        for (let n = 0, t = 0; n < size; n++, t = (t + k) % size) {
          const xr = input[2 * n];
          const xi = input[2 * n + 1];
          re += xr * cos[t] - xi * sin[t];
          im += xr * sin[t] + xi * cos[t];
        }
        output[2 * k] = re;
        output[2 * k + 1] = im;
      }
    },
  };
}

/**
 * N = P·Q split: with n = Q·n1 + n2 and k = k1 + P·k2,
 *   X[k1 + P·k2] = Σ_{n2} W_Q^{n2·k2} · W_N^{n2·k1} · Σ_{n1} x[Q·n1 + n2] W_P^{n1·k1}.
 */
function splitPlan(size: number, p: number, q: number): FftPlan {
  const inner = fftPlan(p);
  const outer = q <= 32 ? null : fftPlan(q);
  const twiddle = new Float64Array(2 * size);
  for (let n2 = 0; n2 < q; n2++) {
    for (let k1 = 0; k1 < p; k1++) {
      const phase = (-2 * Math.PI * ((n2 * k1) % size)) / size;
      twiddle[2 * (n2 * p + k1)] = Math.cos(phase);
      twiddle[2 * (n2 * p + k1) + 1] = Math.sin(phase);
    }
  }
  const smallQ = q <= 32;
  const { cos: qCos, sin: qSin } = dftTwiddles(q);
  const y = new Float64Array(2 * size);
  const inP = new Float64Array(2 * p);
  const outP = new Float64Array(2 * p);
  const inQ = new Float64Array(2 * q);
  const outQ = new Float64Array(2 * q);
  return {
    size,
    forward(output, input) {
      for (let n2 = 0; n2 < q; n2++) {
        for (let n1 = 0; n1 < p; n1++) {
          inP[2 * n1] = input[2 * (q * n1 + n2)];
          inP[2 * n1 + 1] = input[2 * (q * n1 + n2) + 1];
        }
        inner.forward(outP, inP);
        const base = 2 * n2 * p;
        for (let k1 = 0; k1 < p; k1++) {
          const vr = outP[2 * k1];
          const vi = outP[2 * k1 + 1];
          const tr = twiddle[base + 2 * k1];
          const ti = twiddle[base + 2 * k1 + 1];
          y[base + 2 * k1] = vr * tr - vi * ti;
          y[base + 2 * k1 + 1] = vr * ti + vi * tr;
        }
      }
      if (q === 3) {
        radix3Columns(output, y, p);
        return;
      }
      if (q === 5) {
        radix5Columns(output, y, p);
        return;
      }
      if (smallQ) {
        // Short odd factor: the length-Q DFTs run across all k1 at once (contiguous inner loop).
        for (let k2 = 0; k2 < q; k2++) {
          const out = 2 * p * k2;
          for (let i = 0; i < 2 * p; i++) output[out + i] = 0;
          for (let n2 = 0; n2 < q; n2++) {
            const t = (n2 * k2) % q;
            const wr = qCos[t];
            const wi = qSin[t];
            const base = 2 * n2 * p;
            for (let k1 = 0; k1 < 2 * p; k1 += 2) {
              const vr = y[base + k1];
              const vi = y[base + k1 + 1];
              output[out + k1] += vr * wr - vi * wi;
              output[out + k1 + 1] += vr * wi + vi * wr;
            }
          }
        }
        return;
      }
      for (let k1 = 0; k1 < p; k1++) {
        for (let n2 = 0; n2 < q; n2++) {
          inQ[2 * n2] = y[2 * (n2 * p + k1)];
          inQ[2 * n2 + 1] = y[2 * (n2 * p + k1) + 1];
        }
        outer!.forward(outQ, inQ);
        for (let k2 = 0; k2 < q; k2++) {
          output[2 * (k1 + p * k2)] = outQ[2 * k2];
          output[2 * (k1 + p * k2) + 1] = outQ[2 * k2 + 1];
        }
      }
    },
  };
}

const SIN_60 = Math.sqrt(3) / 2;

/**
 * out[k1 + P·k2] = Σ_{n2<3} y[n2·P + k1] e^(−i2π n2·k2/3) for every k1 < P: the length-3 DFT as a
 * butterfly (t = y1 + y2, X0 = y0 + t, X1,2 = y0 − t/2 ∓ i·(√3/2)(y1 − y2)), 4 real multiplies
 * per column instead of the direct sum's 36.
 */
function radix3Columns(out: Float64Array, y: Float64Array, p: number): void {
  const s1 = 2 * p;
  const s2 = 4 * p;
  for (let k = 0; k < 2 * p; k += 2) {
    const x0r = y[k];
    const x0i = y[k + 1];
    const x1r = y[s1 + k];
    const x1i = y[s1 + k + 1];
    const x2r = y[s2 + k];
    const x2i = y[s2 + k + 1];
    const tr = x1r + x2r;
    const ti = x1i + x2i;
    const ar = x0r - 0.5 * tr;
    const ai = x0i - 0.5 * ti;
    const br = SIN_60 * (x1r - x2r);
    const bi = SIN_60 * (x1i - x2i);
    out[k] = x0r + tr;
    out[k + 1] = x0i + ti;
    out[s1 + k] = ar + bi;
    out[s1 + k + 1] = ai - br;
    out[s2 + k] = ar - bi;
    out[s2 + k + 1] = ai + br;
  }
}

const COS_72 = Math.cos((2 * Math.PI) / 5);
const COS_144 = Math.cos((4 * Math.PI) / 5);
const SIN_72 = Math.sin((2 * Math.PI) / 5);
const SIN_144 = Math.sin((4 * Math.PI) / 5);

/**
 * The length-5 DFT across columns as radix3Columns does the length-3 one. With t1 = y1 + y4,
 * t2 = y2 + y3, t3 = y1 − y4, t4 = y2 − y3 and W = e^(−i2π/5), pairing W^n with W^(5−n) = conj(W^n):
 *   X0 = y0 + t1 + t2,
 *   X1,4 = y0 + cos72°·t1 + cos144°·t2 ∓ i(sin72°·t3 + sin144°·t4),
 *   X2,3 = y0 + cos144°·t1 + cos72°·t2 ∓ i(sin144°·t3 − sin72°·t4).
 */
function radix5Columns(out: Float64Array, y: Float64Array, p: number): void {
  const s1 = 2 * p;
  const s2 = 4 * p;
  const s3 = 6 * p;
  const s4 = 8 * p;
  for (let k = 0; k < 2 * p; k += 2) {
    const x0r = y[k];
    const x0i = y[k + 1];
    const t1r = y[s1 + k] + y[s4 + k];
    const t1i = y[s1 + k + 1] + y[s4 + k + 1];
    const t2r = y[s2 + k] + y[s3 + k];
    const t2i = y[s2 + k + 1] + y[s3 + k + 1];
    const t3r = y[s1 + k] - y[s4 + k];
    const t3i = y[s1 + k + 1] - y[s4 + k + 1];
    const t4r = y[s2 + k] - y[s3 + k];
    const t4i = y[s2 + k + 1] - y[s3 + k + 1];
    const a1r = x0r + COS_72 * t1r + COS_144 * t2r;
    const a1i = x0i + COS_72 * t1i + COS_144 * t2i;
    const a2r = x0r + COS_144 * t1r + COS_72 * t2r;
    const a2i = x0i + COS_144 * t1i + COS_72 * t2i;
    const b1r = SIN_72 * t3r + SIN_144 * t4r;
    const b1i = SIN_72 * t3i + SIN_144 * t4i;
    const b2r = SIN_144 * t3r - SIN_72 * t4r;
    const b2i = SIN_144 * t3i - SIN_72 * t4i;
    out[k] = x0r + t1r + t2r;
    out[k + 1] = x0i + t1i + t2i;
    // −i·b = (b.im, −b.re).
    out[s1 + k] = a1r + b1i;
    out[s1 + k + 1] = a1i - b1r;
    out[s4 + k] = a1r - b1i;
    out[s4 + k + 1] = a1i + b1r;
    out[s2 + k] = a2r + b2i;
    out[s2 + k + 1] = a2i - b2r;
    out[s3 + k] = a2r - b2i;
    out[s3 + k + 1] = a2i + b2r;
  }
}

function makePlan(size: number): FftPlan {
  if (size === 1) return trivialPlan();
  if (isPowerOfTwo(size)) return radixPlan(size);
  const p = size & -size; // largest power-of-two factor
  if (p > 1) return splitPlan(size, p, size / p);
  return size <= 32 ? directPlan(size) : bluesteinPlan(size);
}

const plans = new Map<number, FftPlan>();

/** The cached plan for length `size` (twiddles, chirps and scratch made once per length). */
export function fftPlan(size: number): FftPlan {
  if (!Number.isInteger(size) || size < 1)
    throw new RangeError(`size must be a positive integer, got ${size}`);
  let plan = plans.get(size);
  if (!plan) {
    plan = makePlan(size);
    plans.set(size, plan);
  }
  return plan;
}
