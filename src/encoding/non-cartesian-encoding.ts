import { type ComplexImage, createComplexImage } from '../core/complex-image.ts';
import type { NufftPlan } from '../nufft/nufft-plan.ts';
import type { ToeplitzOperator } from '../nufft/toeplitz.ts';
import type { CoilSamples, EncodingOperator, EncodingShapes } from './encoding-operator.ts';
import { type CoilMaps, checkMultiCoilShape } from './multi-coil.ts';
import {
  addConjugateSensitivityProduct,
  peakSensitivityPower,
  sensitivityProduct,
} from './sensitivity-products.ts';

/**
 * Trajectory encoding E x = { A(S_c ⊙ x) }_c with A the type-2 NUFFT of a plan (src/nufft: exact
 * k-space points, scaled like the centred orthonormal DFT) and optional coil sensitivities S_c;
 * Eᴴ y = Σ_c conj(S_c) ⊙ Aᴴ y_c with Aᴴ the type-1 NUFFT, the exact adjoint of A. Data: coil-major
 * blocks of `plan.count` interleaved complex samples. No density compensation inside E: the least-
 * squares problems of the iterative methods are posed on the samples as acquired.
 *
 * With a Toeplitz kernel (toeplitzNormalOperator with unit weights on the same points; Fessler et
 * al. 2005) the normal operator is Σ_c conj(S_c) ⊙ T(S_c ⊙ x): two FFTs of the doubled grid per coil
 * and no gridding, equal to Eᴴ(E x) to the NUFFT's accuracy.
 */
export class NonCartesianEncoding implements EncodingOperator<CoilSamples> {
  readonly shapes: EncodingShapes;
  readonly plan: NufftPlan;
  readonly sensitivities: CoilMaps | undefined;
  private readonly coilScratch: ComplexImage;
  private readonly adjointScratch: ComplexImage;
  private readonly dataScratch: CoilSamples;
  private readonly toeplitz: ToeplitzOperator | undefined;
  /** The Toeplitz normal operator's coil sum. */
  private readonly accumulator: Float64Array;

  /** √w per sample when the data term is density-weighted, else undefined. */
  private readonly rootWeights: Float64Array | undefined;

  /**
   * `weights` (optional, one per sample, ≥ 0) weight the data term: E becomes W^½·A·S, so that
   * EᴴE = Σ conj(S)·AᴴWA·S; with density-compensation weights AᴴWA is close to the identity on the
   * sampled disc and iterative solvers converge in few steps. A Toeplitz kernel must then be built
   * with the same weights.
   */
  constructor(
    plan: NufftPlan,
    sensitivities?: CoilMaps,
    toeplitz?: ToeplitzOperator,
    weights?: Float64Array,
  ) {
    const { nx, ny } = plan;
    if (sensitivities) checkMultiCoilShape(sensitivities, sensitivities.coils, nx, ny, 'sensitivities');
    const coils = sensitivities?.coils ?? 1;
    this.shapes = { nx, ny, coils, samplesPerCoil: plan.count };
    this.plan = plan;
    this.sensitivities = sensitivities;
    this.coilScratch = createComplexImage(nx, ny);
    this.adjointScratch = createComplexImage(nx, ny);
    this.dataScratch = this.createData();
    if (toeplitz && (toeplitz.nx !== nx || toeplitz.ny !== ny)) {
      throw new RangeError(
        `the Toeplitz kernel is for ${toeplitz.ny}×${toeplitz.nx}, the plan for ${ny}×${nx}`,
      );
    }
    this.toeplitz = toeplitz;
    if (weights && weights.length !== plan.count) {
      throw new RangeError(`need one weight per sample: ${plan.count} samples, ${weights.length} weights`);
    }
    this.rootWeights = weights?.map(Math.sqrt);
    this.accumulator = new Float64Array(toeplitz && sensitivities ? 2 * nx * ny : 0);
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
      this.weigh(block);
    }
    return out;
  }

  adjoint(y: CoilSamples, out: ComplexImage = this.createImage()): ComplexImage {
    this.checkData(y, 'y');
    this.checkImage(out, 'out');
    const { coils, samplesPerCoil } = this.shapes;
    const weighted = (c: number) => {
      const block = y.data.subarray(2 * c * samplesPerCoil, 2 * (c + 1) * samplesPerCoil);
      if (!this.rootWeights) return block;
      const copy = this.dataScratch.data.subarray(0, 2 * samplesPerCoil);
      copy.set(block);
      this.weigh(copy);
      return copy;
    };
    if (!this.sensitivities) return this.plan.adjoint(weighted(0), out);
    const sum = this.coilScratch.data;
    sum.fill(0);
    for (let c = 0; c < coils; c++) {
      this.plan.adjoint(weighted(c), this.adjointScratch);
      addConjugateSensitivityProduct(this.sensitivities, c, this.adjointScratch.data, sum);
    }
    out.data.set(sum);
    return out;
  }

  normal(x: ComplexImage, out: ComplexImage = this.createImage()): ComplexImage {
    const { toeplitz, sensitivities } = this;
    if (!toeplitz) return this.adjoint(this.forward(x, this.dataScratch), out);
    this.checkImage(x, 'x');
    this.checkImage(out, 'out');
    if (!sensitivities) {
      toeplitz.apply(x, this.adjointScratch);
      out.data.set(this.adjointScratch.data);
      return out;
    }
    const sum = this.accumulator;
    sum.fill(0);
    for (let c = 0; c < this.shapes.coils; c++) {
      sensitivityProduct(sensitivities, c, x.data, this.coilScratch.data, 0);
      toeplitz.apply(this.coilScratch, this.adjointScratch);
      addConjugateSensitivityProduct(sensitivities, c, this.adjointScratch.data, sum);
    }
    out.data.set(sum);
    return out;
  }

  /**
   * An upper bound of ‖EᴴE‖ as `normal` applies it, when a Toeplitz kernel is given (undefined
   * otherwise): the kernel's bound times max over pixels of Σ_c |S_c|² (‖Σ_c S_cᴴ T S_c‖ ≤
   * ‖T‖·‖Σ_c S_cᴴS_c‖, the latter diagonal).
   */
  normalBound(): number | undefined {
    if (!this.toeplitz) return undefined;
    const maps = this.sensitivities;
    return maps ? this.toeplitz.normBound * peakSensitivityPower(maps) : this.toeplitz.normBound;
  }

  /**
   * block ⊙= √w (nothing without weights): what turns acquired samples of one coil into the data
   * of this operator's weighted data term.
   */
  weigh(block: Float64Array): void {
    const root = this.rootWeights;
    if (!root) return;
    for (let p = 0; p < root.length; p++) {
      block[2 * p] *= root[p];
      block[2 * p + 1] *= root[p];
    }
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
