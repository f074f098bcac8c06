import type { FieldProblem } from '../core/errors.ts';

/** A volume's mask drawn with a non-Cartesian trajectory. */
export const nonCartesianVolume: FieldProblem = {
  field: 'sampling.trajectory',
  message: 'volumes are acquired on the Cartesian grid only; this trajectory is non-Cartesian',
  allowed: "a Cartesian pattern, or trajectory: 'rasterised'",
};

/** The pieces of a reconstruction request or a plan that volumes may not carry. */
export interface VolumeRequestPieces {
  source: object;
  /** The request's coils, or a plan's coilArrays, with the field each is reported under. */
  coils: Array<{ field: string; spec: object }>;
  lesions?: unknown;
  phase?: unknown;
  gFactor?: unknown;
}

/**
 * What the volume pipeline does not model (docs/design.md §2.5), one problem per field: sources
 * other than an uploaded volume, receive arrays, lesion studies, object phase, g-factors.
 * Non-Cartesian trajectories are refused once the mask is drawn (sampling.trajectory).
 */
export function unsupportedVolumePieces(pieces: VolumeRequestPieces): FieldProblem[] {
  const problems: FieldProblem[] = [];
  if (!('imageId' in pieces.source)) {
    problems.push({
      field: 'phantom' in pieces.source ? 'source.phantom' : 'source.rawId',
      message: 'volumes (matrix.nz > 1) come from an uploaded NIfTI volume only, for now',
      allowed: 'source: { imageId } of an image uploaded with slices=all',
    });
  }
  for (const { field, spec } of pieces.coils) {
    if ('array' in spec && spec.array === 'uniform') continue;
    problems.push({
      field,
      message: 'volumes are simulated with the uniform single coil only',
      allowed: "{ array: 'uniform' }",
    });
  }
  const absent = (field: string, value: unknown, message: string) => {
    if (value !== undefined) problems.push({ field, message, allowed: `no ${field} with matrix.nz > 1` });
  };
  absent('lesions', pieces.lesions, 'lesion studies run on 2D acquisitions only');
  absent('phase', pieces.phase, 'a simulated object phase is not modelled for volumes');
  absent('gFactor', pieces.gFactor, 'g-factors need a receive array; volumes use one coil');
  return problems;
}
