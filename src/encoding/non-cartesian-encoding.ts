import { type ComplexImage, createComplexImage } from '../core/complex-image.ts';
import type { NufftPlan } from '../nufft/nufft-plan.ts';
import type { CoilSamples, EncodingOperator, EncodingShapes } from './encoding-operator.ts';
import { type CoilMaps, checkMultiCoilShape } from './multi-coil.ts';
import { addConjugateSensitivityProduct, sensitivityProduct } from './sensitivity-products.ts';

/**
 * Trajectory encoding E x = { A(S_c ⊙ x) }_c with A the type-2 NUFFT of a plan (src/nufft: exact
 * k-space points, scaled like the centred orthonormal DFT) and optional coil sensitivities S_c;
 * Eᴴ y = Σ_c conj(S_c) ⊙ Aᴴ y_c with Aᴴ the type-1 NUFFT, the exact adjoint of A. Data: coil-major
 * blocks of `plan.count` interleaved complex samples. No density compensation inside E: the least-
 * squares problems of the iterative methods are posed on the samples as acquired.
 */
export class NonCartesianEncoding implements EncodingOperator<CoilSamples> {
  readonly shapes: EncodingShapes;
  readonly plan: NufftPlan;
  readonly sensitivities: CoilMaps | undefined;
  private readonly coilScratch: ComplexImage;
  private readonly adjointScratch: ComplexImage;
  private readonly dataScratch: CoilSamples;

  constructor(plan: NufftPlan, sensitivities?: CoilMaps) {
    const { nx, ny } = plan;
    if (sensitivities) checkMultiCoilShape(sensitivities, sensitivities.coils, nx, ny, 'sensitivities');
    const coils = sensitivities?.coils ?? 1;
    this.shapes = { nx, ny, coils, samplesPerCoil: plan.count };
    this.plan = plan;
    this.sensitivities = sensitivities;
    this.coilScratch = createComplexImage(nx, ny);
    this.adjointScratch = createComplexImage(nx, ny);
    this.dataScratch = this.createData();
  }

  createImage(): ComplexImage {
    return createComplexImage(this.shapes.nx, this.shapes.ny);
  }

  createData(): CoilSamples {
    const { coils, samplesPerCoil } = this.shapes;
    return { coils, data: new Float64Array(2 * coils * samplesPerCoil) };
  }

  forward(x: ComplexImage, out: CoilSamples = this.createData()): CoilSamples {
    this.checkImage(x, 'x');
    this.checkData(out, 'out');
    const { coils, samplesPerCoil } = this.shapes;
    for (let c = 0; c < coils; c++) {
      const block = out.data.subarray(2 * c * samplesPerCoil, 2 * (c + 1) * samplesPerCoil);
      if (!this.sensitivities) this.plan.forward(x, block);
      else {
        sensitivityProduct(this.sensitivities, c, x.data, this.coilScratch.data, 0);
        this.plan.forward(this.coilScratch, block);
      }
    }
    return out;
  }

  adjoint(y: CoilSamples, out: ComplexImage = this.createImage()): ComplexImage {
    this.checkData(y, 'y');
    this.checkImage(out, 'out');
    const { coils, samplesPerCoil } = this.shapes;
    if (!this.sensitivities) return this.plan.adjoint(y.data.subarray(0, 2 * samplesPerCoil), out);
    const sum = this.coilScratch.data;
    sum.fill(0);
    for (let c = 0; c < coils; c++) {
      const block = y.data.subarray(2 * c * samplesPerCoil, 2 * (c + 1) * samplesPerCoil);
      this.plan.adjoint(block, this.adjointScratch);
      addConjugateSensitivityProduct(this.sensitivities, c, this.adjointScratch.data, sum);
    }
    out.data.set(sum);
    return out;
  }

  normal(x: ComplexImage, out: ComplexImage = this.createImage()): ComplexImage {
    return this.adjoint(this.forward(x, this.dataScratch), out);
  }

  private checkImage(image: ComplexImage, name: string): void {
    const { nx, ny } = this.shapes;
    if (image.nx !== nx || image.ny !== ny || image.data.length !== 2 * nx * ny) {
      throw new RangeError(`${name} must be a ${ny}×${nx} complex image`);
    }
  }

  private checkData(data: CoilSamples, name: string): void {
    const { coils, samplesPerCoil } = this.shapes;
    if (data.coils !== coils || data.data.length !== 2 * coils * samplesPerCoil) {
      throw new RangeError(`${name} must hold ${coils} coils × ${samplesPerCoil} complex samples`);
    }
  }
}
