"""Helpers the fixture scripts share: interleaved complex arrays and writing a fixture file."""

import json
import os

import numpy as np

OUT = os.path.join(os.path.dirname(os.path.abspath(__file__)), 'fixtures')


def interleave(z):
    """Complex array -> float64 array [re0, im0, re1, im1, ...] (row-major)."""
    z = np.asarray(z, dtype=complex)
    out = np.empty(2 * z.size)
    out[0::2] = z.real.ravel()
    out[1::2] = z.imag.ravel()
    return out


def write(name, payload):
    """fixtures/<name> as compact JSON (shortest round-trip float64 literals) and a final newline."""
    os.makedirs(OUT, exist_ok=True)
    path = os.path.join(OUT, name)
    with open(path, 'w') as f:
        json.dump(payload, f, separators=(',', ':'))
        f.write('\n')
    print(f'{path}: {os.path.getsize(path)} bytes')
