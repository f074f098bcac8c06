#!/usr/bin/python3
"""Reference facts for the DICOM decoder (src/io/dicom.ts) on more pydicom test files than
docs/references.md §12.1 lists: multi-frame, 32-bit, RLE multi-frame, RGB, Deflated, and a CT file with
a Rescale Intercept. Pixels are read by Debian's python3-pydicom 2.3.1 (pixel_array; Modality LUT by
pydicom.pixel_data_handlers.util.apply_modality_lut; RGB → Y = 0.2125 R + 0.7154 G + 0.0721 B as in
skimage.color.rgb2gray, on stored values).
Files: /usr/lib/python3/dist-packages/pydicom/data/test_files/, Expat (MIT), © 2008-2018 Darcy Mason
and pydicom contributors (/usr/share/doc/python3-pydicom/copyright).
Run: /usr/bin/python3 tests/reference/io_dicom_facts.py   (writes tests/reference/fixtures/io-dicom.json)
"""
import json
import os

import numpy as np
import pydicom
from pydicom.pixel_data_handlers.util import apply_modality_lut

DIR = '/usr/lib/python3/dist-packages/pydicom/data/test_files/'
HERE = os.path.dirname(os.path.abspath(__file__))
WEIGHTS = np.array([0.2125, 0.7154, 0.0721])


def frame_facts(a):
    a = np.asarray(a, dtype=np.float64)
    ny, nx = a.shape
    picks = [[0, 0], [ny // 2, nx // 3], [ny - 1, nx - 1]]
    return {'sum': float(a.sum()), 'min': float(a.min()), 'max': float(a.max()), 'pixels': [[r, c, float(a[r, c])] for r, c in picks]}


files = []
for name in ['rtdose.dcm', 'rtdose_rle.dcm', 'rtdose_expb.dcm', 'SC_rgb_rle_2frame.dcm', 'SC_rgb_rle_16bit_2frame.dcm', 'image_dfl.dcm', 'CT_small.dcm']:
    ds = pydicom.dcmread(DIR + name)
    pixels = apply_modality_lut(ds.pixel_array, ds)
    frames = int(ds.get('NumberOfFrames', 1))
    if frames == 1:
        pixels = pixels[np.newaxis]
    if ds.SamplesPerPixel == 3:
        pixels = pixels @ WEIGHTS
    files.append(
        {
            'file': name,
            'transferSyntax': str(ds.file_meta.TransferSyntaxUID),
            'rows': int(ds.Rows),
            'columns': int(ds.Columns),
            'frames': frames,
            'frameFacts': [frame_facts(pixels[f]) for f in range(frames)],
        }
    )

with open(os.path.join(HERE, 'fixtures', 'io-dicom.json'), 'w') as f:
    json.dump({'generator': f'pydicom {pydicom.__version__}, numpy {np.__version__}', 'files': files}, f, indent=1)
    f.write('\n')
