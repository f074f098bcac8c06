import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { coilArrayMaps } from '../../src/coils/coil-array.ts';

/** tests/reference/fixtures/coils.json, made by tests/reference/generate_coil_fixtures.py (numpy, scipy). */
export interface CoilFixture {
  sense_two_coils: { S: number[][]; g: number[]; g_rows_as_pixels: number[] };
  gaussian_array: {
    nx: number;
    ny: number;
    count: number;
    width: number;
    ringRadius: number;
    startAngleDeg: number;
    acceleration: number;
    correlation: number;
    disc: number[];
    samplePixels: number[];
    mapSamples: [number, number][][];
    gWhite: number[];
    gRing: number[];
    summaryWhite: { mean: number; p95: number; max: number };
    summaryRing: { mean: number; p95: number; max: number };
  };
  loop_field: { radius: number; points: [number, number, number][]; field: [number, number, number][] };
  trig_fit: {
    coil: number;
    order: number;
    periodFactor: number;
    coefficients: [number, number][];
    relativeResidual: number;
  }[];
}

export const coilFixture: CoilFixture = JSON.parse(
  readFileSync(fileURLToPath(new URL('../reference/fixtures/coils.json', import.meta.url)), 'utf8'),
);

/** Our maps of the fixture's Gaussian-profile array (its count, width, ring radius and start angle) on its grid. */
export function gaussianArrayMaps(): ReturnType<typeof coilArrayMaps> {
  const f = coilFixture.gaussian_array;
  return coilArrayMaps(
    {
      array: 'gaussian',
      count: f.count,
      width: f.width,
      ringRadius: f.ringRadius,
      startAngleDeg: f.startAngleDeg,
    },
    f.nx,
    f.ny,
  );
}
