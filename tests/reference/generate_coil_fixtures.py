#!/usr/bin/python3
"""Reference values for the coil arrays, the SENSE g-factor and the trigonometric coil fit.

Run with Debian's interpreter and packages (python3-numpy, python3-scipy):

    /usr/bin/python3 tests/reference/generate_coil_fixtures.py

Writes tests/reference/fixtures/coils.json:
- sense_two_coils: the worked two-coil example (rows = coils, columns = the two folded pixels, Psi = I)
  through numpy.linalg.inv, g = sqrt(diag(inv(A)) * diag(A)), A = S^H Psi^-1 S
  (Pruessmann, Weiger, Scheidegger & Boesiger 1999);
- gaussian_array: 4 Gaussian-profile coils on a 32x32 grid, normalised to a unit root-sum-of-squares,
  and their analytic SENSE g-factor maps at R = 2 for Psi = I and for a ring covariance
  (neighbour correlation 0.2), with mean / 95th percentile (numpy's default linear interpolation) / max
  over a disc; the maps are sampled at a few pixels so the TypeScript builder can be checked too;
- loop_field: the off-axis field of a circular current loop from the closed form with complete
  elliptic integrals (scipy.special.ellipk / ellipe; Smythe, "Static and Dynamic Electricity", 1950,
  section 7.10 - from memory), in units of mu0*I/(4*pi) to match the Biot-Savart integral;
- trig_fit: least-squares coefficients of a trigonometric polynomial fitted to one of those maps with
  numpy.linalg.lstsq on the full 2D design matrix (the TypeScript fit separates the two axes).
The grid convention is the project's: column j at x = (j - nx//2)*2/nx, row i at y = -(i - ny//2)*2/ny.
"""

import json
import os

import numpy as np
import scipy
from scipy.special import ellipe, ellipk

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, 'fixtures', 'coils.json')


def g_factors(S, psi):
    """g for the columns of S (coils x folded pixels)."""
    psi_inv = np.linalg.inv(psi)
    A = S.conj().T @ psi_inv @ S
    return np.sqrt(np.real(np.diag(np.linalg.inv(A))) * np.real(np.diag(A)))


def pixel_grid(nx, ny):
    x = (np.arange(nx) - nx // 2) * 2 / nx
    y = -(np.arange(ny) - ny // 2) * 2 / ny
    return np.meshgrid(x, y)  # X[i, j], Y[i, j]


def gaussian_maps(count, width, ring, start_deg, nx, ny):
    X, Y = pixel_grid(nx, ny)
    maps = np.zeros((count, ny, nx), dtype=complex)
    for c in range(count):
        phi = (start_deg + 360 * c / count) * np.pi / 180
        cx, cy = ring * np.cos(phi), ring * np.sin(phi)
        g = np.exp(-((X - cx) ** 2 + (Y - cy) ** 2) * (1 / (2 * width * width)))
        maps[c] = g * (np.cos(phi) + 1j * np.sin(phi))
    rss = np.sqrt(np.sum(np.abs(maps) ** 2, axis=0))
    return maps / rss


def ring_covariance(count, rho):
    psi = np.eye(count)
    for c in range(count):
        psi[c, (c + 1) % count] = rho
        psi[c, (c - 1) % count] = rho
    return psi


def g_map(maps, R, psi):
    C, ny, nx = maps.shape
    step = ny // R
    g = np.zeros((ny, nx))
    for i0 in range(step):
        rows = [i0 + k * step for k in range(R)]
        for j in range(nx):
            g[rows, j] = g_factors(maps[:, rows, j], psi)
    return g


def summary(values):
    return {'mean': float(np.mean(values)), 'p95': float(np.percentile(values, 95)), 'max': float(np.max(values))}


def loop_field(a, x, y, z):
    """Field of a loop of radius a in the plane z = 0, centred at the origin, current counter-clockwise
    seen from +z; units mu0*I/(4*pi). Cylindrical closed form, then Cartesian."""
    rho = np.hypot(x, y)
    den = (a + rho) ** 2 + z**2
    m = 4 * a * rho / den
    K, E = ellipk(m), ellipe(m)
    d2 = (a - rho) ** 2 + z**2
    bz = 2 / np.sqrt(den) * (K + (a * a - rho * rho - z * z) / d2 * E)
    brho = 2 * z / (rho * np.sqrt(den)) * (-K + (a * a + rho * rho + z * z) / d2 * E)
    return brho * x / rho, brho * y / rho, bz


def trig_design(nx, ny, order, period):
    X, Y = pixel_grid(nx, ny)
    cols = []
    for q in range(-order, order + 1):
        for p in range(-order, order + 1):
            cols.append(np.exp(2j * np.pi * (p * X + q * Y) / period).ravel())
    return np.stack(cols, axis=1)


def pairs(z):
    z = np.asarray(z).ravel()
    return [[float(v.real), float(v.imag)] for v in z]


def main():
    out = {'numpy': np.__version__, 'scipy': scipy.__version__}

    S = np.array([[0.8, 0.1], [0.15, 0.85]])
    out['sense_two_coils'] = {
        'S': S.tolist(),
        'g': g_factors(S, np.eye(2)).tolist(),
        'g_rows_as_pixels': g_factors(S.T, np.eye(2)).tolist(),
    }

    nx = ny = 32
    count, width, ring, start = 4, 0.6, 1.2, 90.0
    maps = gaussian_maps(count, width, ring, start, nx, ny)
    X, Y = pixel_grid(nx, ny)
    disc = (X**2 + Y**2 <= 0.75**2).astype(int)
    rho = 0.2
    g_white = g_map(maps, 2, np.eye(count))
    g_ring = g_map(maps, 2, ring_covariance(count, rho))
    sample_pixels = list(range(0, nx * ny, 37))
    out['gaussian_array'] = {
        'nx': nx,
        'ny': ny,
        'count': count,
        'width': width,
        'ringRadius': ring,
        'startAngleDeg': start,
        'acceleration': 2,
        'correlation': rho,
        'disc': disc.ravel().tolist(),
        'samplePixels': sample_pixels,
        'mapSamples': [pairs(maps[c].ravel()[sample_pixels]) for c in range(count)],
        'gWhite': g_white.ravel().tolist(),
        'gRing': g_ring.ravel().tolist(),
        'summaryWhite': summary(g_white[disc == 1]),
        'summaryRing': summary(g_ring[disc == 1]),
    }

    a = 0.35
    pts = np.array(
        [
            [0.1, 0.0, 0.0],
            [0.2, 0.1, 0.3],
            [0.5, 0.0, 0.1],
            [0.0, 0.6, -0.2],
            [0.3, -0.4, 0.5],
            [1.2, 0.7, 0.0],
            [-0.8, 0.2, 0.9],
            [0.05, 0.02, 1.5],
        ]
    )
    bx, by, bz = loop_field(a, pts[:, 0], pts[:, 1], pts[:, 2])
    out['loop_field'] = {
        'radius': a,
        'points': pts.tolist(),
        'field': np.stack([bx, by, bz], axis=1).tolist(),
    }

    fits = []
    for order, factor in [(3, 2), (2, 1), (4, 3)]:
        target = maps[1].ravel()
        design = trig_design(nx, ny, order, 2 * factor)
        coef, *_ = np.linalg.lstsq(design, target, rcond=None)
        residual = np.linalg.norm(design @ coef - target) / np.linalg.norm(target)
        fits.append(
            {
                'coil': 1,
                'order': order,
                'periodFactor': factor,
                'coefficients': pairs(coef),
                'relativeResidual': float(residual),
            }
        )
    out['trig_fit'] = fits

    with open(OUT, 'w') as f:
        json.dump(out, f, indent=1)
        f.write('\n')
    print('wrote', OUT)


if __name__ == '__main__':
    main()
