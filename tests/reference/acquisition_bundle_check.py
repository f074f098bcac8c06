"""Reads an exported acquisition bundle with Debian's python3-nibabel and python3-numpy and
reconstructs its zero-filled image independently of the service (docs/design.md §4.11).

Usage: /usr/bin/python3 tests/reference/acquisition_bundle_check.py DIR
DIR holds acquisition.nii, acquisition.json and images.nii of one Cartesian reconstruction whose
zero-filled image is the root-sum-of-squares of its coil images (one coil, or raw data).
Prints one JSON object: the NIfTI facts nibabel reports, the acquired count against the table, and
the largest difference between numpy's zero-filled root-sum-of-squares and the service's zero-filled
volume of images.nii, relative to that volume's maximum.
"""
import sys

import numpy as np

from bundle_io import print_facts, read_bundle, zero_filled_volume

folder = sys.argv[1]
header, kspace_file, kspace, rows = read_bundle(folder)  # kspace [u, v, 0, coil]
nx, ny = header["matrix"]["nx"], header["matrix"]["ny"]

# Coil images by the centred orthonormal DFT the header states; K[v, u] is the plane transposed.
rss = np.zeros((ny, nx))
for c in range(kspace.shape[3]):
    plane = kspace[:, :, 0, c].T.astype(np.complex128)
    image = np.fft.fftshift(np.fft.ifft2(np.fft.ifftshift(plane), norm="ortho"))
    rss += np.abs(image) ** 2
rss = np.sqrt(rss)

zero_filled = zero_filled_volume(folder)[0]

# The table's acquired points against the non-zero grid points of the first coil.
columns = header["table"]["columns"]
ky = rows[:, columns.index("ky")]
kx = rows[:, columns.index("kx")]
table_mask = np.zeros((ny, nx), dtype=bool)
table_mask[ny // 2 - ky, kx + nx // 2] = True
nonzero = np.any(kspace[:, :, 0, :] != 0, axis=2).T

print_facts(kspace_file, kspace, rows, rss, zero_filled, nonzeroOutsideTable=np.count_nonzero(nonzero & ~table_mask))
