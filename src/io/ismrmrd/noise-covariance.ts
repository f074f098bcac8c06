/**
 * Sample covariance of receiver noise across coils from noise-scan records: with n_s the vector of
 * the coils' samples at time s (N samples in all), C = Σ_s (n_s − n̄)(n_s − n̄)ᴴ / (N − 1), the
 * estimator numpy.cov computes for complex rows. C estimates E[n·nᴴ] (= 2σ²Ψ in the project's
 * noise model, DEVELOPERS.md "Encoding operator and coil arrays"). Returned interleaved complex,
 * row-major coils × coils; `records` hold coils × samples complex float32, channel-major. Fewer
 * than two samples give null.
 */
export function noiseCovariance(
  records: Float32Array[],
  coils: number,
): { samples: number; covariance: Float64Array } | null {
  let samples = 0;
  const mean = new Float64Array(2 * coils);
  for (const record of records) {
    const n = record.length / (2 * coils);
    samples += n;
    for (let c = 0; c < coils; c++) {
      for (let s = 0; s < n; s++) {
        mean[2 * c] += record[2 * (c * n + s)];
        mean[2 * c + 1] += record[2 * (c * n + s) + 1];
      }
    }
  }
  const covariance = new Float64Array(2 * coils * coils);
  if (samples < 2) return null;
  for (let k = 0; k < mean.length; k++) mean[k] /= samples;
  for (const record of records) {
    const n = record.length / (2 * coils);
    for (let i = 0; i < coils; i++) {
      for (let j = 0; j < coils; j++) {
        let re = 0;
        let im = 0;
        for (let s = 0; s < n; s++) {
          const ar = record[2 * (i * n + s)] - mean[2 * i];
          const ai = record[2 * (i * n + s) + 1] - mean[2 * i + 1];
          const br = record[2 * (j * n + s)] - mean[2 * j];
          const bi = record[2 * (j * n + s) + 1] - mean[2 * j + 1];
          re += ar * br + ai * bi; // a · conj(b)
          im += ai * br - ar * bi;
        }
        covariance[2 * (i * coils + j)] += re;
        covariance[2 * (i * coils + j) + 1] += im;
      }
    }
  }
  for (let k = 0; k < covariance.length; k++) covariance[k] /= samples - 1;
  return { samples, covariance };
}
