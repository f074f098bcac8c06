import type { ComplexImage } from '../core/complex-image.ts';

/**
 * Sizes an encoding operator works between: an ny×nx complex image and `coils` blocks of
 * `samplesPerCoil` complex k-space samples (coil-major, interleaved re/im). A Cartesian operator
 * keeps the whole grid per coil (samplesPerCoil = ny·nx, unacquired points 0); a trajectory
 * operator would keep only its k-points.
 */
export interface EncodingShapes {
  readonly nx: number;
  readonly ny: number;
  readonly coils: number;
  readonly samplesPerCoil: number;
}

/** Anything an encoding operator reads or writes as data: a flat coil-major complex array. */
export interface CoilSamples {
  readonly coils: number;
  readonly data: Float64Array;
}

/**
 * The encoding operator E of the acquisition, the one shape every iterative reconstruction uses:
 *   forward   E x  = { D_c(S_c · x) }_c       one k-space (block of samples) per coil
 *   adjoint   Eᴴ y = Σ_c conj(S_c) · D_cᴴ y_c
 *   normal    EᴴE x
 * where D is the k-space sampling of the trajectory (Cartesian: M·F with the mask M and the centred
 * orthonormal DFT F; non-Cartesian: a NUFFT). `out` arguments are written and returned; when absent a
 * new array is allocated (convenient outside loops). An operator owns scratch buffers and is not
 * re-entrant, like the FFT plans it uses.
 */
export interface EncodingOperator<Data extends CoilSamples = CoilSamples> {
  readonly shapes: EncodingShapes;
  createImage(): ComplexImage;
  createData(): Data;
  forward(x: ComplexImage, out?: Data): Data;
  adjoint(y: Data, out?: ComplexImage): ComplexImage;
  normal(x: ComplexImage, out?: ComplexImage): ComplexImage;
}
