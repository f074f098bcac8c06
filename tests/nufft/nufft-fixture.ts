import { readFileSync } from 'node:fs';

/** tests/reference/fixtures/nufft.json, written by tests/reference/generate_nufft_fixture.py (numpy). */
export interface NufftFixture {
  versions: { numpy: string };
  besselI0: { x: number; value: number }[];
  beta: { width: number; oversampling: number; beta: number }[];
  kaiserBesselTransform: {
    width: number;
    beta: number;
    values: { x: number; closedForm: number; quadrature: number }[];
  };
  goldenAngles: { n: number; degrees: number }[];
  nyquistSpokes: { side: number; spokes: number }[];
  ndft: {
    nx: number;
    ny: number;
    imageScale: number;
    kScale: number;
    image: number[];
    kx: number[];
    ky: number[];
    samples: number[];
  };
  nufft1dErrors: { width: number; oversampling: number; relativeError: number }[];
}

export const nufftFixture: NufftFixture = JSON.parse(
  readFileSync(new URL('../reference/fixtures/nufft.json', import.meta.url), 'utf8'),
);
