#!/usr/bin/python3
"""Reference fixture for the block-Hankel lifting (Gram matrix and projection back).

Run with Debian's interpreter and numpy (python3-numpy):

    /usr/bin/python3 tests/reference/generate_hankel_fixture.py

Writes tests/reference/fixtures/block-hankel.json. For each case, seeded complex ny x nx arrays
z1, z2 (integers times 2^-4, so the TypeScript test rebuilds bit-identical float64 inputs) are lifted
into the explicit block-Hankel matrix of wy x wx windows (Haldar 2014, LORAKS; Shin et al. 2014,
SAKE): one row per window position p fully inside the grid, row-major over (py, px), and column
a = ay*wx + ax holding z[py + ay, px + ax]. Then, with numpy's dense linear algebra:

    gram_one = H(z1)^H H(z1)
    gram_two = H(z1)^H H(z1) + H(z2)^H H(z2)
    U_r      = the r leading eigenvectors of gram_two (numpy.linalg.eigh, descending)
    Pi       = U_r U_r^H
    proj_k   = H^dagger(H(z_k) Pi): each entry of H(z_k) Pi added back to the sample it came from,
               divided by the number of windows that contain that sample (anti-diagonal averaging).

The eigenvectors are stored as well (columns, any phase): the projector they make does not depend
on the phase, and the test hands them to the code under test.
"""

import numpy as np

from fixture_io import interleave, write

SCALE = 2.0**-4

# (ny, nx, wy, wx, rank): odd and even sizes; a 7x7 window as the single-coil default; a window
# with no interior sample (every sample within w - 1 of an edge) and wrap bands that overlap.
CASES = [
    (24, 20, 7, 7, 24),
    (11, 13, 3, 4, 5),
    (9, 12, 6, 8, 20),
]


def hankel(z, wy, wx):
    ny, nx = z.shape
    rows = []
    for py in range(ny - wy + 1):
        for px in range(nx - wx + 1):
            rows.append(z[py:py + wy, px:px + wx].reshape(-1))
    return np.array(rows)


def adjoint_average(m, ny, nx, wy, wx):
    total = np.zeros((ny, nx), dtype=complex)
    count = np.zeros((ny, nx))
    row = 0
    for py in range(ny - wy + 1):
        for px in range(nx - wx + 1):
            total[py:py + wy, px:px + wx] += m[row].reshape(wy, wx)
            count[py:py + wy, px:px + wx] += 1
            row += 1
    return total / count


def case(rng, ny, nx, wy, wx, rank):
    ints = [rng.integers(-64, 65, size=(ny, nx, 2)) for _ in range(2)]
    z1, z2 = [(q[..., 0] + 1j * q[..., 1]) * SCALE for q in ints]
    h1 = hankel(z1, wy, wx)
    h2 = hankel(z2, wy, wx)
    gram_one = h1.conj().T @ h1
    gram_two = gram_one + h2.conj().T @ h2
    values, vectors = np.linalg.eigh(gram_two)
    order = np.argsort(values)[::-1]
    u = vectors[:, order[:rank]]
    projector = u @ u.conj().T
    proj1 = adjoint_average(h1 @ projector, ny, nx, wy, wx)
    proj2 = adjoint_average(h2 @ projector, ny, nx, wy, wx)
    return {
        'ny': ny,
        'nx': nx,
        'wy': wy,
        'wx': wx,
        'rank': rank,
        'z1': [int(v) for v in ints[0].reshape(-1)],
        'z2': [int(v) for v in ints[1].reshape(-1)],
        'gramOne': interleave(gram_one).tolist(),
        'gramTwo': interleave(gram_two).tolist(),
        # vectors[a][k] for k < rank, row-major (a = window offset), interleaved re/im.
        'vectors': interleave(u).tolist(),
        'projection1': interleave(proj1).tolist(),
        'projection2': interleave(proj2).tolist(),
    }


def main():
    rng = np.random.default_rng(20140)
    payload = {
        'generator': 'tests/reference/generate_hankel_fixture.py',
        'versions': {'numpy': np.__version__},
        'inputScale': SCALE,
        'convention': 'H rows = windows fully inside (row-major), column a = ay*wx + ax; gram = H^H H; '
        'projection = anti-diagonal average of H Pi, Pi = U_r U_r^H',
        'cases': [case(rng, *c) for c in CASES],
    }
    write('block-hankel.json', payload)


if __name__ == '__main__':
    main()
