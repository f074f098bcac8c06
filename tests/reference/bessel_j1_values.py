#!/usr/bin/python3
"""Check values for tests/phantoms/bessel-j1.test.ts: J1 at a few arguments and the first five
zeros of J1, from mpmath at 30 significant digits (Debian python3-mpmath), rounded to float64.

Run: /usr/bin/python3 tests/reference/bessel_j1_values.py  (prints the literals the test holds)
"""
import mpmath

mpmath.mp.dps = 30

print("values:")
for x in (1, 2, 5, 10, 20, 100):
    print(f"  [{x}, {float(mpmath.besselj(1, x))!r}],")
print("zeros:")
for k in range(1, 6):
    print(f"  {float(mpmath.besseljzero(1, k))!r},")
