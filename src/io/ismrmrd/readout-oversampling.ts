import { centeredLineTransform } from '../../core/centered-fft.ts';

/**
 * Removes readout oversampling from one k-space line: centred inverse DFT along the readout (the
 * line becomes the image profile over the oversampled field of view), keep the central `kept`
 * pixels (the reconstructed field of view, starting at ⌊n/2⌋ − ⌊kept/2⌋ so the centre pixel stays
 * the centre), centred forward DFT back. Both transforms are orthonormal, so the kept pixels of
 * the profile are unchanged: ifft2c of the cropped k-space is the crop of the oversampled image.
 * `line` (2·n numbers) is overwritten; the result goes to `target` (2·kept numbers).
 */
export function cropReadoutLine(line: Float64Array, target: Float64Array, kept: number): void {
  const n = line.length / 2;
  if (kept === n) {
    target.set(line);
    return;
  }
  centeredLineTransform(line, line, 0, n, 1, 1);
  const first = Math.floor(n / 2) - Math.floor(kept / 2);
  target.set(line.subarray(2 * first, 2 * (first + kept)));
  centeredLineTransform(target, target, 0, kept, 1, -1);
}
