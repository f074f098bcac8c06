"""Root-sum-of-squares of coil images, plain and prewhitened, as the ISMRMRD fixture scripts need it."""
import numpy as np


def rss(images):
    """sqrt(Σ_c |x_c|²) over the first axis (coils)."""
    return np.sqrt(np.sum(np.abs(images) ** 2, axis=0))


def prewhitened_rss(images, noise_samples):
    """numpy.cov of the noise samples (coils × samples) and the RSS of the coil images prewhitened
    with it: L⁻¹ applied across coils at every pixel, Ψ = L·Lᴴ (numpy's Cholesky)."""
    cov = np.cov(noise_samples)
    lower = np.linalg.cholesky(cov)
    whitened = np.tensordot(np.linalg.inv(lower), images, axes=(1, 0))
    return cov, rss(whitened)
