/**
 * Complex soft-thresholding, the prox of t·Σ|c_k| (complex moduli): c ← c·max(0, 1 − t/|c|),
 * in place on an interleaved complex array over the complex indices [from, to). Returns Σ|c_k|
 * after shrinking, i.e. the ℓ1 norm the objective needs, at no extra pass (Donoho 1995;
 * Lustig, Donoho & Pauly 2007 use the same rule for complex MR images).
 */
export function softThresholdComplex(
  data: Float64Array,
  threshold: number,
  from = 0,
  to = data.length >> 1,
): number {
  let l1 = 0;
  for (let k = from; k < to; k++) {
    const re = data[2 * k];
    const im = data[2 * k + 1];
    const magnitude = Math.sqrt(re * re + im * im);
    if (magnitude <= threshold) {
      data[2 * k] = 0;
      data[2 * k + 1] = 0;
    } else {
      const scale = 1 - threshold / magnitude;
      data[2 * k] = re * scale;
      data[2 * k + 1] = im * scale;
      l1 += magnitude - threshold;
    }
  }
  return l1;
}

/**
 * Soft-threshold the detail bands of a Mallat-layout coefficient array (see dwt2.ts) and leave the
 * approximation block (top-left (ny/2^L)×(nx/2^L)) alone — common practice in wavelet-regularised
 * MR reconstruction, since the coarse approximation holds the image's mean contrast and is not
 * sparse. Returns Σ|c| over the detail bands after shrinking.
 */
export function softThresholdDetails(
  data: Float64Array,
  nx: number,
  ny: number,
  levels: number,
  threshold: number,
): number {
  const h0 = ny >> levels;
  const w0 = nx >> levels;
  let l1 = 0;
  for (let row = 0; row < h0; row++)
    l1 += softThresholdComplex(data, threshold, row * nx + w0, (row + 1) * nx);
  l1 += softThresholdComplex(data, threshold, h0 * nx, ny * nx);
  return l1;
}

/** Σ|c| over the detail bands of a Mallat-layout coefficient array (the approximation left out). */
export function detailL1(data: Float64Array, nx: number, ny: number, levels: number): number {
  const h0 = ny >> levels;
  const w0 = nx >> levels;
  let l1 = 0;
  for (let row = 0; row < ny; row++) {
    for (let col = row < h0 ? w0 : 0; col < nx; col++) {
      const k = 2 * (row * nx + col);
      l1 += Math.hypot(data[k], data[k + 1]);
    }
  }
  return l1;
}
