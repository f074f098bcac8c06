import type { WaveletFilters } from './daubechies-filters.ts';

/**
 * One level of the periodised 1D orthogonal wavelet transform along one line of an interleaved
 * complex buffer (re and im transformed alike), in the style of `centeredLineTransform`: the
 * `size` elements at `start`, `start + step`, … (complex indices) of `source` are read, and the
 * approximation a[o] lands at positions 0 … size/2 − 1 of the same line of `target`, the detail
 * d[o] at size/2 … size − 1. `target` may be `source`. `size` must be even.
 *
 * Periodisation (PyWavelets' mode 'periodization'): with h = recLo, g = recHi, F taps and the
 * offset 1 − F/2,
 *   a[o] = Σ_m h[m]·x[(2o + m + 1 − F/2) mod size],   d[o] = Σ_m g[m]·x[(2o + m + 1 − F/2) mod size],
 * an orthogonal size×size matrix, so the synthesis below (its transpose) is its inverse. The index
 * is reduced mod size as often as needed, so lines shorter than the filter wrap around repeatedly,
 * as PyWavelets does.
 */
export type LineKernel = (
  target: Float64Array,
  source: Float64Array,
  start: number,
  size: number,
  step: number,
  filters: WaveletFilters,
) => void;

/** The analysis of one line (see `LineKernel`). */
export const analyzeLine: LineKernel = (target, source, start, size, step, filters) => {
  const { f, h, g, half, offset, extLength, ext } = lineSetup(size, filters);
  // Periodic extension ext[j] = x[(j + offset) mod size], j < size + f − 2, so the taps run unwrapped.
  let i = ((offset % size) + size) % size;
  for (let j = 0; j < extLength; j++) {
    const src = 2 * (start + i * step);
    ext[2 * j] = source[src];
    ext[2 * j + 1] = source[src + 1];
    if (++i === size) i = 0;
  }
  for (let o = 0; o < half; o++) {
    let aRe = 0;
    let aIm = 0;
    let dRe = 0;
    let dIm = 0;
    const base = 4 * o;
    for (let m = 0; m < f; m++) {
      const re = ext[base + 2 * m];
      const im = ext[base + 2 * m + 1];
      aRe += h[m] * re;
      aIm += h[m] * im;
      dRe += g[m] * re;
      dIm += g[m] * im;
    }
    const lo = 2 * (start + o * step);
    const hi = 2 * (start + (half + o) * step);
    target[lo] = aRe;
    target[lo + 1] = aIm;
    target[hi] = dRe;
    target[hi + 1] = dIm;
  }
};

/**
 * The inverse (= adjoint) of `analyzeLine`: reads a at positions 0 … size/2 − 1 and d at
 * size/2 … size − 1 of the line in `source` and writes x to the line in `target` (may be `source`):
 *   x[(2o + m + 1 − F/2) mod size] += h[m]·a[o] + g[m]·d[o].
 */
export const synthesizeLine: LineKernel = (target, source, start, size, step, filters) => {
  const { f, h, g, half, offset, extLength, ext } = lineSetup(size, filters);
  ext.fill(0, 0, 2 * extLength);
  for (let o = 0; o < half; o++) {
    const lo = 2 * (start + o * step);
    const hi = 2 * (start + (half + o) * step);
    const aRe = source[lo];
    const aIm = source[lo + 1];
    const dRe = source[hi];
    const dIm = source[hi + 1];
    const base = 4 * o;
    for (let m = 0; m < f; m++) {
      ext[base + 2 * m] += h[m] * aRe + g[m] * dRe;
      ext[base + 2 * m + 1] += h[m] * aIm + g[m] * dIm;
    }
  }
  // Fold the extension back onto the period. Every position of the line gets at least one term
  // (j = i − offset < size + f − 2), so the first term assigns and the rest add.
  for (let i = 0; i < size; i++) {
    let re = 0;
    let im = 0;
    for (let j = (((i - offset) % size) + size) % size; j < extLength; j += size) {
      re += ext[2 * j];
      im += ext[2 * j + 1];
    }
    const dst = 2 * (start + i * step);
    target[dst] = re;
    target[dst + 1] = im;
  }
};

/**
 * What both kernels need for one line: F taps, h = recLo, g = recHi, the offset 1 − F/2 and the
 * scratch periodic extension of size + F − 2 complex numbers.
 */
function lineSetup(size: number, filters: WaveletFilters) {
  const f = filters.length;
  return {
    f,
    h: filters.recLo,
    g: filters.recHi,
    half: size >> 1,
    offset: 1 - (f >> 1),
    extLength: size + f - 2,
    ext: scratch(size + f),
  };
}

// One scratch line per length (complex, interleaved); the kernels are synchronous, so one suffices.
const scratches = new Map<number, Float64Array>();
function scratch(length: number): Float64Array {
  let s = scratches.get(length);
  if (!s) {
    s = new Float64Array(2 * length);
    scratches.set(length, s);
  }
  return s;
}
