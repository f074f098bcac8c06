"""How Debian's python3-nibabel reads the float32 NIfTI-1 the service writes (src/io/nifti-writer.ts).

Reads tests/fixtures/io/written-volumes.nii (written from tests/io/nifti-writer-case.ts: 5 × 3 × 2
volumes, v = 100·volume + 10·row + column + 0.25 with row 0 at the top) and writes
fixtures/nifti-writer.json: the header fields nibabel reports and the array as nibabel indexes it,
data[i, j, 0, t] for i (x) fastest, then j, then t.
Run: /usr/bin/python3 tests/reference/nifti_writer_facts.py
"""
import json
import os

import nibabel
import numpy as np

here = os.path.dirname(os.path.abspath(__file__))
path = os.path.join(here, "..", "fixtures", "io", "written-volumes.nii")
image = nibabel.load(path)
header = image.header
data = np.asanyarray(image.dataobj)
facts = {
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
with open(os.path.join(here, "fixtures", "nifti-writer.json"), "w") as out:
    json.dump(facts, out, indent=1)
    out.write("\n")
print(json.dumps({k: v for k, v in facts.items() if k != "values"}))
