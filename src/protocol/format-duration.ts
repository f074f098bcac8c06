/**
 * Scan time as the operator reads it: `m:ss`, or `h:mm:ss` from one hour on.
 * Rounding rule (pinned by tests): seconds are rounded half up to the nearest tenth; the tenth is
 * shown only when it is not zero. 128 s → "2:08", 163.84 s → "2:43.8", 35.5 s → "0:35.5",
 * 3725 s → "1:02:05".
 */
export function formatDuration(seconds: number): string {
  if (!Number.isFinite(seconds) || seconds < 0) {
    throw new RangeError(`seconds must be a finite number ≥ 0, got ${seconds}`);
  }
  // The tiny offset keeps decimal halves (e.g. 0.15 stored as 0.1499…) rounding up as written.
  const tenths = Math.floor(seconds * 10 + 0.5 + 1e-9);
  const wholeSeconds = Math.floor(tenths / 10);
  const tenth = tenths % 10;
  const hours = Math.floor(wholeSeconds / 3600);
  const minutes = Math.floor((wholeSeconds % 3600) / 60);
  const secs = wholeSeconds % 60;
  const secText = `${String(secs).padStart(2, '0')}${tenth === 0 ? '' : `.${tenth}`}`;
  return hours > 0 ? `${hours}:${String(minutes).padStart(2, '0')}:${secText}` : `${minutes}:${secText}`;
}
