import type { SampleOrdering } from './sample-order.ts';
import type { SampledMask } from './sampled-mask.ts';

/**
 * The sampled positions of a mask or trajectory as a table a sequence programmer can load, in
 * acquisition order (docs/design.md §4.7):
 * - Cartesian (and rasterised trajectories): `order,ky,kx`, integer grid indices relative to the
 *   k-space centre (⌊ny/2⌋, ⌊nx/2⌋), ky pointing up (ky = ⌊ny/2⌋ − row). Order "linear": ky from
 *   its most negative value upwards, kx ascending within a ky line (common practice for a
 *   sequential Cartesian acquisition); other orders in sample-order.ts.
 * - Non-Cartesian: `order,kx,ky` in cycles per field of view, readout by readout in the order the
 *   readouts are acquired (spokes in their angle order, interleaves by rotation), sample by sample.
 */
export interface SampleTable {
  columns: readonly ['order', 'ky', 'kx'] | readonly ['order', 'kx', 'ky'];
  unit: 'grid index' | 'cycles per FOV';
  /** Cartesian: one of sample-order.ts (`linear` as drawn); trajectories: their readout order. */
  ordering: SampleOrdering | 'readout';
  /** order, then the two coordinates, flat: 3 numbers per sample. */
  values: Float64Array;
  count: number;
}

/** Decimals of a trajectory coordinate in the CSV (1e-9 cycles per FOV, far below any NUFFT error). */
const TRAJECTORY_DECIMALS = 9;

export function sampleTable(m: SampledMask): SampleTable {
  if (m.trajectory) {
    const { kx, ky } = m.trajectory;
    const values = new Float64Array(3 * kx.length);
    for (let p = 0; p < kx.length; p++) {
      values[3 * p] = p;
      values[3 * p + 1] = kx[p];
      values[3 * p + 2] = ky[p];
    }
    return {
      columns: ['order', 'kx', 'ky'],
      unit: 'cycles per FOV',
      ordering: 'readout',
      values,
      count: kx.length,
    };
  }
  const { nx, ny, mask } = m;
  const cx = Math.floor(nx / 2);
  const cy = Math.floor(ny / 2);
  const rows: number[] = [];
  let order = 0;
  for (let row = ny - 1; row >= 0; row--) {
    for (let col = 0; col < nx; col++) {
      if (mask[row * nx + col] === 0) continue;
      rows.push(order++, cy - row, col - cx);
    }
  }
  return {
    columns: ['order', 'ky', 'kx'],
    unit: 'grid index',
    ordering: 'linear',
    values: Float64Array.from(rows),
    count: order,
  };
}

/** RFC 4180 CSV: one header row, CRLF line ends, no comment lines. */
export function sampleTableCsv(table: SampleTable): string {
  const lines = [table.columns.join(',')];
  const decimals = table.unit === 'grid index' ? 0 : TRAJECTORY_DECIMALS;
  const { values } = table;
  for (let i = 0; i < values.length; i += 3) {
    lines.push(`${values[i]},${fixed(values[i + 1], decimals)},${fixed(values[i + 2], decimals)}`);
  }
  return `${lines.join('\r\n')}\r\n`;
}

function fixed(value: number, decimals: number): string {
  const text = value.toFixed(decimals);
  return text === `-${(0).toFixed(decimals)}` ? text.slice(1) : text;
}

/** The JSON form: the CSV's rows plus the facts a reader needs to place them. */
export function sampleTableJson(m: SampledMask, table: SampleTable) {
  const samples: number[][] = [];
  for (let i = 0; i < table.values.length; i += 3) {
    samples.push([table.values[i], table.values[i + 1], table.values[i + 2]]);
  }
  return {
    matrix: { nx: m.nx, ny: m.ny },
    pattern: m.pattern,
    representation: m.representation,
    acceleration: m.acceleration,
    acquired: m.acquired,
    acs: m.acs,
    seed: m.seed,
    ordering: table.ordering,
    unit: table.unit,
    columns: [...table.columns],
    count: table.count,
    samples,
  };
}
