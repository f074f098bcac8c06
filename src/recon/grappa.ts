import { z } from 'zod';
import { throwIfAborted, ValidationError } from '../core/errors.ts';
import type { MultiCoilKspace } from '../encoding/index.ts';
import { type AcsBlock, requireAcsBlock } from './acs-region.ts';
import { type CoilCombination, coilImages, combineCoilImages } from './coil-combination.ts';
import {
  applyKernels,
  calibrateKernel,
  type GrappaKernel,
  geometryKey,
  kernelGeometryFor,
  MIN_TRAINING_ROWS,
} from './grappa-kernel.ts';
import { type ReconInput, type ReconMethod, type ReconOutput, refuseTrajectory } from './method.ts';
import { checkedNumber, type NumberRule } from './parameters.ts';
import { coilKspaceOf } from './sense.ts';

export const GRAPPA_DEFAULT_KERNEL: readonly [number, number] = [4, 5];
export const GRAPPA_DEFAULT_TIKHONOV = 1e-4;
export const GRAPPA_TIKHONOV_RULE: NumberRule = { min: 0, max: 1 };
export const GRAPPA_KERNEL_LIMITS = { ky: [1, 8], kx: [1, 11] } as const;

export const grappaSchema = z.strictObject({
  name: z.literal('grappa'),
  kernel: z
    .tuple([
      z.number().int().min(GRAPPA_KERNEL_LIMITS.ky[0]).max(GRAPPA_KERNEL_LIMITS.ky[1]),
      z.number().int().min(GRAPPA_KERNEL_LIMITS.kx[0]).max(GRAPPA_KERNEL_LIMITS.kx[1]),
    ])
    .optional()
    .describe(
      `[ky, kx]: acquired source lines per missing line (the nearest ⌈ky/2⌉ above and ⌊ky/2⌋ below) and readout points (odd, centred) per source line (default [${GRAPPA_DEFAULT_KERNEL.join(', ')}])`,
    ),
  tikhonov: z
    .number()
    .min(GRAPPA_TIKHONOV_RULE.min)
    .max(GRAPPA_TIKHONOV_RULE.max)
    .optional()
    .describe(
      `Tikhonov weight of the kernel calibration (AᴴA + λI)W = AᴴB, relative to trace(AᴴA)/n, the mean squared singular value of the calibration matrix A (default ${GRAPPA_DEFAULT_TIKHONOV})`,
    ),
});
export type GrappaSpec = z.infer<typeof grappaSchema>;

/** GRAPPA with its calibration fixed: kernels trained once on the base data's ACS, reusable on noise replicas. */
export interface PreparedGrappa {
  kernel: [number, number];
  tikhonov: number;
  acs: AcsBlock | null;
  /** The filled coil k-space of `kspace` (same line mask or another one; kernels are cached per geometry). */
  fill(kspace: MultiCoilKspace, mask: Uint8Array, signal?: AbortSignal): MultiCoilKspace;
  /** Kernels calibrated so far. */
  readonly kernels: ReadonlyMap<string, GrappaKernel>;
  /** Missing lines of the last fill that no kernel could reach (gap wider than the ACS): left 0. */
  readonly linesLeftEmpty: number;
}

/**
 * Rows of a line mask (1 = the whole row acquired). GRAPPA here fills whole phase-encode lines
 * (1D undersampling along ky), so a row sampled only in part is refused (`sampling.pattern`).
 */
export function acquiredLines(mask: Uint8Array, nx: number, ny: number): Uint8Array {
  const rows = new Uint8Array(ny);
  for (let i = 0; i < ny; i++) {
    let count = 0;
    for (let j = 0; j < nx; j++) if (mask[i * nx + j]) count++;
    if (count !== 0 && count !== nx) {
      throw new ValidationError({
        field: 'sampling.pattern',
        message: `GRAPPA fills whole phase-encode lines, but row ${i} is sampled at ${count} of ${nx} points`,
        allowed: 'cartesian-uniform | cartesian-random (line masks)',
      });
    }
    rows[i] = count === nx ? 1 : 0;
  }
  return rows;
}

function checkKernel(kernel: GrappaSpec['kernel']): [number, number] {
  if (kernel === undefined) return [GRAPPA_DEFAULT_KERNEL[0], GRAPPA_DEFAULT_KERNEL[1]];
  const [ky, kx] = kernel;
  checkedNumber(
    ky,
    'method.kernel.0',
    { min: GRAPPA_KERNEL_LIMITS.ky[0], max: GRAPPA_KERNEL_LIMITS.ky[1], integer: true },
    0,
  );
  checkedNumber(
    kx,
    'method.kernel.1',
    { min: GRAPPA_KERNEL_LIMITS.kx[0], max: GRAPPA_KERNEL_LIMITS.kx[1], integer: true },
    0,
  );
  if (kx % 2 !== 1) {
    throw new ValidationError({
      field: 'method.kernel.1',
      message: `the readout width must be odd (centred on the target), got ${kx}`,
      allowed: 'odd integers 1–11',
    });
  }
  return [ky, kx];
}

/**
 * Checks the spec, finds the ACS block of the base mask (needed only when lines are missing) and
 * returns a filler whose kernels are trained on the base data's ACS as each geometry first occurs.
 */
export function prepareGrappa(input: ReconInput, spec: GrappaSpec): PreparedGrappa {
  const kernel = checkKernel(spec.kernel);
  const tikhonov = checkedNumber(
    spec.tikhonov,
    'method.tikhonov',
    GRAPPA_TIKHONOV_RULE,
    GRAPPA_DEFAULT_TIKHONOV,
  );
  const base = coilKspaceOf(input);
  const { nx, ny } = base;
  const baseRows = acquiredLines(input.mask, nx, ny);
  const complete = baseRows.every((r) => r === 1);
  const acs = complete
    ? null
    : requireAcsBlock(input.mask, nx, ny, MIN_TRAINING_ROWS + 1, kernel[1], 'GRAPPA');
  const kernels = new Map<string, GrappaKernel>();
  let linesLeftEmpty = 0;
  return {
    kernel,
    tikhonov,
    acs,
    kernels,
    get linesLeftEmpty() {
      return linesLeftEmpty;
    },
    fill(kspace, mask, signal) {
      const rows = mask === input.mask ? baseRows : acquiredLines(mask, nx, ny);
      linesLeftEmpty = 0;
      if (rows.every((r) => r === 1)) return { ...kspace, data: kspace.data.slice() };
      if (!acs) throw new RangeError('GRAPPA was prepared on fully sampled data: no ACS to calibrate from');
      return applyKernels(kspace, rows, (row) => {
        throwIfAborted(signal);
        const geometry = kernelGeometryFor(row, rows, kernel[0], kernel[1], acs.rows);
        if (!geometry) {
          linesLeftEmpty++;
          return null;
        }
        const key = geometryKey(geometry);
        let trained = kernels.get(key);
        if (!trained) {
          trained = calibrateKernel(base, acs, geometry, tikhonov);
          kernels.set(key, trained);
        }
        return trained;
      });
    },
  };
}

/**
 * GRAPPA (Griswold et al. 2002): each missing phase-encode line of each coil is a linear
 * combination of the acquired neighbouring lines of all coils (kernel [ky, kx]), with weights
 * calibrated on the ACS block by Tikhonov-regularised least squares (grappa-kernel.ts). Uniform and
 * random line patterns alike (one kernel per distinct source geometry); a line farther from every
 * acquired line than the ACS is tall stays empty and is counted in `info.linesLeftEmpty`. The filled coil k-spaces
 * are transformed and combined: sensitivity-weighted when maps are known, else root-sum-of-squares
 * (`info.combination`). Fully sampled data (R = 1) are returned as they are, then combined.
 */
export const grappa: ReconMethod<GrappaSpec> = {
  name: 'grappa',
  schema: grappaSchema,
  run(input, spec, { signal }): ReconOutput {
    refuseTrajectory(input, 'grappa');
    const prepared = prepareGrappa(input, spec);
    const filled = prepared.fill(coilKspaceOf(input), input.mask, signal);
    const maps = input.coils?.maps;
    const { image, combination } = combineCoilImages(coilImages(filled), maps);
    return {
      image,
      info: grappaInfo(prepared, combination, filled.coils),
    };
  },
};

function grappaInfo(
  prepared: PreparedGrappa,
  combination: CoilCombination,
  coils: number,
): Record<string, unknown> {
  let trainingSamples = 0;
  for (const k of prepared.kernels.values()) trainingSamples = Math.max(trainingSamples, k.trainingSamples);
  return {
    kernel: prepared.kernel,
    tikhonov: prepared.tikhonov,
    tikhonovScale: 'trace(AᴴA)/n (mean squared singular value of the calibration matrix)',
    acs: prepared.acs ? { rows: prepared.acs.rows, columns: prepared.acs.cols } : null,
    kernelsCalibrated: prepared.kernels.size,
    linesLeftEmpty: prepared.linesLeftEmpty,
    trainingSamples,
    combination,
    coils,
  };
}
