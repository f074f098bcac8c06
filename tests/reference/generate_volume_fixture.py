"""A small open brain volume for the 3D tests, cut from Debian's mricron-data.

Source: /usr/share/mricron/templates/inia19-t1-brain.nii.gz (package mricron-data 1.2.20211006; the
INIA19 primate brain template, T1, 168 × 206 × 128 voxels of 0.5 mm, skull-stripped). Not a ch2*
file: those are reserved for independent checks.

The template is averaged over 4 × 4 × 4 blocks of its central 128³ (rounded down to whole blocks),
giving 32 × 32 × 32 voxels of 2 mm, scaled to a maximum of 1000 and rounded to integers times 1/4 so
float32 stores it exactly. Written with nibabel as a float32 NIfTI-1 (identity affine × 2 mm) to
tests/fixtures/volumes/inia19-t1-32.nii.gz.

Run: /usr/bin/python3 tests/reference/generate_volume_fixture.py   (needs python3-nibabel, mricron-data)
"""
import os

import nibabel
import numpy as np

here = os.path.dirname(os.path.abspath(__file__))
source = "/usr/share/mricron/templates/inia19-t1-brain.nii.gz"
data = np.asanyarray(nibabel.load(source).dataobj).astype(np.float64)
shape = np.array(data.shape)
start = (shape - 128) // 2
cube = data[start[0]:start[0] + 128, start[1]:start[1] + 128, start[2]:start[2] + 128]
blocks = cube.reshape(32, 4, 32, 4, 32, 4).mean(axis=(1, 3, 5))
blocks = np.round(blocks / blocks.max() * 1000 * 4) / 4
image = nibabel.Nifti1Image(blocks.astype(np.float32), np.diag([2.0, 2.0, 2.0, 1.0]))
image.header["descrip"] = b"inia19-t1-brain 4x4x4 block mean"
out = os.path.join(here, "..", "fixtures", "volumes", "inia19-t1-32.nii.gz")
nibabel.save(image, out)
print(out, blocks.shape, float(blocks.min()), float(blocks.max()), float((blocks > 100).mean()))
