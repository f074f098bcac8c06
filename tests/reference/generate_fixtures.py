#!/usr/bin/python3
"""Reference fixtures for the image-quality metrics and the centred FFT of k-space planner.

Run with Debian's interpreter and packages (python3-numpy, python3-scipy, python3-skimage):

    /usr/bin/python3 tests/reference/generate_fixtures.py

Writes tests/reference/fixtures/metrics.json and tests/reference/fixtures/fft-numpy.json.
Every input is drawn from a seeded numpy generator and quantised to integers times a power-of-two
scale, so the JSON stores short integers for the inputs and the TypeScript tests rebuild exactly the
same float64 values; outputs are written as shortest round-trip float64 literals (<= 17 digits).
"""

import json

import numpy as np
import scipy
import scipy.ndimage as ndi
import skimage
from skimage.metrics import normalized_root_mse, peak_signal_noise_ratio, structural_similarity

from fixture_io import interleave, write


# Image values are integers times 2^-10; FFT inputs integers times 2^-9 (exact in float64).
IMAGE_SCALE = 2.0**-10
FFT_SCALE = 2.0**-9

# HFEN filter: the 15x15 Laplacian of Gaussian, sigma 1.5 px, of Ravishankar & Bresler 2011.
# gaussian_laplace's kernel radius is int(truncate * sigma + 0.5); truncate 4.8 gives radius 7,
# i.e. 15 taps (scipy's default truncate 4.0 would give 13).
LOG_SIGMA = 1.5
LOG_TRUNCATE = 4.8
LOG_RADIUS = 7


def quantise(values, scale):
    return np.rint(np.asarray(values) / scale).astype(np.int64)


def smooth_image(rng, ny, nx, blobs=6):
    """Non-negative smooth image: Gaussian blobs plus a gentle cosine ramp."""
    yy, xx = np.mgrid[0:ny, 0:nx].astype(float)
    image = 0.2 + 0.1 * np.cos(2 * np.pi * xx / nx) * np.cos(np.pi * yy / ny)
    for _ in range(blobs):
        cy, cx = rng.uniform(0, ny), rng.uniform(0, nx)
        width = rng.uniform(2.0, max(ny, nx) / 4)
        image += rng.uniform(0.2, 0.8) * np.exp(-((yy - cy) ** 2 + (xx - cx) ** 2) / (2 * width**2))
    return image


def piecewise_image(rng, ny, nx):
    """Piecewise-constant image of rectangles and discs (sharp edges)."""
    yy, xx = np.mgrid[0:ny, 0:nx].astype(float)
    image = np.full((ny, nx), 0.1)
    for _ in range(4):
        y0, x0 = rng.integers(0, ny - 4), rng.integers(0, nx - 4)
        h, w = rng.integers(4, ny // 2), rng.integers(4, nx // 2)
        image[y0 : y0 + h, x0 : x0 + w] += rng.uniform(0.2, 0.6)
    for _ in range(3):
        cy, cx, r = rng.uniform(0, ny), rng.uniform(0, nx), rng.uniform(3, min(ny, nx) / 4)
        image[(yy - cy) ** 2 + (xx - cx) ** 2 <= r * r] += rng.uniform(0.1, 0.4)
    return image


def disc_mask(ny, nx, radius_fraction=0.4):
    yy, xx = np.mgrid[0:ny, 0:nx].astype(float)
    r = radius_fraction * min(ny, nx)
    return ((yy - ny // 2) ** 2 + (xx - nx // 2) ** 2 <= r * r).astype(np.int64)


def log_zero_sum_kernel_sum():
    """Sum of gaussian_laplace's own 15x15 kernel, read off its response to a centred delta."""
    delta = np.zeros((31, 31))
    delta[15, 15] = 1.0
    response = ndi.gaussian_laplace(delta, sigma=LOG_SIGMA, mode='constant', truncate=LOG_TRUNCATE)
    support = np.argwhere(response != 0)
    assert support.min() == 15 - LOG_RADIUS and support.max() == 15 + LOG_RADIUS, 'kernel must be 15x15'
    return response.sum()


KERNEL_SUM = log_zero_sum_kernel_sum()


def gaussian_laplace_reflect(image):
    """scipy's LoG, sigma 1.5, 15 taps, 'reflect' boundary (half-sample symmetric extension)."""
    return ndi.gaussian_laplace(image, sigma=LOG_SIGMA, mode='reflect', truncate=LOG_TRUNCATE)


def log_zero_sum(image):
    """The project's HFEN filter: the same kernel minus its mean over the 15x15 support.

    Subtracting the constant c = sum(K) / 225 from every tap equals subtracting sum(K) times the
    15x15 moving average, which uniform_filter computes with the same 'reflect' boundary.
    """
    width = 2 * LOG_RADIUS + 1
    return gaussian_laplace_reflect(image) - KERNEL_SUM * ndi.uniform_filter(image, size=width, mode='reflect')


def hfen(estimate, reference, log, mask=None):
    difference = log(estimate) - log(reference)
    base = log(reference)
    if mask is not None:
        difference, base = difference[mask], base[mask]
    return float(np.linalg.norm(difference) / np.linalg.norm(base))


def ssim_skimage(estimate, reference, data_range, mask=None):
    """skimage SSIM as Wang et al. 2004: Gaussian window sigma 1.5 (11 taps), population covariance."""
    value, smap = structural_similarity(
        reference,
        estimate,
        gaussian_weights=True,
        sigma=1.5,
        use_sample_covariance=False,
        data_range=data_range,
        full=True,
    )
    if mask is None:
        return float(value)
    # skimage averages the map after cropping (11 - 1) / 2 = 5 pixels from every side.
    pad = 5
    inner = smap[pad:-pad, pad:-pad]
    inner_mask = mask[pad:-pad, pad:-pad]
    return float(inner[inner_mask].mean(dtype=np.float64))


def metric_case(name, reference, estimate, mask=None, extra_data_range=None):
    ref_q = quantise(reference, IMAGE_SCALE)
    est_q = quantise(estimate, IMAGE_SCALE)
    ref = ref_q * IMAGE_SCALE
    est = est_q * IMAGE_SCALE
    ny, nx = ref.shape
    peak = float(np.abs(ref).max())
    data_range = float(ref.max() - ref.min())
    case = {
        'name': name,
        'ny': ny,
        'nx': nx,
        'reference': ref_q.ravel().tolist(),
        'estimate': est_q.ravel().tolist(),
        'ssimDataRange': data_range,
        'ssim': ssim_skimage(est, ref, data_range),
        'psnrPeak': peak,
        'psnr': float(peak_signal_noise_ratio(ref, est, data_range=peak)),
        'nrmse': float(normalized_root_mse(ref, est, normalization='euclidean')),
        'hfen': hfen(est, ref, log_zero_sum),
        'hfenGaussianLaplace': hfen(est, ref, gaussian_laplace_reflect),
    }
    if extra_data_range is not None:
        case['ssimExplicit'] = {
            'dataRange': extra_data_range,
            'ssim': ssim_skimage(est, ref, extra_data_range),
        }
    if mask is not None:
        selected = mask.astype(bool)
        case['mask'] = mask.ravel().tolist()
        case['masked'] = {
            'ssim': ssim_skimage(est, ref, data_range, selected),
            'psnr': float(peak_signal_noise_ratio(ref[selected], est[selected], data_range=peak)),
            'nrmse': float(normalized_root_mse(ref[selected], est[selected], normalization='euclidean')),
            'hfen': hfen(est, ref, log_zero_sum, selected),
        }
    return case


def metric_cases():
    cases = []

    rng = np.random.default_rng(101)
    ref = smooth_image(rng, 48, 64)
    est = np.abs(ref + rng.normal(0, 0.05, ref.shape))
    cases.append(metric_case('smooth-noise-48x64', ref, est, extra_data_range=1.0))

    rng = np.random.default_rng(202)
    ref = piecewise_image(rng, 37, 41)
    est = ndi.gaussian_filter(ref, 1.0, mode='reflect')
    cases.append(metric_case('piecewise-blurred-37x41', ref, est))

    rng = np.random.default_rng(303)
    ref = smooth_image(rng, 32, 40) + np.abs(rng.normal(0, 0.02, (32, 40)))
    cases.append(metric_case('offset-32x40', ref, ref + 0.125))

    rng = np.random.default_rng(404)
    ref = smooth_image(rng, 64, 64, blobs=10)
    est = np.abs(ref + rng.normal(0, 0.2, ref.shape) + 1j * rng.normal(0, 0.2, ref.shape))
    cases.append(metric_case('heavy-noise-64x64', ref, est))

    rng = np.random.default_rng(505)
    ref = rng.uniform(0, 1, (11, 13))
    est = np.abs(ref + rng.normal(0, 0.1, ref.shape))
    cases.append(metric_case('minimal-11x13', ref, est))

    rng = np.random.default_rng(606)
    ref = piecewise_image(rng, 41, 37) + smooth_image(rng, 41, 37, blobs=3)
    est = np.abs(ndi.gaussian_filter(ref, 0.7) + rng.normal(0, 0.03, ref.shape))
    cases.append(metric_case('masked-41x37', ref, est, mask=disc_mask(41, 37)))
    return cases


def log_filter_case():
    """A 6x5 image, smaller than the 15-tap kernel, to pin the repeated 'reflect' extension."""
    rng = np.random.default_rng(707)
    image_q = quantise(rng.uniform(0, 1, (6, 5)), IMAGE_SCALE)
    image = image_q * IMAGE_SCALE
    return {
        'ny': 6,
        'nx': 5,
        'image': image_q.ravel().tolist(),
        'gaussianLaplace': gaussian_laplace_reflect(image).ravel().tolist(),
        'zeroSum': log_zero_sum(image).ravel().tolist(),
    }


def centred_fft(x, inverse=False):
    transform = np.fft.ifft2 if inverse else np.fft.fft2
    return np.fft.fftshift(transform(np.fft.ifftshift(x), norm='ortho'))


def fft_cases():
    cases = []
    rng = np.random.default_rng(808)
    for ny, nx in [(8, 8), (7, 5), (12, 20), (33, 31), (64, 48), (1, 9)]:
        q = quantise(rng.uniform(-1, 1, (ny, nx, 2)), FFT_SCALE)
        x = (q[..., 0] + 1j * q[..., 1]) * FFT_SCALE
        cases.append(
            {
                'ny': ny,
                'nx': nx,
                'input': interleave(q[..., 0] + 1j * q[..., 1]).astype(np.int64).tolist(),
                'forward': interleave(centred_fft(x)).tolist(),
                'inverse': interleave(centred_fft(x, inverse=True)).tolist(),
            }
        )
    return cases


def main():
    versions = {'numpy': np.__version__, 'scipy': scipy.__version__, 'skimage': skimage.__version__}
    write(
        'metrics.json',
        {
            'generator': 'tests/reference/generate_fixtures.py',
            'versions': versions,
            'imageScale': IMAGE_SCALE,
            'conventions': {
                'ssim': 'skimage.metrics.structural_similarity(reference, estimate, gaussian_weights=True, '
                'sigma=1.5, use_sample_covariance=False, data_range=max-min of reference); '
                'masked: mean of the full=True map over mask pixels after cropping 5 from every side',
                'psnr': 'skimage.metrics.peak_signal_noise_ratio(reference, estimate, data_range=max|reference|); '
                'masked: same on the mask pixels, peak still max|reference| over the whole image',
                'nrmse': "skimage.metrics.normalized_root_mse(reference, estimate, normalization='euclidean')",
                'hfen': 'norm(L(estimate) - L(reference)) / norm(L(reference)), L = '
                "scipy.ndimage.gaussian_laplace(sigma=1.5, truncate=4.8 (15 taps), mode='reflect') "
                "minus kernelSum * scipy.ndimage.uniform_filter(size=15, mode='reflect') (zero-sum kernel)",
                'hfenGaussianLaplace': 'same ratio with L = scipy.ndimage.gaussian_laplace alone',
            },
            'logKernelSum': float(KERNEL_SUM),
            'cases': metric_cases(),
            'logFilter': log_filter_case(),
        },
    )
    write(
        'fft-numpy.json',
        {
            'generator': 'tests/reference/generate_fixtures.py',
            'versions': versions,
            'inputScale': FFT_SCALE,
            'convention': "forward = fftshift(fft2(ifftshift(x), norm='ortho')), "
            "inverse = fftshift(ifft2(ifftshift(x), norm='ortho')); arrays interleaved re/im, row-major",
            'cases': fft_cases(),
        },
    )


if __name__ == '__main__':
    main()
