import { describe, expect, it } from 'vitest';
import { boundEcho, boundFieldProblems } from '../../src/core/echo-bound.ts';

// Own rule (see src/core/echo-bound.ts): texts cut to a bound with an ellipsis, counted in code points
// so a UTF-16 surrogate pair (Unicode §3.8) is never split.

describe('boundEcho', () => {
  it('keeps short texts, cuts long ones to exactly the bound with an ellipsis', () => {
    expect(boundEcho('abc', 5)).toBe('abc');
    expect(boundEcho('abcde', 5)).toBe('abcde');
    expect(boundEcho('abcdef', 5)).toBe('abcd…');
  });

  it('never splits a surrogate pair', () => {
    const text = '😀'.repeat(10); // 20 UTF-16 units, 10 code points
    const cut = boundEcho(text, 4);
    expect(cut).toBe('😀😀😀…');
    expect(boundEcho('😀😀😀😀', 4)).toBe('😀😀😀😀');
  });

  it('bounds every text of field problems and their number', () => {
    const list = Array.from({ length: 60 }, (_, i) => ({ field: `f${i}`, message: 'm'.repeat(500) }));
    const out = boundFieldProblems(list);
    expect(out).toHaveLength(50);
    expect(out[0].message).toHaveLength(200);
    expect(out[49]).toEqual({ field: 'body', message: '11 more problems not listed' });
  });
});
