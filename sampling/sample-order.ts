import { z } from 'zod';
import type { SampleTable } from './sample-table.ts';

/**
 * Acquisition orders of a Cartesian sample table (docs/design.md §4.10, docs/references.md §3.8):
 * - `linear`: ky from its most negative value upwards, kx ascending within a line (sequential
 *   order, common practice; the table as drawn).
 * - `centre-out`: by distance √(ky² + kx²) from the k-space centre in grid steps, nearest first
 *   (centric order; elliptical centric for a ky–kz plane, Wilman & Riederer 1997): the centre,
 *   which sets the contrast, is acquired first.
 * - `spiral-out`: unit-width distance shells from the centre outwards (shell s holds the points
 *   with s − ½ ≤ √(ky² + kx²) < s + ½), each walked counter-clockwise by angle from the −kx
 *   direction: a spiral path through the ky–kz plane (the radial/spiral view orders of Busse et al.
 *   2008 for 3D echo trains, here as one path through the plane).
 * Ties keep the linear order, so every ordering is a permutation of the same samples.
 */
export const sampleOrderings = ['linear', 'centre-out', 'spiral-out'] as const;
export type SampleOrdering = (typeof sampleOrderings)[number];

export const sampleOrderingSchema = z
  .enum(sampleOrderings)
  .describe(
    'Acquisition order of a Cartesian table: linear (ky lines from the most negative, kx ascending; ' +
      'the default), centre-out (by distance from the k-space centre, centric), spiral-out (unit ' +
      'distance shells outwards, by angle within a shell). Trajectory tables keep their readout order.',
  );

/** The same samples in `ordering` (a Cartesian table in its linear order), renumbered 0, 1, …. */
export function orderedSampleTable(table: SampleTable, ordering: SampleOrdering): SampleTable {
  if (table.unit !== 'grid index') throw new RangeError('only Cartesian tables are reordered');
  if (ordering === 'linear') return table;
  const { values, count } = table;
  const radius = new Float64Array(count);
  const angle = new Float64Array(count);
  for (let i = 0; i < count; i++) {
    const ky = values[3 * i + 1];
    const kx = values[3 * i + 2];
    radius[i] = Math.hypot(ky, kx);
    // atan2 ∈ (−π, π]: the −kx direction (π) becomes the start of the turn.
    const theta = Math.atan2(ky, kx);
    angle[i] = theta === Math.PI ? -Math.PI : theta;
  }
  const shell = (i: number) => Math.floor(radius[i] + 0.5);
  const permutation = Array.from({ length: count }, (_, i) => i);
  permutation.sort(
    ordering === 'centre-out'
      ? (a, b) => radius[a] - radius[b] || a - b
      : (a, b) => shell(a) - shell(b) || angle[a] - angle[b] || radius[a] - radius[b] || a - b,
  );
  const reordered = new Float64Array(values.length);
  permutation.forEach((from, order) => {
    reordered[3 * order] = order;
    reordered[3 * order + 1] = values[3 * from + 1];
    reordered[3 * order + 2] = values[3 * from + 2];
  });
  return { ...table, ordering, values: reordered };
}
