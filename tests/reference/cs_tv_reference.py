#!/usr/bin/python3
"""cs-tv's two single-coil Cartesian solvers written independently in numpy (Debian python3-numpy).

Both minimise, over complex x (ny x nx),

    1/2 ||M F_c x - y||^2 + lam * TV_iso(x)

with F_c = fftshift . fft2(norm='ortho') . ifftshift, TV_iso from forward differences whose last
difference is zero (Neumann), lam absolute, and start from x0 = F_c^H(M y):

* plain: Chambolle & Pock 2011 (theta = 1), K = grad, tau = sigma = 0.99/sqrt(8), the data prox
  exact in k-space: prox(v) = F_c^H[(F_c v + tau M y) / (1 + tau M)], p0 = 0;
* preconditioned: the same iteration with the primal metric T^-1 = sigma grad_p^H grad_p + delta I
  (grad_p periodic, diagonal under F_c; Pock & Chambolle 2011) and relaxation rho, primal half first
  from p0 = proj(sigma grad x0) (p0 = 0 would make the first step return x0):
  X~ = (F_c div p + t X + M y)/(M + t), t = sigma(4sin^2(pi u/nx) + 4sin^2(pi v/ny)) + delta,
  p~ = proj(p + sigma grad(2x~ - x)), (x, p) <- rho (x~, p~) + (1 - rho)(x, p).

Two uses:

    /usr/bin/python3 tests/reference/cs_tv_reference.py fixture
        writes tests/reference/fixtures/cs-tv-iterations.json: a small seeded problem and both
        solvers' objective and image after a fixed number of iterations (tests/recon/cs-tv-numpy.test.ts);

    /usr/bin/python3 tests/reference/cs_tv_reference.py time KSPACE MASK NX NY LAMBDA ITERATIONS
        reads interleaved float64 k-space and uint8 mask files (the service's layout), runs the
        plain solver for ITERATIONS iterations and prints one JSON line with its wall and CPU
        seconds (the loop only) and final objective (tests/bench/cs-tv-speed.bench.ts).
"""

import json
import sys
import time

import numpy as np

from fixture_io import interleave, write

STEP = 0.99 / np.sqrt(8.0)


def fft2c(x):
    return np.fft.fftshift(np.fft.fft2(np.fft.ifftshift(x), norm='ortho'))


def ifft2c(k):
    return np.fft.fftshift(np.fft.ifft2(np.fft.ifftshift(k), norm='ortho'))


def gradient(x):
    gx = np.zeros_like(x)
    gy = np.zeros_like(x)
    gx[:, :-1] = x[:, 1:] - x[:, :-1]
    gy[:-1, :] = x[1:, :] - x[:-1, :]
    return gx, gy


def divergence(px, py):
    d = np.zeros_like(px)
    d[:, :-1] += px[:, :-1]
    d[:, 1:] -= px[:, :-1]
    d[:-1, :] += py[:-1, :]
    d[1:, :] -= py[:-1, :]
    return d


def project(a, c, lam):
    s = np.abs(a) ** 2 + np.abs(c) ** 2
    scale = np.where(s > lam * lam, lam / np.sqrt(np.maximum(s, 1e-300)), 1.0)
    return a * scale, c * scale


def objective(x, y, mask, lam):
    gx, gy = gradient(x)
    tv = np.sqrt(np.abs(gx) ** 2 + np.abs(gy) ** 2).sum()
    r = (fft2c(x) - y)[mask]
    return 0.5 * float(np.sum(np.abs(r) ** 2)) + lam * float(tv)


def plain(y, mask, lam, iterations):
    x = ifft2c(np.where(mask, y, 0))
    xbar = x.copy()
    px = np.zeros_like(x)
    py = np.zeros_like(x)
    for _ in range(iterations):
        gx, gy = gradient(xbar)
        px, py = project(px + STEP * gx, py + STEP * gy, lam)
        v = fft2c(x + STEP * divergence(px, py))
        v[mask] = (v[mask] + STEP * y[mask]) / (1 + STEP)
        x_new = ifft2c(v)
        xbar = 2 * x_new - x
        x = x_new
    return x


def preconditioned(y, mask, lam, iterations, sigma, delta, rho):
    ny, nx = y.shape
    ey = 4 * np.sin(np.pi * (np.arange(ny) - ny // 2) / ny) ** 2
    ex = 4 * np.sin(np.pi * (np.arange(nx) - nx // 2) / nx) ** 2
    t = sigma * (ey[:, None] + ex[None, :]) + delta
    X = np.where(mask, y, 0)
    x = ifft2c(X)
    gx, gy = gradient(x)
    px, py = project(sigma * gx, sigma * gy, lam)
    div = divergence(px, py)
    for _ in range(iterations):
        D = fft2c(div)
        Xt = np.where(mask, (D + t * X + y) / (1 + t), (D + t * X) / t)
        X = rho * Xt + (1 - rho) * X
        xt = ifft2c(Xt)
        gx, gy = gradient(2 * xt - x)
        qx, qy = project(px + sigma * gx, py + sigma * gy, lam)
        px = rho * qx + (1 - rho) * px
        py = rho * qy + (1 - rho) * py
        div = divergence(px, py)
        x = rho * xt + (1 - rho) * x
    return x


def fixture():
    ny, nx = 12, 16
    rng = np.random.default_rng(7)
    yy, xx = np.mgrid[0:ny, 0:nx]
    image = np.zeros((ny, nx), dtype=complex)
    image[3:9, 4:11] = 1.0
    image[((yy - 6.5) ** 2 + (xx - 11.0) ** 2) < 9.0] += 0.5j
    image += 0.05 * (rng.standard_normal((ny, nx)) + 1j * rng.standard_normal((ny, nx)))
    # k-space quantised to integers times 2^-20 so the test rebuilds it exactly.
    k = np.round(fft2c(image) * 2**20) / 2**20
    mask = rng.random((ny, nx)) < 0.45
    mask[ny // 2 - 1 : ny // 2 + 2, nx // 2 - 1 : nx // 2 + 2] = True
    y = np.where(mask, k, 0)
    lam = 0.02
    iterations = 60
    sigma, delta, rho = 0.5, 0.5e-3, 1.5
    x_plain = plain(y, mask, lam, iterations)
    x_pre = preconditioned(y, mask, lam, iterations, sigma, delta, rho)
    write(
        'cs-tv-iterations.json',
        {
            'generator': 'tests/reference/cs_tv_reference.py fixture',
            'numpy': np.__version__,
            'nx': nx,
            'ny': ny,
            'kspace': interleave(y).tolist(),
            'mask': mask.astype(int).ravel().tolist(),
            'lambda': lam,
            'iterations': iterations,
            'plain': {'objective': objective(x_plain, y, mask, lam), 'image': interleave(x_plain).tolist()},
            'preconditioned': {
                'sigma': sigma,
                'delta': delta,
                'relaxation': rho,
                'objective': objective(x_pre, y, mask, lam),
                'image': interleave(x_pre).tolist(),
            },
        },
    )


def timed(kspace_path, mask_path, nx, ny, lam, iterations):
    raw = np.fromfile(kspace_path, dtype='<f8')
    y = (raw[0::2] + 1j * raw[1::2]).reshape(ny, nx)
    mask = np.fromfile(mask_path, dtype=np.uint8).reshape(ny, nx).astype(bool)
    plain(y, mask, lam, 2)  # warm-up
    w0 = time.perf_counter()
    c0 = time.process_time()
    x = plain(y, mask, lam, iterations)
    cpu = time.process_time() - c0
    wall = time.perf_counter() - w0
    print(
        json.dumps(
            {
                'wallSeconds': wall,
                'cpuSeconds': cpu,
                'objective': objective(x, y, mask, lam),
                'iterations': iterations,
                'numpy': np.__version__,
            }
        )
    )


if __name__ == '__main__':
    if len(sys.argv) >= 2 and sys.argv[1] == 'fixture':
        fixture()
    elif len(sys.argv) == 8 and sys.argv[1] == 'time':
        timed(sys.argv[2], sys.argv[3], int(sys.argv[4]), int(sys.argv[5]), float(sys.argv[6]), int(sys.argv[7]))
    else:
        sys.exit(__doc__)
