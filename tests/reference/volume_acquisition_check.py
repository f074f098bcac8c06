"""Reads the acquisition bundle of a volume reconstruction with Debian's python3-nibabel and
python3-numpy and reconstructs its zero-filled volume independently of the service
(docs/design.md §2.5, §4.11).

Usage: /usr/bin/python3 tests/reference/volume_acquisition_check.py DIR
DIR holds acquisition.nii, acquisition.json and images.nii of one volume reconstruction (one coil,
or several from a 3D raw source). 3D: numpy's centred orthonormal inverse 3D DFT of the k-space grid
of each coil; multi-slice: the inverse 2D DFT of every slice; several coils are combined by
root-sum-of-squares. Prints one JSON object: the NIfTI facts nibabel reports, the table's count, the
grid points holding data outside the table, and the largest difference between numpy's zero-filled
magnitude volume and the service's zero-filled volume of images.nii, relative to its maximum.
"""
import sys

import numpy as np

from bundle_io import print_facts, read_bundle, zero_filled_volume

folder = sys.argv[1]
header, kspace_file, grid, rows = read_bundle(folder)  # grid [u, v, w, coil]
nx, ny, nz = (header["matrix"][k] for k in ("nx", "ny", "nz"))
mode = header["volume"]["acquisition"]

# K[w, v, u] of each coil: the NIfTI array transposed, as the header's scaling states.
power = np.zeros((nz, ny, nx))
held_any = None
for coil in range(grid.shape[3]):
    k = grid[:, :, :, coil].T.astype(np.complex128)
    if mode == "3d":
        volume = np.fft.fftshift(np.fft.ifftn(np.fft.ifftshift(k), norm="ortho"))
    else:
        volume = np.fft.fftshift(np.fft.ifft2(np.fft.ifftshift(k, axes=(1, 2)), norm="ortho"), axes=(1, 2))
    power += np.abs(volume) ** 2
    held_any = k != 0 if held_any is None else held_any | (k != 0)
k = np.where(held_any, 1, 0)

# The table's points (grid indices relative to the centre) as a mask on the ky–kz or ky–kx plane.
columns = header["table"]["columns"]
ky = rows[:, columns.index("ky")]
if mode == "3d":
    kz = rows[:, columns.index("kz")]
    table_mask = np.zeros((ny, nz), dtype=bool)
    table_mask[ny // 2 - ky, kz + nz // 2] = True
    held = np.any(k != 0, axis=2).T  # [row, w]: some kx of the (ky, kz) line holds data
else:
    kx = rows[:, columns.index("kx")]
    table_mask = np.zeros((ny, nx), dtype=bool)
    table_mask[ny // 2 - ky, kx + nx // 2] = True
    held = np.any(k != 0, axis=0)  # [row, u]: some slice holds data there

print_facts(
    kspace_file,
    grid,
    rows,
    np.sqrt(power),  # [z, row, x]
    zero_filled_volume(folder),
    heldOutsideTable=np.count_nonzero(held & ~table_mask),
    tableWithoutData=np.count_nonzero(table_mask & ~held),
)
