/**
 * The Gram matrix HᴴH of a matrix given by its rows (interleaved complex, `size` columns each),
 * summed row by row as the definition reads: (HᴴH)_ab = Σ_rows conj(h_a)·h_b, size×size interleaved.
 */
export function explicitGram(rows: readonly Float64Array[], size: number): Float64Array {
  const gram = new Float64Array(2 * size * size);
  for (let a = 0; a < size; a++) {
    for (let b = 0; b < size; b++) {
      let re = 0;
      let im = 0;
      for (const row of rows) {
        re += row[2 * a] * row[2 * b] + row[2 * a + 1] * row[2 * b + 1];
        im += row[2 * a] * row[2 * b + 1] - row[2 * a + 1] * row[2 * b];
      }
      gram[2 * (a * size + b)] = re;
      gram[2 * (a * size + b) + 1] = im;
    }
  }
  return gram;
}
