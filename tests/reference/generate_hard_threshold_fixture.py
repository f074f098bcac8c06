#!/usr/bin/python3
"""Reference fixture for lowrank-hankel's spectrum rank rule (scripts/tuning/rank-spectrum.ts).

Run with Debian's interpreter, numpy and scipy (python3-numpy, python3-scipy):

    /usr/bin/python3 tests/reference/generate_hard_threshold_fixture.py

Writes tests/reference/fixtures/hard-threshold.json:

omega: the optimal hard-threshold coefficient for unknown noise of Gavish & Donoho (2014),
    omega(beta) = lambda*(beta) / sqrt(mu_beta), computed exactly, not from their cubic fit:
    lambda*(beta) = sqrt(2(beta + 1) + 8 beta / (beta + 1 + sqrt(beta^2 + 14 beta + 1))), and mu_beta
    the median of the Marchenko-Pastur law of ratio beta (unit variance), density
    sqrt((b - x)(x - a)) / (2 pi beta x) on [a, b], a = (1 - sqrt(beta))^2, b = (1 + sqrt(beta))^2,
    found with scipy.integrate.quad and scipy.optimize.brentq.

spectrum: seeded complex ny x nx arrays z (integers times 2^-4: a few off-grid complex exponentials
    plus unit Gaussian noise) and masks (1 = acquired), the
    explicit matrix of the wy x wx windows fully inside the grid whose samples were all acquired
    (one row per window, row-major over (py, px), column a = ay*wx + ax holding z[py + ay, px + ax]);
    for 'gradient' the rows of kx*z and of ky*z stacked (kx = u - nx//2, ky = ny//2 - v), its
    singular values (numpy.linalg.svd), and the rank #{sigma > omega_exact(beta) * median sigma},
    beta = columns / rows.
"""

import numpy as np
from scipy.integrate import quad
from scipy.optimize import brentq

from fixture_io import interleave, write

SCALE = 2.0**-4


def marchenko_pastur_median(beta):
    a = (1 - np.sqrt(beta)) ** 2
    b = (1 + np.sqrt(beta)) ** 2

    def density(x):
        if x <= a or x >= b:
            return 0.0
        return np.sqrt((b - x) * (x - a)) / (2 * np.pi * beta * x)

    def cdf(m):
        return quad(density, a, m, limit=200, epsabs=1e-13, epsrel=1e-13)[0]

    return brentq(lambda m: cdf(m) - 0.5, a, b, xtol=1e-14)


def omega(beta):
    lam = np.sqrt(2 * (beta + 1) + 8 * beta / (beta + 1 + np.sqrt(beta**2 + 14 * beta + 1)))
    return lam / np.sqrt(marchenko_pastur_median(beta))


def complete_rows(z, mask, wy, wx):
    ny, nx = z.shape
    rows = []
    for py in range(ny - wy + 1):
        for px in range(nx - wx + 1):
            if mask[py : py + wy, px : px + wx].all():
                rows.append(z[py : py + wy, px : px + wx].ravel())
    return rows


def spectrum_case(seed, ny, nx, wy, wx, keep, weighting, sources):
    rng = np.random.default_rng(seed)
    # `sources` complex exponentials (off-grid frequencies) plus noise, quantised to integers / 16.
    y, x = np.mgrid[0:ny, 0:nx]
    z = sum(
        rng.uniform(20, 40) * np.exp(1j * (rng.uniform(-np.pi, np.pi) * y + rng.uniform(-np.pi, np.pi) * x))
        for _ in range(sources)
    )
    z = z + rng.normal(0, 1, (ny, nx)) + 1j * rng.normal(0, 1, (ny, nx))
    z = (np.round(z.real / SCALE) + 1j * np.round(z.imag / SCALE)) * SCALE
    mask = (rng.random((ny, nx)) < keep).astype(np.uint8)
    mask[ny // 2 - 3 : ny // 2 + 3, :] = 1  # a block of complete windows, as a calibration band
    if weighting == 'gradient':
        kx = np.arange(nx)[None, :] - nx // 2
        ky = ny // 2 - np.arange(ny)[:, None]
        rows = complete_rows(kx * z, mask, wy, wx) + complete_rows(ky * z, mask, wy, wx)
    else:
        rows = complete_rows(z, mask, wy, wx)
    h = np.array(rows)
    s = np.linalg.svd(h, compute_uv=False)
    beta = h.shape[1] / h.shape[0]
    tau = omega(beta) * np.median(s)
    return {
        'nx': nx,
        'ny': ny,
        'kernel': [wy, wx],
        'weighting': weighting,
        'z': interleave(z).tolist(),
        'mask': mask.ravel().tolist(),
        'sources': sources,
        'rows': h.shape[0],
        'singularValues': s.tolist(),
        'omega': omega(beta),
        'rank': int((s > tau).sum()),
    }


betas = [0.01, 0.05, 0.1, 0.25, 0.5, 0.75, 1.0]
write(
    'hard-threshold.json',
    {
        'omega': [{'beta': b, 'omega': omega(b)} for b in betas],
        'spectrum': [
            spectrum_case(3, 20, 18, 4, 3, 0.6, 'gradient', 2),
            spectrum_case(5, 16, 24, 3, 5, 0.5, 'none', 3),
        ],
        'versions': {'numpy': np.__version__, 'scipy': __import__('scipy').__version__},
    },
)
