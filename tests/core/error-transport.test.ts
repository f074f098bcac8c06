import { describe, expect, it } from 'vitest';
import { fromWorkerFailure, toWorkerFailure } from '../../src/core/error-transport.ts';
import {
  CancelledError,
  DecodeError,
  KnownError,
  LimitError,
  NotFoundError,
  QueueFullError,
  ValidationError,
  WorkerError,
  WorkersBusyError,
} from '../../src/core/errors.ts';

// A worker thread sends errors through structured clone (the HTML structured-clone algorithm that
// postMessage uses): it keeps neither prototypes nor class fields, hence the data form.
const acrossThread = (error: unknown) => fromWorkerFailure(structuredClone(toWorkerFailure(error)));

describe('errors across a worker thread', () => {
  const known: KnownError[] = [
    new ValidationError({
      field: 'sampling.acceleration',
      message: 'too large',
      allowed: '1 ≤ acceleration ≤ 64',
    }),
    new LimitError([
      { field: 'matrix.nx', message: 'above the limit', allowed: '1 ≤ nx ≤ 48' },
      { field: 'matrix.ny', message: 'above the limit', allowed: '1 ≤ ny ≤ 48' },
    ]),
    new NotFoundError({ field: 'coils.mapsId', message: 'no uploaded coil maps 7f3a' }),
    new CancelledError(),
    new DecodeError('not a DICOM file', 'file.header'),
    new QueueFullError(17),
    new WorkersBusyError(),
  ];

  it.each(known.map((error) => [error.name, error] as const))(
    '%s comes back as the same class and answer',
    (_, error) => {
      const rebuilt = acrossThread(error);
      expect(rebuilt).toBeInstanceOf(error.constructor);
      expect(rebuilt.message).toBe(error.message);
      expect((rebuilt as KnownError).kind).toBe(error.kind);
      expect((rebuilt as KnownError).status).toBe(error.status);
      expect((rebuilt as KnownError).problem()).toEqual(error.problem());
    },
  );

  it('a LimitError is not rebuilt as a plain ValidationError (its problem type differs)', () => {
    const rebuilt = acrossThread(new LimitError({ field: 'iterations', message: 'too many' }));
    expect(rebuilt).toBeInstanceOf(LimitError);
    expect((rebuilt as LimitError).kind).toBe('limit');
  });

  it('any other error becomes a WorkerError naming the original class, never a known one', () => {
    const rebuilt = acrossThread(new TypeError('x is undefined'));
    expect(rebuilt).toBeInstanceOf(WorkerError);
    expect(rebuilt).not.toBeInstanceOf(KnownError);
    expect(rebuilt.message).toBe('TypeError: x is undefined');
    expect(acrossThread('a thrown string').message).toBe('a thrown string');
  });
});
