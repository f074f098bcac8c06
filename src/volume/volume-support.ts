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
 * other than an uploaded volume or 3D raw data, simulated receive arrays (raw data bring their
 * own), lesion studies, object phase, g-factors. Non-Cartesian trajectories are refused once the
 * mask is drawn (sampling.trajectory); a raw source's matrix and acquisition once it is loaded.
 */
export function unsupportedVolumePieces(pieces: VolumeRequestPieces): FieldProblem[] {
  const problems: FieldProblem[] = [];
  const raw = 'rawId' in pieces.source;
  if (!('imageId' in pieces.source) && !raw) {
    problems.push({
      field: 'source.phantom',
      message: 'volumes (matrix.nz > 1) come from an uploaded NIfTI volume or 3D raw data only, for now',
      allowed: 'source: { imageId } of an image uploaded with slices=all, or { rawId } of a 3D acquisition',
    });
  }
  for (const { field, spec } of pieces.coils) {
    if ('array' in spec && spec.array === 'uniform') continue;
    problems.push({
      field,
      message: raw
        ? 'raw data bring their own receive array; a simulated array or maps cannot be applied'
        : 'volumes are simulated with the uniform single coil only',
      allowed: "{ array: 'uniform' }",
    });
  }
  const absent = (field: string, value: unknown, message: string) => {
    if (value !== undefined) problems.push({ field, message, allowed: `no ${field} with matrix.nz > 1` });
  };
  absent('lesions', pieces.lesions, 'lesion studies run on 2D acquisitions only');
  absent(
    'phase',
    pieces.phase,
    raw
      ? 'raw data carry their own phase; a simulated object phase cannot be added'
      : 'a simulated object phase is not modelled for volumes',
  );
  absent('gFactor', pieces.gFactor, 'g-factors are not computed for volumes');
  return problems;
}
