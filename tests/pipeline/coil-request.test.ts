import { describe, expect, it } from 'vitest';
import { COIL_LIMITS } from '../../src/coils/index.ts';
import { ValidationError } from '../../src/core/errors.ts';
import { coilsLabel } from '../../src/pipeline/coil-request.ts';
import { parseReconstructionRequest, runReconstruction } from '../../src/pipeline/run-reconstruction.ts';
import { caughtValidationError } from '../core/caught-validation-error.ts';

// The coils and phase request pieces (docs/design.md §4.3): bad values are named by their field path.
// The ring covariance is positive definite only for −0.5 < ρ < 1/(2·|min cos 2πk/C|) (its eigenvalues
// 1 + 2ρ·cos(2πk/C); a circulant matrix, common practice).

const base = {
  source: { phantom: 'shepp-logan-modified' },
  matrix: { nx: 32, ny: 32 },
  sampling: { pattern: 'cartesian-uniform', acceleration: 2 },
  method: { name: 'zero-filled' },
};

function fields(extra: Record<string, unknown>): string[] {
  return caughtValidationError(() => parseReconstructionRequest({ ...base, ...extra })).problems.map(
    (p) => p.field,
  );
}

describe('coils and phase schemas', () => {
  it('accept the documented forms', () => {
    for (const coils of [
      { array: 'uniform' },
      { array: 'loops', count: 8, loopRadius: 0.35, ringRadius: 1.25, correlation: 0.1 },
      { array: 'loops', count: 4, loopRadius: 0.3, ringRadius: [1.2, 1.5], tiltDeg: 20 },
      { array: 'gaussian', count: 4, width: 0.6, ringRadius: 1.2 },
      { mapsId: 'abc' },
    ]) {
      expect(parseReconstructionRequest({ ...base, coils }).coils).toEqual(coils);
    }
    expect(parseReconstructionRequest({ ...base, phase: { order: 2, seed: 1 } }).phase).toEqual({
      order: 2,
      seed: 1,
    });
  });

  it('name the bad field: count 33, loop radius, correlation outside the positive-definite range, phase order 5', () => {
    const loops = { array: 'loops', loopRadius: 0.35, ringRadius: 1.25 };
    expect(fields({ coils: { ...loops, count: COIL_LIMITS.maxCoils + 1 } })).toEqual(['coils.count']);
    expect(fields({ coils: { ...loops, count: 8, loopRadius: 3 } })).toEqual(['coils.loopRadius']);
    // 8 coils: min cos = −1, so ρ < 0.5.
    expect(fields({ coils: { ...loops, count: 8, correlation: 0.6 } })).toEqual(['coils.correlation']);
    expect(
      parseReconstructionRequest({ ...base, coils: { ...loops, count: 8, correlation: 0.49 } }),
    ).toBeTruthy();
    // An unknown array fits none of the forms (an array or { mapsId }): the piece itself is named.
    expect(fields({ coils: { array: 'helmet' } })).toEqual(['coils']);
    expect(fields({ phase: { order: 5, seed: 1 } })).toEqual(['phase.order']);
  });

  it('labels: "uniform", "8 loops", "4 gaussian", "maps <id>"', () => {
    expect(coilsLabel({ array: 'uniform' })).toBe('uniform');
    expect(coilsLabel({ array: 'loops', count: 8, loopRadius: 0.3, ringRadius: 1.2 })).toBe('8 loops');
    expect(coilsLabel({ array: 'gaussian', count: 4, width: 0.6, ringRadius: 1.2 })).toBe('4 gaussian');
    expect(coilsLabel({ mapsId: 'x1' })).toBe('maps x1');
  });

  it('uploaded maps without a loader: a ValidationError naming coils.mapsId', async () => {
    const error = await runReconstruction(
      parseReconstructionRequest({ ...base, coils: { mapsId: 'missing' } }),
      undefined,
    ).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ValidationError);
    expect((error as ValidationError).problems[0].field).toBe('coils.mapsId');
  });

  it('uploaded maps of another matrix: a ValidationError naming coils.mapsId', async () => {
    const error = await runReconstruction(
      parseReconstructionRequest({ ...base, coils: { mapsId: 'small' } }),
      undefined,
      { loadCoilMaps: async () => ({ coils: 2, nx: 16, ny: 16, data: new Float64Array(2 * 2 * 256) }) },
    ).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ValidationError);
    expect((error as ValidationError).problems[0]).toMatchObject({
      field: 'coils.mapsId',
      allowed: "maps of the request's matrix, 32×32",
    });
  });
});
