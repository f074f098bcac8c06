// The request's matrix check lives in src/core (reconstructions use it too); sampling re-exports it.
export { type Matrix, validateMatrix } from '../src/core/matrix.ts';
