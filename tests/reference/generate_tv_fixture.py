#!/usr/bin/python3
"""Reference fixture for the total-variation (ROF) step of the cs-tv reconstruction.

Run with Debian's interpreter and packages (python3-numpy, python3-skimage):

    /usr/bin/python3 tests/reference/generate_tv_fixture.py

Writes tests/reference/fixtures/tv-rof.json: small real images (piecewise constant plus seeded
Gaussian noise) and their ROF denoising by skimage.restoration.denoise_tv_chambolle, which runs
Chambolle's 2004 dual projection with tau = 1/4 and forward differences whose last difference is
zero (Neumann boundary), i.e. it minimises

    1/2 ||u - f||^2 + weight * TV_iso(u)

(the fixed point of Chambolle 2004 with lambda = weight). With a full mask the cs-tv objective
1/2 ||F u - F f||^2 + lambda_abs TV(u) is the same problem (F unitary), so the mapping is
lambda_abs = weight, i.e. lambda_rel = weight / max|f|.

eps = 0 disables skimage's energy stopping rule, so every case runs exactly max_num_iter
iterations; the script also records the largest difference between the output after
max_num_iter and after max_num_iter / 2 iterations as the fixture's own convergence error.
Inputs are integers times 2^-10 so the TypeScript test rebuilds bit-identical float64 inputs.
"""

import json
import os

import numpy as np
import skimage
from skimage.restoration import denoise_tv_chambolle

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, 'fixtures')
SCALE = 2.0**-10
ITERATIONS = 40000


def tv_iso(u):
    gx = np.zeros_like(u)
    gy = np.zeros_like(u)
    gx[:, :-1] = u[:, 1:] - u[:, :-1]
    gy[:-1, :] = u[1:, :] - u[:-1, :]
    return float(np.sqrt(gx**2 + gy**2).sum())


def piecewise_image(ny, nx, rng):
    yy, xx = np.mgrid[0:ny, 0:nx]
    f = np.zeros((ny, nx))
    f[ny // 5 : ny // 2, nx // 6 : (3 * nx) // 5] = 1.0
    f[((yy - 0.65 * ny) ** 2 + (xx - 0.6 * nx) ** 2) < (0.22 * min(nx, ny)) ** 2] += 0.6
    f += 0.15 * rng.standard_normal((ny, nx))
    return np.round(f / SCALE).astype(np.int64)


def case(name, ny, nx, weight, seed):
    rng = np.random.default_rng(seed)
    ints = piecewise_image(ny, nx, rng)
    f = ints * SCALE
    u = denoise_tv_chambolle(f, weight=weight, eps=0.0, max_num_iter=ITERATIONS)
    u_half = denoise_tv_chambolle(f, weight=weight, eps=0.0, max_num_iter=ITERATIONS // 2)
    objective = 0.5 * float(((u - f) ** 2).sum()) + weight * tv_iso(u)
    return {
        'name': name,
        'nx': nx,
        'ny': ny,
        'weight': weight,
        'inputScale': SCALE,
        'input': ints.ravel().tolist(),
        'output': [float(v) for v in u.ravel()],
        'objective': objective,
        'selfConvergence': float(np.abs(u - u_half).max()),
    }


def main():
    cases = [
        case('square 32x32, weight 0.1', 32, 32, 0.1, 7),
        case('rectangular 24x40, weight 0.25', 24, 40, 0.25, 8),
    ]
    out = {
        'source': 'skimage.restoration.denoise_tv_chambolle (Chambolle 2004), eps = 0, fixed iterations',
        'generator': 'tests/reference/generate_tv_fixture.py',
        'versions': {'numpy': np.__version__, 'skimage': skimage.__version__},
        'iterations': ITERATIONS,
        'layout': 'row-major ny x nx, axis 0 = rows',
        'cases': cases,
    }
    os.makedirs(OUT, exist_ok=True)
    with open(os.path.join(OUT, 'tv-rof.json'), 'w') as fh:
        json.dump(out, fh, indent=None, separators=(',', ':'))
        fh.write('\n')
    for c in cases:
        print(c['name'], 'objective', c['objective'], 'self-convergence', c['selfConvergence'])


if __name__ == '__main__':
    main()
