import { describe, expect, it } from 'vitest';
import { formatDuration } from '../../src/protocol/format-duration.ts';

// Rounding rule pinned here (docs/references.md §8 asks for it to be pinned; the rule is ours, common
// practice for operator displays): round half up to 0.1 s, show the tenth only when it is not zero.
describe('formatDuration (m:ss, tenths when non-zero)', () => {
  it.each([
    [128, '2:08'], // docs/references.md §8 [C]
    [256, '4:16'], // docs/references.md §8, Radiopaedia [P]
    [190, '3:10'], // docs/references.md §8 [C]
    [163.84, '2:43.8'], // docs/references.md §8 [C], rule example given there
    [81.92, '1:21.9'],
    [122.88, '2:02.9'],
    [35.5, '0:35.5'],
    [2.015, '0:02'],
    [0, '0:00'],
    [59.96, '1:00'], // rounding carries into the minutes
    [0.15, '0:00.2'], // half up, although 0.15 is stored as 0.1499…
    [3600, '1:00:00'],
    [3725.25, '1:02:05.3'],
  ])('%d s → %s', (seconds, text) => {
    expect(formatDuration(seconds)).toBe(text);
  });

  it('rejects negative and non-finite durations', () => {
    expect(() => formatDuration(-1)).toThrow(RangeError);
    expect(() => formatDuration(Number.NaN)).toThrow(RangeError);
  });
});
