"""What the acquisition-bundle checks share: reading a bundle folder with nibabel and printing the
facts (acquisition_bundle_check.py for 2D results, volume_acquisition_check.py for volumes)."""
import json
import os

import nibabel
import numpy as np


def read_bundle(folder):
    """acquisition.json, the acquisition.nii image and its array [u, v, w, coil], and the table rows."""
    header = json.load(open(os.path.join(folder, "acquisition.json")))
    kspace_file = nibabel.load(os.path.join(folder, "acquisition.nii"))
    rows = np.array(header["table"]["rows"], dtype=np.int64).reshape(-1, 3)
    return header, kspace_file, np.asanyarray(kspace_file.dataobj), rows


def zero_filled_volume(folder):
    """images.nii's zero-filled volume as [z, row, x]: voxel (i, j, k) is column i, row ny − 1 − j
    of slice k; the volumes are named in descrip."""
    images_file = nibabel.load(os.path.join(folder, "images.nii"))
    images = np.asanyarray(images_file.dataobj)
    names = images_file.header["descrip"].tobytes().decode("latin1").rstrip("\x00").split(": ")[1].split(",")
    return images[:, :, :, names.index("zero-filled")].T[:, ::-1, :]


def print_facts(kspace_file, grid, rows, numpy_image, service_image, **counts):
    """One JSON object: the NIfTI facts, the table's count, the given counts, and the largest
    difference of numpy's image from the service's relative to the service's maximum."""
    print(json.dumps({
        "source": "nibabel " + nibabel.__version__ + ", numpy " + np.__version__,
        "dtype": str(grid.dtype),
        "shape": [int(v) for v in grid.shape],
        "datatype": int(kspace_file.header["datatype"]),
        "tableCount": int(rows.shape[0]),
        **{name: int(value) for name, value in counts.items()},
        "maxRelativeDifference": float(np.max(np.abs(numpy_image - service_image)) / np.max(service_image)),
    }))
