// The ACS size the page proposes for a matrix and an acceleration. The service counts the ACS lines
// inside the round(ny / R) lines of the mask (a random-lines mask needs one more drawn at random),
// so an ACS that suits 128 rows is refused at 64 rows: the proposal follows the matrix instead.

/** Default ACS: ny/8 (16 of 128, the page's long-standing default), at most half the line budget. */
export function suggestedAcs(ny, acceleration) {
  if (!Number.isFinite(ny) || ny < 1) return null;
  const R = Number.isFinite(acceleration) && acceleration >= 1 ? acceleration : 1;
  return Math.max(0, Math.min(Math.round(ny / 8), largestSensibleAcs(ny, R)));
}

/** The most ACS lines the page keeps by itself: half of the round(ny / R) lines the mask may hold. */
export function largestSensibleAcs(ny, acceleration) {
  const R = Number.isFinite(acceleration) && acceleration >= 1 ? acceleration : 1;
  return Math.floor(Math.round(ny / R) / 2);
}
