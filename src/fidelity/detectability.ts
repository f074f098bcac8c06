/**
 * Rose criterion threshold: a feature is reliably seen when its contrast-to-noise ratio reaches
 * k; k = 5 is the usual citation of Rose 1948 (from memory; k ≈ 3–5 is quoted).
 */
export const ROSE_K = 5;

/**
 * CNR of a lesion (Rose 1948): the lesion's integrated signal over its disc divided by the standard
 * deviation of the noise integrated over the same disc,
 *   CNR = sign(amplitude)·Σ_disc Re r / √Var(Σ_disc Re n).
 * For white noise of σ per pixel and a flat disc of contrast c on n pixels this is Rose's c·√n/σ;
 * for correlated noise the variance of the sum counts the correlation cells by itself. A response
 * of the wrong sign gives a negative CNR. σ = 0 (noiseless) gives ±∞.
 */
export function lesionCnr(discSignal: number, discNoiseVariance: number, amplitude: number): number {
  const signed = Math.sign(amplitude) * discSignal;
  if (discNoiseVariance <= 0) return signed === 0 ? 0 : signed * Number.POSITIVE_INFINITY;
  return signed / Math.sqrt(discNoiseVariance);
}

/** Rose's criterion: resolved when CNR ≥ k (k = 5 unless given). */
export function roseResolved(cnr: number, k = ROSE_K): boolean {
  return cnr >= k;
}

/**
 * Detectability index of the non-prewhitening matched filter (template = the signal s itself):
 *   d'² = (sᵀs)² / (sᵀ K s)
 * (Barrett & Myers 2004, Foundations of Image Science, ch. 13–14, from memory), with sᵀs the
 * signal energy and sᵀKs the variance of the filter output on noise alone (replicas or the known σ,
 * observer-noise.ts). For white noise K = σ²I, so d' = ‖s‖/σ.
 */
export function npwDetectability(signalEnergy: number, outputVariance: number): number {
  if (outputVariance <= 0) return signalEnergy > 0 ? Number.POSITIVE_INFINITY : 0;
  return signalEnergy / Math.sqrt(outputVariance);
}
