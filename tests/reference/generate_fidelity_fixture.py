#!/usr/bin/python3
"""Reference fixture for contrast recovery (src/fidelity) of zero-filled reconstructions.

Run with Debian's interpreter and packages (python3-numpy, python3-scipy):

    /usr/bin/python3 tests/reference/generate_fidelity_fixture.py

Writes tests/reference/fixtures/fidelity.json. Everything is recomputed here from the definitions,
independently of the TypeScript code:

- grid (DEVELOPERS.md "Numerical conventions"): pixel column j at x = (j - n//2) * 2/n, row i at
  y = -(i - n//2) * 2/n; k-space column u at kx = (u - n//2)/2, row v at ky = -(v - n//2)/2
  (cycles per unit); grid k-space = continuous transform * sqrt(nx*ny)/4;
- a disc of diameter d pixels = a circle of radius d/n units: F(k) = A * r^2 * 2*pi*J1(2*pi*r*|k|)/(2*pi*r*|k|)
  (scipy.special.j1), i.e. A * r * J1(2*pi*r*q)/q, pi*r^2*A at q = 0;
- a Gaussian of FWHM d pixels: s = d/(2*sqrt(2 ln 2)) pixels = 2s/n units,
  F(k) = A * 2*pi*s^2 * exp(-2*pi^2*s^2*|k|^2);
- both times the shift phase exp(-i*2*pi*(kx*x0 + ky*y0));
- ifft2c = fftshift(ifft2(ifftshift(.), norm='ortho')), the template t = ifft2c(K), the
  zero-filled response r = ifft2c(M * K) (noiseless: the response of a linear method does not
  depend on the object), contrast recovery = Re<r, t> / <t, t> over the pixel centres within d/2
  of the lesion centre.

The mask: whole phase-encode rows, the 8 central rows plus 13 drawn without replacement from the
others by numpy.random.default_rng(7) (R = 64/21 ~ 3).
"""

import json
import os

import numpy as np
import scipy
from scipy.special import j1

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, 'fixtures')
N = 64

LESIONS = [
    {'row': 20, 'col': 40, 'diameter': 5, 'amplitude': 0.05, 'shape': 'disc'},
    {'row': 40, 'col': 22, 'diameter': 4, 'amplitude': -0.08, 'shape': 'gaussian'},
    {'row': 44, 'col': 45, 'diameter': 3, 'amplitude': 0.1, 'shape': 'disc'},
    {'row': 14, 'col': 16, 'diameter': 2.5, 'amplitude': 0.2, 'shape': 'gaussian'},
]


def grid_kspace(lesion):
    u = np.arange(N)
    kx = (u - N // 2) / 2.0
    ky = -(u - N // 2) / 2.0
    KX, KY = np.meshgrid(kx, ky)  # KX[v, u] = kx[u], KY[v, u] = ky[v]
    q = np.hypot(KX, KY)
    x0 = (lesion['col'] - N // 2) * 2.0 / N
    y0 = -(lesion['row'] - N // 2) * 2.0 / N
    a = lesion['amplitude']
    if lesion['shape'] == 'disc':
        r = lesion['diameter'] / N
        with np.errstate(invalid='ignore', divide='ignore'):
            mag = np.where(q > 0, a * r * j1(2 * np.pi * r * q) / np.where(q > 0, q, 1), a * np.pi * r * r)
    else:
        s = 2 * (lesion['diameter'] / (2 * np.sqrt(2 * np.log(2)))) / N
        mag = a * 2 * np.pi * s * s * np.exp(-2 * np.pi**2 * s * s * q * q)
    phase = np.exp(-2j * np.pi * (KX * x0 + KY * y0))
    return mag * phase * np.sqrt(N * N) / 4


def ifft2c(k):
    return np.fft.fftshift(np.fft.ifft2(np.fft.ifftshift(k), norm='ortho'))


def disc_pixels(lesion):
    i, j = np.mgrid[0:N, 0:N]
    return (i - lesion['row']) ** 2 + (j - lesion['col']) ** 2 <= (lesion['diameter'] / 2) ** 2


def main():
    rng = np.random.default_rng(7)
    centre = list(range(N // 2 - 4, N // 2 + 4))
    others = [v for v in range(N) if v not in centre]
    rows = sorted(centre + [int(v) for v in rng.choice(others, size=13, replace=False)])
    mask = np.zeros((N, N))
    mask[rows, :] = 1
    out = []
    for lesion in LESIONS:
        k = grid_kspace(lesion)
        t = ifft2c(k)
        r = ifft2c(mask * k)
        d = disc_pixels(lesion)
        cr = float(np.sum((r[d] * np.conj(t[d])).real) / np.sum(np.abs(t[d]) ** 2))
        out.append({**lesion, 'discPixels': int(d.sum()), 'templateCentre': float(t[lesion['row'], lesion['col']].real),
                    'contrastRecovery': cr})
    doc = {
        'generator': 'tests/reference/generate_fidelity_fixture.py',
        'numpy': np.__version__,
        'scipy': scipy.__version__,
        'n': N,
        'rows': rows,
        'lesions': out,
    }
    os.makedirs(OUT, exist_ok=True)
    with open(os.path.join(OUT, 'fidelity.json'), 'w') as f:
        json.dump(doc, f, indent=1)
        f.write('\n')


if __name__ == '__main__':
    main()
