"""How Debian's python3-nibabel reads the float32 NIfTI-1 the service writes (src/io/nifti-writer.ts).

Reads two files written from tests/io/nifti-writer-case.ts and writes what nibabel reports:
- tests/fixtures/io/written-volumes.nii (5 × 3 × 2 images, v = 100·volume + 10·row + column + 0.25,
  row 0 at the top) -> fixtures/nifti-writer.json, the array as data[i, j, 0, t];
- tests/fixtures/io/written-volumes-3d.nii (4 × 3 × 2 slices × 2 volumes,
  v = 1000·volume + 100·slice + 10·row + column + 0.25) -> fixtures/nifti-writer-3d.json, the array
  as data[i, j, k, t].
Values are listed i (x) fastest, then j, then k, then t (Fortran order).
Run: /usr/bin/python3 tests/reference/nifti_writer_facts.py
"""
import json
import os

import nibabel
import numpy as np

here = os.path.dirname(os.path.abspath(__file__))


def facts_of(name):
    image = nibabel.load(os.path.join(here, "..", "fixtures", "io", name))
    header = image.header
    data = np.asanyarray(image.dataobj)
    return {
        "source": "nibabel " + nibabel.__version__ + ", numpy " + np.__version__,
        "class": type(image).__name__,
        "sizeof_hdr": int(header["sizeof_hdr"]),
        "dim": [int(v) for v in header["dim"]],
        "datatype": int(header["datatype"]),
        "bitpix": int(header["bitpix"]),
        "vox_offset": int(image.dataobj.offset),
        "scl_slope": None if np.isnan(header["scl_slope"]) else float(header["scl_slope"]),
        "magic": header["magic"].tobytes().decode("latin1").rstrip("\x00"),
        "descrip": header["descrip"].tobytes().decode("latin1").rstrip("\x00"),
        "qform_code": int(header["qform_code"]),
        "sform_code": int(header["sform_code"]),
        "zooms": [float(v) for v in header.get_zooms()],
        "shape": [int(v) for v in data.shape],
        "dtype": str(data.dtype),
        "values": [float(v) for v in data.ravel(order="F")],
    }


for source, target in [
    ("written-volumes.nii", "nifti-writer.json"),
    ("written-volumes-3d.nii", "nifti-writer-3d.json"),
]:
    facts = facts_of(source)
    with open(os.path.join(here, "fixtures", target), "w") as out:
        json.dump(facts, out, indent=1)
        out.write("\n")
    print(json.dumps({k: v for k, v in facts.items() if k != "values"}))
