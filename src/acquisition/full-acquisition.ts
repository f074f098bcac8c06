import type { ComplexImage } from '../core/complex-image.ts';
import type { RealImage } from '../core/real-image.ts';

/** Fully sampled, noiseless data of one source and the reference every metric compares against. */
export interface FullAcquisition {
  /** Full grid k-space (orthonormal centred DFT convention). */
  kspace: ComplexImage;
  /** The fully sampled noiseless image, F_cᴴ(kspace) — the metric reference (docs/design.md §3.6). */
  reference: ComplexImage;
  /** The phantom raster, for comparison (phantom sources only). */
  raster?: RealImage;
  /** True when k-space is the DFT of the same raster the reconstruction inverts (docs/references.md §1.4). */
  inverseCrime: boolean;
  /** Pixels of |reference| above OBJECT_THRESHOLD of its maximum (the SNR is defined over these). */
  objectMask: Uint8Array;
  /**
   * Exact k-space at arbitrary points (kx, ky) in cycles per FOV, scaled like `kspace` (phantoms in
   * analytic mode); absent when the source is a set of pixels, whose trajectory samples come from
   * the NUFFT of `reference` (an inverse crime).
   */
  kspaceAt?: (kx: Float64Array, ky: Float64Array) => Float64Array;
}
