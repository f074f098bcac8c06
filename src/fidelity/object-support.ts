import type { ComplexImage } from '../core/complex-image.ts';

/** Fraction of the peak magnitude that bounds the object (DEVELOPERS.md "Feature fidelity"). */
export const OBJECT_FRACTION = 0.1;

/**
 * The object: pixels where the fully sampled noiseless reference magnitude is ≥ 0.1 × its maximum.
 * (The acquisition's SNR mask in src/acquisition/noise.ts uses a strict `>`; the two differ only on
 * pixels exactly at the cut.) Returns the mask and the mean magnitude over it, which is the unit
 * of lesion contrast.
 */
export function objectSupport(reference: ComplexImage): { mask: Uint8Array; meanIntensity: number } {
  const n = reference.nx * reference.ny;
  const d = reference.data;
  const magnitudes = new Float64Array(n);
  let peak = 0;
  for (let i = 0; i < n; i++) {
    magnitudes[i] = Math.hypot(d[2 * i], d[2 * i + 1]);
    if (magnitudes[i] > peak) peak = magnitudes[i];
  }
  const mask = new Uint8Array(n);
  const cut = OBJECT_FRACTION * peak;
  let sum = 0;
  let count = 0;
  for (let i = 0; i < n; i++) {
    if (peak > 0 && magnitudes[i] >= cut) {
      mask[i] = 1;
      sum += magnitudes[i];
      count++;
    }
  }
  return { mask, meanIntensity: count > 0 ? sum / count : 0 };
}
