#!/usr/bin/python3
"""Reference fixture for the orthogonal Daubechies wavelet transform (src/wavelets/).

Run with Debian's interpreter and packages (python3-numpy, python3-pywt):

    /usr/bin/python3 tests/reference/generate_wavelet_fixture.py

Writes tests/reference/fixtures/wavelet-pywt.json:
- `filters`: the four filters of db1 ... db8 as PyWavelets tabulates them (pywt.Wavelet(name).dec_lo,
  dec_hi, rec_lo, rec_hi);
- `cases`: small seeded images (integers times 2^-10, so the TypeScript test rebuilds bit-identical
  float64 inputs) and pywt.wavedec2(image, name, mode='periodization', level=L), laid out in the
  Mallat arrangement that src/wavelets/dwt2.ts uses: the approximation cA_L in the top-left
  (ny/2^L)x(nx/2^L) block; for each level j (size h = ny/2^j, w = nx/2^j) the band cH_j = 'da'
  (high-pass down the columns, i.e. along axis 0) at rows h..2h, columns 0..w; cV_j = 'ad' (high-pass
  along the rows, axis 1) at rows 0..h, columns w..2w; cD_j = 'dd' at rows h..2h, columns w..2w.
  Each case carries two images, used as the real and imaginary parts of one complex image.

'periodization' is pywt's orthogonal mode: the signal is taken as periodic and each level halves
the length exactly, so the transform is square and orthogonal.
"""

import json
import os

import numpy as np
import pywt

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, 'fixtures')
SCALE = 2.0**-10
NAMES = ['db1', 'db2', 'db3', 'db4', 'db5', 'db6', 'db7', 'db8']


def mallat_layout(coeffs, ny, nx):
    out = np.zeros((ny, nx))
    ca = coeffs[0]
    out[: ca.shape[0], : ca.shape[1]] = ca
    for c_h, c_v, c_d in coeffs[1:]:
        h, w = c_h.shape
        out[h : 2 * h, 0:w] = c_h
        out[0:h, w : 2 * w] = c_v
        out[h : 2 * h, w : 2 * w] = c_d
    return out


def quantised_image(ny, nx, rng):
    return np.round(rng.standard_normal((ny, nx)) / SCALE).astype(np.int64)


def case(name, ny, nx, level, seed):
    rng = np.random.default_rng(seed)
    parts = {}
    for part in ('real', 'imag'):
        ints = quantised_image(ny, nx, rng)
        x = ints * SCALE
        coeffs = pywt.wavedec2(x, name, mode='periodization', level=level)
        back = pywt.waverec2(coeffs, name, mode='periodization')
        assert np.abs(back - x).max() < 1e-12
        parts[part] = {
            'input': ints.ravel().tolist(),
            'coefficients': mallat_layout(coeffs, ny, nx).ravel().tolist(),
        }
    return {
        'wavelet': name,
        'mode': 'periodization',
        'ny': ny,
        'nx': nx,
        'level': level,
        'inputScale': SCALE,
        'real': parts['real'],
        'imag': parts['imag'],
    }


def main():
    filters = {}
    for name in NAMES:
        w = pywt.Wavelet(name)
        filters[name] = {
            'decLo': list(w.dec_lo),
            'decHi': list(w.dec_hi),
            'recLo': list(w.rec_lo),
            'recHi': list(w.rec_hi),
        }
    cases = [
        case('db1', 16, 16, 3, 1),
        case('db2', 16, 24, 3, 2),
        case('db2', 8, 8, 1, 3),
        case('db4', 32, 16, 2, 4),
        # The last level sees 4 samples per line, fewer than the 8 taps: the periodic wrap repeats.
        case('db4', 16, 16, 3, 5),
        case('db8', 32, 32, 2, 6),
        case('db8', 32, 64, 4, 7),
    ]
    result = {
        'generator': 'tests/reference/generate_wavelet_fixture.py',
        'versions': {'numpy': np.__version__, 'pywt': pywt.__version__},
        'filters': filters,
        'cases': cases,
    }
    os.makedirs(OUT, exist_ok=True)
    with open(os.path.join(OUT, 'wavelet-pywt.json'), 'w') as f:
        json.dump(result, f, separators=(',', ':'))
        f.write('\n')


if __name__ == '__main__':
    main()
