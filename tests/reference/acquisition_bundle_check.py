"""Reads an exported acquisition bundle with Debian's python3-nibabel and python3-numpy and
reconstructs its zero-filled image independently of the service (docs/design.md §4.11).

Usage: /usr/bin/python3 tests/reference/acquisition_bundle_check.py DIR
DIR holds acquisition.nii, acquisition.json and images.nii of one Cartesian reconstruction whose
zero-filled image is the root-sum-of-squares of its coil images (one coil, or raw data).
Prints one JSON object: the NIfTI facts nibabel reports, the acquired count against the table, and
the largest difference between numpy's zero-filled root-sum-of-squares and the service's zero-filled
volume of images.nii, relative to that volume's maximum.
"""
import json
import os
import sys

import nibabel
import numpy as np

folder = sys.argv[1]
header = json.load(open(os.path.join(folder, "acquisition.json")))
kspace_file = nibabel.load(os.path.join(folder, "acquisition.nii"))
kspace = np.asanyarray(kspace_file.dataobj)  # [u, v, 0, coil]
nx, ny = header["matrix"]["nx"], header["matrix"]["ny"]

# Coil images by the centred orthonormal DFT the header states; K[v, u] is the plane transposed.
rss = np.zeros((ny, nx))
for c in range(kspace.shape[3]):
    plane = kspace[:, :, 0, c].T.astype(np.complex128)
    image = np.fft.fftshift(np.fft.ifft2(np.fft.ifftshift(plane), norm="ortho"))
    rss += np.abs(image) ** 2
rss = np.sqrt(rss)

# images.nii: voxel (i, j) is column i, row ny − 1 − j; its volumes are named in descrip.
volumes_file = nibabel.load(os.path.join(folder, "images.nii"))
volumes = np.asanyarray(volumes_file.dataobj)
names = volumes_file.header["descrip"].tobytes().decode("latin1").rstrip("\x00").split(": ")[1].split(",")
zero_filled = volumes[:, :, 0, names.index("zero-filled")].T[::-1, :]

# The table's acquired points against the non-zero grid points of the first coil.
columns = header["table"]["columns"]
rows = np.array(header["table"]["rows"], dtype=np.int64).reshape(-1, 3)
ky = rows[:, columns.index("ky")]
kx = rows[:, columns.index("kx")]
table_mask = np.zeros((ny, nx), dtype=bool)
table_mask[ny // 2 - ky, kx + nx // 2] = True
nonzero = np.any(kspace[:, :, 0, :] != 0, axis=2).T

print(json.dumps({
    "source": "nibabel " + nibabel.__version__ + ", numpy " + np.__version__,
    "dtype": str(kspace.dtype),
    "shape": [int(v) for v in kspace.shape],
    "datatype": int(kspace_file.header["datatype"]),
    "tableCount": int(rows.shape[0]),
    "nonzeroOutsideTable": int(np.count_nonzero(nonzero & ~table_mask)),
    "maxRelativeDifference": float(np.max(np.abs(rss - zero_filled)) / np.max(zero_filled)),
}))
