#!/usr/bin/python3
"""NIfTI coil-map files and the maps they must decode to, for the coil-map upload tests.

Run with Debian's interpreter and packages (python3-nibabel, python3-numpy):

    /usr/bin/python3 tests/reference/generate_coil_map_niftis.py

Writes, under tests/fixtures/coil-maps/ (invented values: seeded numpy draws, no scan data):
- complex64-4d.nii.gz: NIfTI-1, (x, y, 1, coils) = (12, 8, 1, 3), complex64, gzipped;
- complex64-3d-nifti2.nii: NIfTI-2, (x, y, coils) = (10, 6, 2), complex64;
- float32-3d.nii: NIfTI-1, (x, y, coils) = (9, 7, 4), float32 (real maps);
- slices-4d.nii: NIfTI-1, (6, 5, 2, 3), float32 (two slices: refused);
- coils-33.nii: NIfTI-1, (4, 4, 33), float32 (one coil more than the limit: refused);
- scaled.nii: NIfTI-1, (4, 4, 2), float32 with scl_slope 2 (scaling: refused);
- described.nii: as float32-3d.nii, with an invented description and intent name in the header;
and tests/reference/fixtures/coil-map-niftis.json with, for each accepted file, the maps in the
project's layout, computed here with numpy: coil c, image row r, column i holds voxel
(i, ny - 1 - r, [0,] c) - rows flipped as image uploads are, j increasing upward - as
interleaved re, im, coil-major. Values are seeded draws rounded to multiples of 1/1024 in
[-4, 4), so every one is exact in float32 and the JSON round trip is exact.
"""

import json
import os

import nibabel as nib
import numpy as np

HERE = os.path.dirname(os.path.abspath(__file__))
FIXTURES = os.path.join(HERE, '..', 'fixtures', 'coil-maps')
OUT = os.path.join(HERE, 'fixtures', 'coil-map-niftis.json')
rng = np.random.default_rng(20261202)


def draws(shape):
    return np.round(rng.uniform(-4, 4, size=shape) * 1024) / 1024


def expected_layout(volume):
    """volume[i, j, c] (complex or real) -> interleaved coil-major list in image order."""
    nx, ny, coils = volume.shape
    out = []
    for c in range(coils):
        plane = volume[:, ::-1, c].T  # [row, column], row 0 = j = ny - 1
        for value in plane.reshape(-1):
            out.extend([float(np.real(value)), float(np.imag(value))])
    return out


def save(image, name):
    path = os.path.join(FIXTURES, name)
    nib.save(image, path)
    return path


def main():
    os.makedirs(FIXTURES, exist_ok=True)
    cases = {}

    data = (draws((12, 8, 1, 3)) + 1j * draws((12, 8, 1, 3))).astype(np.complex64)
    save(nib.Nifti1Image(data, np.eye(4)), 'complex64-4d.nii.gz')
    cases['complex64-4d.nii.gz'] = {'nx': 12, 'ny': 8, 'coils': 3, 'data': expected_layout(data[:, :, 0, :])}

    data = (draws((10, 6, 2)) + 1j * draws((10, 6, 2))).astype(np.complex64)
    save(nib.Nifti2Image(data, np.eye(4)), 'complex64-3d-nifti2.nii')
    cases['complex64-3d-nifti2.nii'] = {'nx': 10, 'ny': 6, 'coils': 2, 'data': expected_layout(data)}

    data = draws((9, 7, 4)).astype(np.float32)
    save(nib.Nifti1Image(data, np.eye(4)), 'float32-3d.nii')
    cases['float32-3d.nii'] = {'nx': 9, 'ny': 7, 'coils': 4, 'data': expected_layout(data)}

    described = nib.Nifti1Image(data, np.eye(4))
    described.header['descrip'] = b'Invented Person 1970 study 42'
    described.header['intent_name'] = b'Invented'
    save(described, 'described.nii')
    cases['described.nii'] = cases['float32-3d.nii']

    save(nib.Nifti1Image(draws((6, 5, 2, 3)).astype(np.float32), np.eye(4)), 'slices-4d.nii')
    save(nib.Nifti1Image(draws((4, 4, 33)).astype(np.float32), np.eye(4)), 'coils-33.nii')
    # nibabel leaves float data unscaled (scl_slope NaN) whatever the header says, so the slope is
    # written into the saved file: nifti1.h puts scl_slope at byte 112 (float32, the file's byte order).
    path = save(nib.Nifti1Image(draws((4, 4, 2)).astype(np.float32), np.eye(4)), 'scaled.nii')
    with open(path, 'r+b') as f:
        f.seek(112)
        f.write(np.array([2.0], dtype='<f4').tobytes())

    with open(OUT, 'w') as f:
        json.dump(
            {
                'generator': 'tests/reference/generate_coil_map_niftis.py',
                'nibabel': nib.__version__,
                'numpy': np.__version__,
                'cases': cases,
            },
            f,
        )
        f.write('\n')


if __name__ == '__main__':
    main()
