import { describe, expect, it } from 'vitest';
import { ValidationError } from '../../../src/core/errors.ts';
import { readRawKspace } from '../../../src/io/ismrmrd/read-raw-kspace.ts';
import { maxAbsDifference } from '../../error-measures.ts';
import {
  peakRelativeError,
  raw3dBytes,
  raw3dFileName,
  raw3dMissingFileName,
  raw3dReference as reference,
  rssVolume,
} from './raw-3d-fixture.ts';

/**
 * The importer on a 3D Cartesian ISMRMRD file written by tests/reference/generate_ismrmrd_3d_fixture.py
 * (h5py; Debian's ismrmrd-tools generator has no 3D option) against the numbers h5py and numpy give.
 */
const read = (name: string) => readRawKspace(new Uint8Array(raw3dBytes(name)));

describe('readRawKspace on a 3D acquisition (kspace_encode_step_1 × kspace_encode_step_2)', () => {
  it('reports the coils, matrices, partitions and samples of the header and records', async () => {
    const raw = await read(raw3dFileName);
    expect(raw.coils).toBe(reference.coils);
    expect(raw.readoutSamples).toBe(reference.readoutSamples);
    expect(raw.readoutOversampling).toBe(reference.readoutOversampling);
    const { encodedMatrix: e, reconMatrix: r } = raw;
    expect([e.x, e.y, e.z]).toEqual(reference.encodedMatrix);
    expect([r.x, r.y, r.z]).toEqual(reference.reconMatrix);
    expect(raw.nz).toBe(reference.nz);
    expect(raw.records).toEqual({ ...reference.records, skipped: 0 });
    expect(raw.repeatedLines).toBe(0);
    expect(raw.step2Limits).toEqual({ minimum: 0, maximum: reference.nz - 1, center: reference.nz / 2 });
    const { coils, nx, ny, data } = raw.kspace;
    expect([coils, ny, nx]).toEqual([reference.coils, reference.ny, reference.nx]);
    expect(data.length).toBe(2 * coils * reference.nz * ny * nx);
    // Records are written kz outer, ky inner (the script's loop order).
    expect(Array.from(raw.encodeCounters.step2.subarray(0, ny + 1))).toEqual([...new Array(ny).fill(0), 1]);
  });

  it('gives the RSS volume numpy computes to 1e-6 of its peak (readout oversampling removed)', async () => {
    const raw = await read(raw3dFileName);
    const magnitude = rssVolume(raw.kspace, raw.nz);
    expect(peakRelativeError(magnitude, reference.rss)).toBeLessThan(1e-6);
    expect(Math.max(...reference.rss)).toBeGreaterThan(0.5); // the object is there
  });

  it('estimates the noise covariance as numpy.cov of the four noise-scan records', async () => {
    const raw = await read(raw3dFileName);
    expect(raw.noise?.samples).toBe(reference.noiseSamples);
    const peak = Math.max(...reference.noiseCovariance.map(Math.abs));
    expect(maxAbsDifference(raw.noise!.covariance, reference.noiseCovariance) / peak).toBeLessThan(1e-12);
  });

  it('keeps numbers only: the subject and study identifiers of the header never reach the result', async () => {
    expect(reference.identifiers.every((word) => raw3dBytes(raw3dFileName).includes(word))).toBe(true);
    const raw = await read(raw3dFileName);
    const json = JSON.stringify(raw, (_key, value) =>
      ArrayBuffer.isView(value) ? Array.from(value as Float64Array) : value,
    );
    for (const word of reference.identifiers) expect(json).not.toContain(word);
  });

  it('refuses a missing ky–kz point, naming how many of the encoded points were acquired', async () => {
    const error = await read(raw3dMissingFileName).then(
      () => null,
      (e: unknown) => e,
    );
    expect(error).toBeInstanceOf(ValidationError);
    const [problem] = (error as ValidationError).problems;
    expect(problem.field).toBe('file.data.head.idx.kspace_encode_step_2');
    const total = reference.ny * reference.nz;
    expect(problem.message).toContain(`${total - 1} of ${total} ky–kz points`);
    // The script drops (step1, step2) = (3, 5); the centres are ny/2 and nz/2, so row 3, partition 5.
    expect(problem.message).toContain(`row ${reference.missing.step1}, partition ${reference.missing.step2}`);
  });
});
