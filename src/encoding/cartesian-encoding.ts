import { type ComplexImage, createComplexImage } from '../core/complex-image.ts';
import { transformPlaneInPlace } from './block-fft.ts';
import type { EncodingOperator, EncodingShapes } from './encoding-operator.ts';
import {
  type CoilMaps,
  checkMultiCoilShape,
  createMultiCoilArray,
  type MultiCoilKspace,
} from './multi-coil.ts';
import { addConjugateSensitivityProduct, sensitivityProduct } from './sensitivity-products.ts';

/**
 * Cartesian encoding E x = { M ⊙ F(S_c ⊙ x) }_c with the mask M (Uint8Array, ny·nx, 1 = acquired),
 * the centred orthonormal DFT F (fft2c) and optional coil sensitivities S_c. Without sensitivities it
 * is the single-coil operator with S = 1 and reproduces today's M ⊙ fft2c(x) and ifft2c(M ⊙ y) bit
 * for bit (the sensitivity product is skipped, not multiplied by one). Unacquired samples are 0.
 */
export class CartesianEncoding implements EncodingOperator<MultiCoilKspace> {
  readonly shapes: EncodingShapes;
  readonly mask: Uint8Array;
  readonly sensitivities: CoilMaps | undefined;
  /** One coil image (forward products and per-coil adjoints). */
  private readonly scratch: Float64Array;
  /** The normal operator's running sum, so `out` may be the input image. */
  private readonly accumulator: Float64Array;

  constructor(nx: number, ny: number, mask: Uint8Array, sensitivities?: CoilMaps) {
    const n = nx * ny;
    if (mask.length !== n) throw new RangeError(`mask must hold ny·nx = ${n} entries, got ${mask.length}`);
    if (sensitivities) checkMultiCoilShape(sensitivities, sensitivities.coils, nx, ny, 'sensitivities');
    const coils = sensitivities?.coils ?? 1;
    this.shapes = { nx, ny, coils, samplesPerCoil: n };
    this.mask = mask;
    this.sensitivities = sensitivities;
    this.scratch = new Float64Array(2 * n);
    this.accumulator = new Float64Array(2 * n);
  }

  createImage(): ComplexImage {
    return createComplexImage(this.shapes.nx, this.shapes.ny);
  }

  createData(): MultiCoilKspace {
    const { coils, nx, ny } = this.shapes;
    return createMultiCoilArray(coils, nx, ny);
  }

  forward(x: ComplexImage, out: MultiCoilKspace = this.createData()): MultiCoilKspace {
    const { nx, ny, coils } = this.shapes;
    this.checkImage(x, 'x');
    checkMultiCoilShape(out, coils, nx, ny, 'out');
    const n = nx * ny;
    for (let c = 0; c < coils; c++) {
      const offset = c * n;
      this.coilImage(x.data, c, out.data, offset);
      transformPlaneInPlace(out.data, offset, nx, ny, -1);
      this.applyMask(out.data, offset);
    }
    return out;
  }

  adjoint(y: MultiCoilKspace, out: ComplexImage = this.createImage()): ComplexImage {
    const { nx, ny, coils } = this.shapes;
    checkMultiCoilShape(y, coils, nx, ny, 'y');
    this.checkImage(out, 'out');
    const n = nx * ny;
    if (!this.sensitivities) {
      this.maskedCopy(y.data, 0, out.data);
      transformPlaneInPlace(out.data, 0, nx, ny, 1);
      return out;
    }
    out.data.fill(0);
    for (let c = 0; c < coils; c++) {
      this.maskedCopy(y.data, c * n, this.scratch);
      transformPlaneInPlace(this.scratch, 0, nx, ny, 1);
      this.addConjugateProduct(out.data, c, this.scratch);
    }
    return out;
  }

  normal(x: ComplexImage, out: ComplexImage = this.createImage()): ComplexImage {
    const { nx, ny, coils } = this.shapes;
    this.checkImage(x, 'x');
    this.checkImage(out, 'out');
    const { scratch, accumulator } = this;
    if (!this.sensitivities) {
      scratch.set(x.data);
      transformPlaneInPlace(scratch, 0, nx, ny, -1);
      this.applyMask(scratch, 0);
      transformPlaneInPlace(scratch, 0, nx, ny, 1);
      out.data.set(scratch);
      return out;
    }
    accumulator.fill(0);
    for (let c = 0; c < coils; c++) {
      this.coilImage(x.data, c, scratch, 0);
      transformPlaneInPlace(scratch, 0, nx, ny, -1);
      this.applyMask(scratch, 0);
      transformPlaneInPlace(scratch, 0, nx, ny, 1);
      this.addConjugateProduct(accumulator, c, scratch);
    }
    out.data.set(accumulator);
    return out;
  }

  /** target[offset…] = S_c ⊙ x (a plain copy without sensitivities). */
  private coilImage(x: Float64Array, coil: number, target: Float64Array, offset: number): void {
    if (!this.sensitivities) target.set(x, 2 * offset);
    else sensitivityProduct(this.sensitivities, coil, x, target, offset);
  }

  /** target += conj(S_c) ⊙ image. */
  private addConjugateProduct(target: Float64Array, coil: number, image: Float64Array): void {
    addConjugateSensitivityProduct(this.sensitivities as CoilMaps, coil, image, target);
  }

  /** Zeroes the unacquired samples of the plane at complex offset `offset`. */
  private applyMask(data: Float64Array, offset: number): void {
    const { mask } = this;
    const t = 2 * offset;
    for (let i = 0; i < mask.length; i++) {
      if (mask[i]) continue;
      data[t + 2 * i] = 0;
      data[t + 2 * i + 1] = 0;
    }
  }

  /** target = M ⊙ (plane of `source` at complex offset `offset`). */
  private maskedCopy(source: Float64Array, offset: number, target: Float64Array): void {
    const { mask } = this;
    const s = 2 * offset;
    for (let i = 0; i < mask.length; i++) {
      if (mask[i]) {
        target[2 * i] = source[s + 2 * i];
        target[2 * i + 1] = source[s + 2 * i + 1];
      } else {
        target[2 * i] = 0;
        target[2 * i + 1] = 0;
      }
    }
  }

  private checkImage(image: ComplexImage, name: string): void {
    const { nx, ny } = this.shapes;
    if (image.nx !== nx || image.ny !== ny || image.data.length !== 2 * nx * ny) {
      throw new RangeError(`${name} is ${image.ny}×${image.nx}, expected ${ny}×${nx}`);
    }
  }
}
