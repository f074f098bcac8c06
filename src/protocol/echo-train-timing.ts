import { type FieldProblem, ValidationError } from '../core/errors.ts';
import type { Protocol } from './schema.ts';

/** How the slices of a 2D protocol share the TR (docs/design.md §2.2). */
export interface SliceTiming {
  slicesPerTr: number;
  passes: number;
}

/**
 * Slices per TR and passes. With `echoSpacingMs` each slice occupies one echo train plus its
 * overhead, so ⌊TR / (ETL × ES + overhead)⌋ slices fit in one TR (Bernstein, King & Zhou 2004,
 * docs/references.md §8.1); a given `slicesPerPass` may only be smaller. Without it the model is the
 * older one: `slicesPerPass` (default all slices) fit in one TR. passes = ⌈slices / slicesPerPass⌉.
 * 3D: one slab, one pass; the train must still fit in TR.
 */
export function sliceTiming(protocol: Protocol): SliceTiming {
  const { echoSpacingMs, slices, slicesPerPass } = protocol;
  if (echoSpacingMs === undefined) {
    if (protocol.dimensions === '3d') return { slicesPerTr: 1, passes: 1 };
    const perPass = slicesPerPass ?? slices;
    return { slicesPerTr: perPass, passes: Math.ceil(slices / perPass) };
  }
  const overhead = protocol.sliceOverheadMs ?? 0;
  const perSlice = protocol.echoTrainLength * echoSpacingMs + overhead;
  // A tiny tolerance keeps a train that fills TR exactly (16 × 10 ms in 160 ms) from flooring to 0.
  const slicesPerTr = Math.floor(protocol.trMs / perSlice + 1e-9);
  if (slicesPerTr < 1) {
    const fields = ['protocol.echoTrainLength', 'protocol.echoSpacingMs', 'protocol.trMs'];
    if (overhead > 0) fields.push('protocol.sliceOverheadMs');
    const message =
      `one echo train (${protocol.echoTrainLength} × ${echoSpacingMs} ms` +
      `${overhead > 0 ? ` + ${overhead} ms overhead` : ''} = ${round(perSlice)} ms) is longer than TR ${protocol.trMs} ms`;
    const allowed = `echoTrainLength × echoSpacingMs + sliceOverheadMs ≤ trMs`;
    throw new ValidationError(fields.map((field): FieldProblem => ({ field, message, allowed })));
  }
  if (protocol.dimensions === '3d') return { slicesPerTr: 1, passes: 1 };
  if (slicesPerPass !== undefined && slicesPerPass > slicesPerTr) {
    throw new ValidationError({
      field: 'protocol.slicesPerPass',
      message: `${slicesPerPass} slices do not fit in one TR: ⌊${protocol.trMs} / ${round(perSlice)}⌋ = ${slicesPerTr}`,
      allowed: `1 ≤ slicesPerPass ≤ ${slicesPerTr} (or leave it out)`,
    });
  }
  const perPass = Math.min(slicesPerPass ?? slicesPerTr, slices);
  return { slicesPerTr, passes: Math.ceil(slices / perPass) };
}

/**
 * The effective TE: the time of the echo that acquires the centre of k-space (Bernstein, King & Zhou
 * 2004, docs/references.md §8.1). Echo n (1…ETL) comes at n × ES.
 * - `teMs` given: the echo nearest it, which must lie in the train (ES ≤ TE ≤ ETL × ES).
 * - `centric`: the centre comes first, TE_eff = ES.
 * - `linear`: each echo takes the next `shots` acquired units (lines or points) in ky order, so the
 *   centre falls on echo ⌊before / shots⌋ + 1, `before` the units acquired ahead of the centre. Fully
 *   sampled, before = N/2 and shots = N/ETL give the handbook ES × (ETL/2 + 1); partial Fourier
 *   acquires fewer rows ahead of the centre and shortens it.
 * Without `echoSpacingMs`: `teMs` as given, or null. `before` null (radial: every echo crosses the
 * centre): only a requested `teMs` gives a value.
 */
export function effectiveTeMs(protocol: Protocol, before: number | null, shots: number): number | null {
  const { echoSpacingMs, teMs, echoTrainLength } = protocol;
  if (echoSpacingMs === undefined) {
    if (teMs !== undefined && teMs >= protocol.trMs) {
      throw new ValidationError({
        field: 'protocol.teMs',
        message: `TE ${teMs} ms is not shorter than TR ${protocol.trMs} ms`,
        allowed: `0 < teMs < ${protocol.trMs}`,
      });
    }
    return teMs ?? null;
  }
  if (teMs !== undefined) {
    const last = echoTrainLength * echoSpacingMs;
    if (teMs < echoSpacingMs - 1e-9 || teMs > last + 1e-9) {
      throw new ValidationError([
        {
          field: 'protocol.teMs',
          message: `TE ${teMs} ms lies outside the echo train (${round(echoSpacingMs)} … ${round(last)} ms)`,
          allowed: `${round(echoSpacingMs)} ≤ teMs ≤ ${round(last)} (echoSpacingMs … echoTrainLength × echoSpacingMs)`,
        },
      ]);
    }
    return Math.max(1, Math.min(echoTrainLength, Math.round(teMs / echoSpacingMs))) * echoSpacingMs;
  }
  if (before === null) return null; // radial: every echo crosses the centre
  if (protocol.echoOrder === 'centric') return echoSpacingMs;
  return (Math.floor(before / shots) + 1) * echoSpacingMs;
}

function round(ms: number): number {
  return Math.round(ms * 1000) / 1000;
}
