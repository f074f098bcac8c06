#!/usr/bin/python3
"""Test files and reference facts for the PNG/JPEG/TIFF decoders (src/io/raster.ts).

Files are written into tests/fixtures/io/ by outside libraries (imageio, tifffile, Pillow as Debian
packages them) and their facts are computed by skimage/numpy from the written files, so the test
checks our sharp-based decoder against independent decoders:

- camera64.png, astronaut64.png, rocket64.jpg: 64×64 crops of skimage's sample images (Debian
  python3-skimage, /usr/lib/python3/dist-packages/skimage/data; package licence BSD-3-Clause per
  /usr/share/doc/python3-skimage/copyright; camera and astronaut are described upstream as public domain).
- ramp16.png, ramp16-le.tif, ramp16-be.tif: 16-bit greyscale using the full range, value = 34·(40·row + col).
- pages.tif: a 2-page 8-bit TIFF (page p: value = (row + col + 50·p) mod 256).
- truncated.png: camera64.png cut after 60 % of its bytes.

Colour facts use skimage.color.rgb2gray (Y = 0.2125 R + 0.7154 G + 0.0721 B) × the stored range.
Run: /usr/bin/python3 tests/reference/io_raster_facts.py   (writes tests/reference/fixtures/io-raster.json)
"""
import json
import os

import imageio
import numpy as np
import PIL
import skimage
import tifffile
from PIL import Image
from skimage import color, io

DATA = '/usr/lib/python3/dist-packages/skimage/data/'
HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(os.path.dirname(HERE))
OUT = os.path.join(ROOT, 'tests', 'fixtures', 'io')
os.makedirs(OUT, exist_ok=True)


def facts(array, name, note, frame=0):
    a = np.asarray(array, dtype=np.float64)
    ny, nx = a.shape
    picks = [[0, 0], [0, 1], [ny // 2, nx // 2], [ny - 1, nx - 1], [ny // 3, (2 * nx) // 3]]
    return {
        'file': name,
        'note': note,
        'frame': frame,
        'nx': nx,
        'ny': ny,
        'sum': float(a.sum()),
        'min': float(a.min()),
        'max': float(a.max()),
        'pixels': [[r, c, float(a[r, c])] for r, c in picks],
    }


images = []

camera = io.imread(DATA + 'camera.png')[100:164, 200:264]
imageio.imwrite(os.path.join(OUT, 'camera64.png'), camera)
images.append(facts(io.imread(os.path.join(OUT, 'camera64.png')), 'camera64.png', '8-bit greyscale PNG'))

astronaut = io.imread(DATA + 'astronaut.png')[40:104, 180:244]
imageio.imwrite(os.path.join(OUT, 'astronaut64.png'), astronaut)
rgb = io.imread(os.path.join(OUT, 'astronaut64.png'))
images.append(facts(color.rgb2gray(rgb) * 255.0, 'astronaut64.png', '8-bit RGB PNG → rgb2gray × 255'))

rocket = io.imread(DATA + 'rocket.jpg')[200:264, 300:364]
Image.fromarray(rocket).save(os.path.join(OUT, 'rocket64.jpg'), quality=92)
jpeg = np.asarray(Image.open(os.path.join(OUT, 'rocket64.jpg')).convert('RGB'))
images.append(
    facts(color.rgb2gray(jpeg) * 255.0, 'rocket64.jpg', 'RGB JPEG decoded by Pillow → rgb2gray × 255 (IDCT rounding may differ by ±1)')
)

yy, xx = np.mgrid[0:48, 0:40]
ramp = ((yy * 40 + xx) * 34).astype(np.uint16)
imageio.imwrite(os.path.join(OUT, 'ramp16.png'), ramp)
tifffile.imwrite(os.path.join(OUT, 'ramp16-le.tif'), ramp, byteorder='<')
tifffile.imwrite(os.path.join(OUT, 'ramp16-be.tif'), ramp, byteorder='>')
for name, note in [('ramp16.png', '16-bit greyscale PNG'), ('ramp16-le.tif', '16-bit TIFF, little-endian'), ('ramp16-be.tif', '16-bit TIFF, big-endian')]:
    back = imageio.imread(os.path.join(OUT, name)) if name.endswith('.png') else tifffile.imread(os.path.join(OUT, name))
    assert back.dtype == np.uint16 and np.array_equal(back, ramp)
    images.append(facts(back, name, note))

yy, xx = np.mgrid[0:20, 0:24]
pages = np.stack([((yy + xx + 50 * p) % 256).astype(np.uint8) for p in range(2)])
tifffile.imwrite(os.path.join(OUT, 'pages.tif'), pages)
back = tifffile.imread(os.path.join(OUT, 'pages.tif'))
images.append(facts(back[1], 'pages.tif', 'second page of a 2-page TIFF', frame=1))

whole = open(os.path.join(OUT, 'camera64.png'), 'rb').read()
open(os.path.join(OUT, 'truncated.png'), 'wb').write(whole[: int(len(whole) * 0.6)])

out = {
    'generator': f'skimage {skimage.__version__}, numpy {np.__version__}, tifffile {tifffile.__version__}, '
    f'imageio {imageio.__version__}, Pillow {PIL.__version__}',
    'images': images,
}
with open(os.path.join(HERE, 'fixtures', 'io-raster.json'), 'w') as f:
    json.dump(out, f, indent=1)
    f.write('\n')
