import FFT from 'fft.js';

/**
 * One-dimensional unnormalised forward DFT of any length N,
 *   X[k] = Σ_n x[n] e^(−i2π nk/N),
 * on interleaved complex buffers. Powers of two go straight to fft.js (radix-4); every other
 * length uses Bluestein's chirp-z identity nk = (n² + k² − (k − n)²)/2, which turns the DFT into
 * a linear convolution done with a power-of-two fft.js transform of length M ≥ 2N − 1
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
      fft.transform(output as unknown as number[], input as unknown as number[]);
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
  inner.transform(bHat as unknown as number[], b as unknown as number[]);
  const a = new Float64Array(2 * m);
  const aHat = new Float64Array(2 * m);
  const conv = new Float64Array(2 * m);
  return {
    size,
    forward(output, input) {
      a.fill(0);
      for (let n = 0; n < size; n++) {
        const xr = input[2 * n];
        const xi = input[2 * n + 1];
        const cr = chirp[2 * n];
        const ci = chirp[2 * n + 1];
        a[2 * n] = xr * cr - xi * ci;
        a[2 * n + 1] = xr * ci + xi * cr;
      }
      inner.transform(aHat as unknown as number[], a as unknown as number[]);
      for (let k = 0; k < m; k++) {
        const ar = aHat[2 * k];
        const ai = aHat[2 * k + 1];
        const br = bHat[2 * k];
        const bi = bHat[2 * k + 1];
        aHat[2 * k] = ar * br - ai * bi;
        aHat[2 * k + 1] = ar * bi + ai * br;
      }
      // fft.js's inverse includes the 1/M factor the convolution theorem needs.
      inner.inverseTransform(conv as unknown as number[], aHat as unknown as number[]);
      for (let k = 0; k < size; k++) {
        const vr = conv[2 * k];
        const vi = conv[2 * k + 1];
        const cr = chirp[2 * k];
        const ci = chirp[2 * k + 1];
        output[2 * k] = vr * cr - vi * ci;
        output[2 * k + 1] = vr * ci + vi * cr;
      }
    },
  };
}

const plans = new Map<number, FftPlan>();

/** The cached plan for length `size` (twiddles, chirps and scratch made once per length). */
export function fftPlan(size: number): FftPlan {
  if (!Number.isInteger(size) || size < 1)
    throw new RangeError(`size must be a positive integer, got ${size}`);
  let plan = plans.get(size);
  if (!plan) {
    plan = size === 1 ? trivialPlan() : isPowerOfTwo(size) ? radixPlan(size) : bluesteinPlan(size);
    plans.set(size, plan);
  }
  return plan;
}
