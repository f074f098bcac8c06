import type { CoilNoise } from '../coils/index.ts';
import type { ComplexImage } from '../core/complex-image.ts';
import type { CoilMaps, MultiCoilKspace } from '../encoding/index.ts';

/** Fully sampled, noiseless data of one source seen through a receive array, and its reference. */
export interface CoilSimulation {
  /** Full grid k-space of every coil, y_c = F(S_c·x) (orthonormal centred DFT convention). */
  kspace: MultiCoilKspace;
  /** The sensitivities the simulation used: the truth a reconstruction is given. */
  maps: CoilMaps;
  /** Receiver noise covariance Ψ of the array. */
  noise: CoilNoise;
  /**
   * The multi-coil reference x_ref = Σ_c S_c*·F⁻¹y_c / Σ_c |S_c|² (fully sampled, noiseless) that
   * every metric compares against (docs/design.md §3.8).
   */
  reference: ComplexImage;
  /** Pixels of |reference| above OBJECT_THRESHOLD of its maximum. */
  objectMask: Uint8Array;
  /** True when k-space is the DFT of the same pixels the reconstruction inverts (uploads). */
  inverseCrime: boolean;
  /**
   * Phantoms: the largest relative ℓ2 error over the object, over coils, between the Biot–Savart (or
   * Gaussian) smooth factor and its trigonometric fit, which is the simulation's truth.
   */
  fitError?: number;
  /**
   * Phantoms in analytic mode: every coil's exact k-space at arbitrary points (kx, ky) in cycles per
   * FOV, scaled like `kspace`, coil-major with kx.length samples per coil (the trajectory's
   * samples; no gridding in the forward model).
   */
  kspaceAt?: (kx: Float64Array, ky: Float64Array) => Float64Array;
  /** Pixel sources (uploads, rasters): the object S_c multiplies, whose NUFFT gives trajectory samples. */
  object?: ComplexImage;
}
