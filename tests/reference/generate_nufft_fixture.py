#!/usr/bin/python3
"""Reference values for the NUFFT, density compensation and trajectory tests of k-space planner.

Run with Debian's interpreter and numpy (python3-numpy):

    /usr/bin/python3 tests/reference/generate_nufft_fixture.py

Writes tests/reference/fixtures/nufft.json:
- the modified Bessel function I0 (numpy.i0) at a few arguments;
- Kaiser-Bessel shape beta = pi*sqrt((W/alpha)^2 (alpha - 1/2)^2 - 0.8) (Beatty, Nishimura & Pauly 2005)
  for several (W, alpha);
- the kernel's Fourier transform c(x) = W sinh(sqrt(b^2 - pi^2 W^2 x^2)) / sqrt(...) (Jackson et al.
  1991 kernel, transform of the unnormalised I0 window), both by the closed form and by Gauss-Legendre
  quadrature of the window with numpy.i0, at W = 4, beta = 8.9962;
- the golden angle 180/phi (Winkelmann et al. 2007) and tiny golden angles 180/(phi + N - 1),
  N = 1..10 (Wundrak et al. 2016), in degrees;
- radial Nyquist spoke counts ceil(pi/2 N);
- a direct non-uniform DFT of a seeded random complex image at seeded random points, in the
  project's convention y_p = (1/sqrt(nx ny)) sum x[i, j] exp(-i 2 pi (kx n / nx - ky m / ny)),
  n = j - nx//2, m = i - ny//2, kx, ky in cycles per field of view (y up);
- the relative error of a one-dimensional Kaiser-Bessel type-2 NUFFT written here in numpy
  (N = 128, 400 uniform random k, oversampling 2) against the direct sum, for W = 2, 3, 4, 6.
Inputs are integers times powers of two (exact in float64); outputs are float64 literals.
"""

import json
import math
import os

import numpy as np

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, 'fixtures', 'nufft.json')

PHI = (1 + math.sqrt(5)) / 2


def beatty_beta(width, alpha):
    return math.pi * math.sqrt((width / alpha) ** 2 * (alpha - 0.5) ** 2 - 0.8)


def kb_transform_closed(x, width, beta):
    d = beta**2 - (math.pi * width * x) ** 2
    if d > 0:
        r = math.sqrt(d)
        return width * math.sinh(r) / r
    if d < 0:
        r = math.sqrt(-d)
        return width * math.sin(r) / r
    return float(width)


def kb_transform_quadrature(x, width, beta, nodes=400):
    t, w = np.polynomial.legendre.leggauss(nodes)
    u = t * width / 2
    window = np.i0(beta * np.sqrt(np.maximum(0.0, 1 - (2 * u / width) ** 2)))
    return float(np.sum(w * window * np.cos(2 * np.pi * u * x)) * width / 2)


def direct_ndft(image, kx, ky):
    ny, nx = image.shape
    n = np.arange(nx) - nx // 2
    m = np.arange(ny) - ny // 2
    ex = np.exp(-2j * np.pi * np.outer(kx, n) / nx)  # points x columns
    ey = np.exp(+2j * np.pi * np.outer(ky, m) / ny)  # points x rows (rows run against ky)
    return np.einsum('pi,ij,pj->p', ey, image, ex) / math.sqrt(nx * ny)


def nufft_1d_error(width, alpha=2, size=128, points=400, seed=5):
    rng = np.random.default_rng(seed)
    x = rng.standard_normal(size) + 1j * rng.standard_normal(size)
    k = rng.uniform(-0.5, 0.5, points)  # cycles per sample
    n = np.arange(size) - size // 2
    exact = np.exp(-2j * np.pi * np.outer(k, n)) @ x
    beta = beatty_beta(width, alpha)
    grid_size = int(alpha * size)
    deapod = np.array([kb_transform_closed(v / grid_size, width, beta) for v in n])
    padded = np.zeros(grid_size, complex)
    padded[n % grid_size] = x / deapod
    spectrum = np.fft.fft(padded)
    g = k * grid_size
    approx = np.zeros(points, complex)
    for p in range(points):
        first = math.ceil(g[p] - width / 2)
        for l in range(first, math.floor(g[p] + width / 2) + 1):
            u = g[p] - l
            s = 1 - (2 * u / width) ** 2
            approx[p] += spectrum[l % grid_size] * np.i0(beta * math.sqrt(max(s, 0.0)))
    return float(np.linalg.norm(approx - exact) / np.linalg.norm(exact))


def main():
    widths_alphas = [(2, 2), (3, 2), (4, 2), (6, 2), (4, 1.5), (6, 1.5), (4, 1.25), (6, 1.25), (8, 1.25)]
    beta_rows = [{'width': w, 'oversampling': a, 'beta': beatty_beta(w, a)} for (w, a) in widths_alphas]

    beta_ref = 8.9962
    xs = [0.0, 0.1, 0.25, 0.5, 0.8]
    transform = [
        {
            'x': x,
            'closedForm': kb_transform_closed(x, 4, beta_ref),
            'quadrature': kb_transform_quadrature(x, 4, beta_ref),
        }
        for x in xs
    ]

    tiny = [{'n': n, 'degrees': 180.0 / (PHI + n - 1)} for n in range(1, 11)]
    spokes = [{'side': n, 'spokes': math.ceil(math.pi / 2 * n)} for n in (64, 128, 256, 320)]

    rng = np.random.default_rng(20260)
    ny, nx = 18, 24
    image_scale = 2.0**-8
    k_scale = 2.0**-10
    re = rng.integers(-512, 512, size=(ny, nx))
    im = rng.integers(-512, 512, size=(ny, nx))
    image = (re + 1j * im) * image_scale
    points = 300
    kx_int = rng.integers(-(nx // 2 + 3) * 1024, (nx // 2 + 3) * 1024, size=points)
    ky_int = rng.integers(-(ny // 2 + 3) * 1024, (ny // 2 + 3) * 1024, size=points)
    kx = kx_int * k_scale
    ky = ky_int * k_scale
    y = direct_ndft(image, kx, ky)
    interleaved_image = np.empty(2 * nx * ny, dtype=np.int64)
    interleaved_image[0::2] = re.ravel()
    interleaved_image[1::2] = im.ravel()
    samples = np.empty(2 * points)
    samples[0::2] = y.real
    samples[1::2] = y.imag

    errors_1d = [{'width': w, 'oversampling': 2, 'relativeError': nufft_1d_error(w)} for w in (2, 3, 4, 6)]

    fixture = {
        'generator': 'tests/reference/generate_nufft_fixture.py',
        'versions': {'numpy': np.__version__},
        'besselI0': [{'x': x, 'value': float(np.i0(x))} for x in (0.0, 0.5, 1.0, 5.0, 8.9962, 13.8551, 20.0)],
        'beta': beta_rows,
        'kaiserBesselTransform': {'width': 4, 'beta': beta_ref, 'values': transform},
        'goldenAngles': tiny,
        'nyquistSpokes': spokes,
        'ndft': {
            'nx': nx,
            'ny': ny,
            'imageScale': image_scale,
            'kScale': k_scale,
            'image': interleaved_image.tolist(),
            'kx': kx_int.tolist(),
            'ky': ky_int.tolist(),
            'samples': samples.tolist(),
        },
        'nufft1dErrors': errors_1d,
    }
    with open(OUT, 'w') as f:
        json.dump(fixture, f, separators=(',', ':'))
        f.write('\n')


if __name__ == '__main__':
    main()
