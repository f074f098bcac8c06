import { readFileSync } from 'node:fs';
import h5wasm from 'h5wasm';
import { describe, expect, it } from 'vitest';
import { ifft2c } from '../../../src/core/centered-fft.ts';
import { LimitError, ValidationError } from '../../../src/core/errors.ts';
import { defaultLimits } from '../../../src/core/limits.ts';
import { readRawKspace } from '../../../src/io/ismrmrd/read-raw-kspace.ts';

/**
 * The ISMRMRD importer against files made by the standard's reference tools and numpy:
 * tests/fixtures/ismrmrd/shepp-logan-4coil.h5 from `ismrmrd_generate_cartesian_shepp_logan`
 * (Debian ismrmrd-tools 1.8), the other .h5 files there derived from it with h5py, and
 * tests/reference/fixtures/ismrmrd-rss.json (numpy's RSS image and noise covariance); all made by
 * tests/reference/generate_ismrmrd_fixture.sh.
 */
const fixtureFile = (name: string): Uint8Array =>
  new Uint8Array(readFileSync(new URL(`../../fixtures/ismrmrd/${name}`, import.meta.url)));
const reference: {
  coils: number;
  readoutSamples: number;
  encodedMatrix: [number, number];
  reconMatrix: [number, number];
  records: { total: number; imaging: number; noise: number };
  nx: number;
  ny: number;
  rss: number[];
  noiseSamples: number;
  noiseCovariance: number[];
} = JSON.parse(readFileSync(new URL('../../reference/fixtures/ismrmrd-rss.json', import.meta.url), 'utf8'));

async function refusal(bytes: Uint8Array): Promise<ValidationError> {
  const error = await readRawKspace(bytes).then(
    () => null,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(ValidationError);
  return error as ValidationError;
}

describe('readRawKspace on the ismrmrd-tools Shepp–Logan file', () => {
  it('reports the coils, matrices and samples of the header (ismrmrd-tools generator, read by h5py)', async () => {
    const raw = await readRawKspace(fixtureFile('shepp-logan-4coil.h5'));
    expect(raw.coils).toBe(reference.coils);
    expect(raw.readoutSamples).toBe(reference.readoutSamples);
    expect([raw.encodedMatrix.x, raw.encodedMatrix.y]).toEqual(reference.encodedMatrix);
    expect([raw.reconMatrix.x, raw.reconMatrix.y]).toEqual(reference.reconMatrix);
    expect(raw.readoutOversampling).toBe(2);
    expect(raw.records).toEqual({ ...reference.records, skipped: 0 });
    expect(raw.repeatedLines).toBe(0);
    expect([raw.kspace.coils, raw.kspace.ny, raw.kspace.nx]).toEqual([
      reference.coils,
      reference.ny,
      reference.nx,
    ]);
    expect(Array.from(raw.encodeCounters.step1)).toEqual(Array.from({ length: reference.ny }, (_, i) => i));
    expect(raw.step1Limits).toEqual({ minimum: 0, maximum: 63, center: 32 });
  });

  it('gives the RSS image numpy computes to 1e-6 relative (inverse centred FFT, oversampling cropped)', async () => {
    const raw = await readRawKspace(fixtureFile('shepp-logan-4coil.h5'));
    const { nx, ny, coils } = raw.kspace;
    const rss = new Float64Array(nx * ny);
    for (let c = 0; c < coils; c++) {
      const plane = raw.kspace.data.slice(2 * c * nx * ny, 2 * (c + 1) * nx * ny);
      const image = ifft2c({ nx, ny, data: plane });
      for (let p = 0; p < nx * ny; p++) rss[p] += image.data[2 * p] ** 2 + image.data[2 * p + 1] ** 2;
    }
    let worst = 0;
    let peak = 0;
    for (let p = 0; p < nx * ny; p++) {
      worst = Math.max(worst, Math.abs(Math.sqrt(rss[p]) - reference.rss[p]));
      peak = Math.max(peak, reference.rss[p]);
    }
    // Measured 3.4e-16 relative to the peak 1.98 (both sides in float64 from the same float32 samples).
    expect(worst / peak).toBeLessThan(1e-6);
    expect(peak).toBeGreaterThan(0.5); // the phantom is there, not an empty image
  });

  it('estimates the noise covariance as numpy.cov of the noise-scan record (flag bit 19)', async () => {
    const raw = await readRawKspace(fixtureFile('shepp-logan-4coil.h5'));
    expect(raw.noise?.samples).toBe(reference.noiseSamples);
    const got = raw.noise!.covariance;
    expect(got.length).toBe(reference.noiseCovariance.length);
    let worst = 0;
    let peak = 0;
    for (let k = 0; k < got.length; k++) {
      worst = Math.max(worst, Math.abs(got[k] - reference.noiseCovariance[k]));
      peak = Math.max(peak, Math.abs(reference.noiseCovariance[k]));
    }
    expect(worst / peak).toBeLessThan(1e-12); // measured 5.0e-16: same estimator, float64 sums
  });

  it('keeps numbers only: the invented subject and study never reach the result', async () => {
    const raw = await readRawKspace(fixtureFile('subject.h5'));
    const bytes = fixtureFile('subject.h5');
    // The file does carry the identifiers (so the check below can fail).
    expect(Buffer.from(bytes).includes('Quillfeather')).toBe(true);
    const json = JSON.stringify(raw, (_key, value) =>
      ArrayBuffer.isView(value) ? Array.from(value as Float64Array) : value,
    );
    for (const word of ['Quillfeather', 'Odalys', 'INV-4471', 'Tarnwick', 'ISMRM Synthetic Imaging Lab']) {
      expect(json).not.toContain(word);
    }
    const strings: string[] = [];
    JSON.parse(json, (_key, value) => {
      if (typeof value === 'string') strings.push(value);
      return value;
    });
    expect(strings).toEqual([]);
  });
});

describe('readRawKspace with repeated lines', () => {
  it('averages the records of a line (lines 0–3 recorded again negated: mean exactly 0)', async () => {
    const once = await readRawKspace(fixtureFile('shepp-logan-4coil.h5'));
    const twice = await readRawKspace(fixtureFile('averaged.h5'));
    expect(twice.repeatedLines).toBe(4);
    expect(twice.records.imaging).toBe(68);
    const { nx, ny, coils } = twice.kspace;
    let repeatedMax = 0;
    let otherDiff = 0;
    for (let c = 0; c < coils; c++) {
      for (let row = 0; row < ny; row++) {
        for (let k = 0; k < 2 * nx; k++) {
          const at = 2 * (c * ny * nx + row * nx) + k;
          if (row < 4) repeatedMax = Math.max(repeatedMax, Math.abs(twice.kspace.data[at]));
          else otherDiff = Math.max(otherDiff, Math.abs(twice.kspace.data[at] - once.kspace.data[at]));
        }
      }
    }
    // x and −x averaged; the cropped transform is linear, so the mean is zero to rounding.
    expect(repeatedMax).toBeLessThan(1e-15);
    expect(otherDiff).toBe(0);
  });
});

describe('readRawKspace refusals', () => {
  it('refuses a partially sampled file naming how many lines are missing', async () => {
    const error = await refusal(fixtureFile('partial.h5'));
    // The h5py script drops every line with kspace_encode_step_1 % 8 == 0: 8 of 64.
    expect(error.problems[0].field).toBe('file.data.head.idx.kspace_encode_step_1');
    expect(error.message).toContain('8 of 64 phase-encode lines');
  });

  it('refuses an HDF5 file without the ISMRMRD datasets', async () => {
    // Written here with h5wasm itself: a plain HDF5 file whose /dataset group holds no xml or data.
    const { FS } = await h5wasm.ready;
    const file = new h5wasm.File('/not-ismrmrd.h5', 'w');
    file.create_group('dataset');
    file.create_dataset({ name: 'dataset/values', data: new Float64Array([1, 2, 3]) });
    file.close();
    const bytes = FS.readFile('/not-ismrmrd.h5');
    FS.unlink('/not-ismrmrd.h5');
    const error = await refusal(bytes);
    expect(error.message).toContain('not an ISMRMRD file: no /dataset/xml');
  });

  it('refuses a record count the file cannot hold before reading the records', async () => {
    const bytes = fixtureFile('declared-records.h5');
    const error = await refusal(bytes);
    expect(error.message).toContain(`declares 1000000 records, more than a file of ${bytes.length} bytes`);
  });

  it('refuses a non-Cartesian trajectory in the XML header', async () => {
    const error = await refusal(fixtureFile('radial-header.h5'));
    expect(error.problems[0].field).toBe('file.header.encoding.trajectory');
    expect(error.message).toContain('non-Cartesian trajectory (radial)');
  });

  it('refuses records that carry trajectories (trajectory_dimensions > 0)', async () => {
    const error = await refusal(fixtureFile('trajectory-records.h5'));
    expect(error.problems[0].field).toBe('file.data.head.trajectory_dimensions');
    expect(error.message).toContain('2-dimensional trajectory');
  });

  it('refuses more than one slice, naming the counter', async () => {
    const error = await refusal(fixtureFile('two-slices.h5'));
    expect(error.problems[0].field).toBe('file.data.head.idx.slice');
    expect(error.message).toContain('2 different values');
  });

  it('refuses bytes that are not HDF5 (signature check)', async () => {
    const png = new Uint8Array(readFileSync(new URL('../../fixtures/io/camera64.png', import.meta.url)));
    const error = await refusal(png);
    expect(error.problems[0].field).toBe('file');
    expect(error.message).toContain('not an HDF5 file');
    expect((await refusal(new Uint8Array(0))).message).toContain('not an HDF5 file');
  });

  it('refuses a damaged HDF5 file without crashing', async () => {
    const whole = fixtureFile('shepp-logan-4coil.h5');
    const error = await refusal(whole.slice(0, 4096));
    expect(error.problems[0].field).toBe('file');
  });

  it('refuses matrices beyond the configured limit with a LimitError', async () => {
    const error = await readRawKspace(fixtureFile('shepp-logan-4coil.h5'), {
      ...defaultLimits,
      maxMatrixSide: 32,
    }).then(
      () => null,
      (e: unknown) => e,
    );
    expect(error).toBeInstanceOf(LimitError);
    expect((error as LimitError).problems.map((p) => p.field)).toEqual([
      'file.header.encoding.reconSpace.matrixSize.x',
      'file.header.encoding.encodedSpace.matrixSize.y',
    ]);
  });
});
