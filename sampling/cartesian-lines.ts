import { type FieldProblem, ValidationError } from '../src/core/errors.ts';
import { cartesianSampledMask, type SampledMask } from './sampled-mask.ts';

/**
 * Matrix-dependent checks shared by the line patterns: at least one line (R ≤ ny), the ACS block
 * inside the matrix (acs ≤ ny) and inside the line budget round(ny / R) — the ACS counts in the total,
 * so a budget smaller than the ACS cannot be met (docs/references.md §3.2). A pattern that draws lines at
 * random (`drawsLines`) also needs at least one line left outside the ACS, unless R rounds to full
 * sampling. Returns the budget.
 */
export function checkLineBudget(ny: number, R: number, acs: number, drawsLines: boolean): number {
  if (R > ny) {
    throw new ValidationError({
      field: 'sampling.acceleration',
      message: `${R} leaves less than one of the ${ny} phase-encode lines`,
      allowed: `1 ≤ acceleration ≤ ${ny} (ny)`,
    });
  }
  if (acs > ny) {
    throw new ValidationError({
      field: 'sampling.acs',
      message: `${acs} ACS lines do not fit in ny = ${ny}`,
      allowed: `0 ≤ acs ≤ ${ny} (ny)`,
    });
  }
  const budget = Math.round(ny / R);
  const needed = drawsLines && budget < ny ? acs + 1 : acs;
  if (budget < needed) {
    // round(ny/R) ≥ needed ⇔ ny/R ≥ needed − ½ (Math.round rounds halves up).
    const maxR = ny / (needed - 0.5);
    const what =
      needed > acs ? `the ${acs} ACS lines and at least one line drawn at random` : `the ${acs} ACS lines`;
    const problems: FieldProblem[] = [
      {
        field: 'sampling.acceleration',
        message: `round(ny / R) = ${budget} lines cannot hold ${what}`,
        allowed: `1 ≤ acceleration ≤ ${formatBound(maxR)} (with acs = ${acs}, ny = ${ny})`,
      },
      {
        field: 'sampling.acs',
        message: `${acs} ACS lines leave no room in the ${budget} lines of R = ${R}`,
        allowed: `0 ≤ acs ≤ ${Math.max(0, budget - (needed - acs))} (round(ny / R) = ${budget})`,
      },
    ];
    throw new ValidationError(problems);
  }
  return budget;
}

/** A bound for an error message, 4 significant digits, rounded down so that it is safe to use. */
export function formatBound(x: number): string {
  const digits = 10 ** (3 - Math.floor(Math.log10(Math.abs(x))));
  return String(Math.floor(x * digits) / digits);
}

/** Expands per-row flags (length ny) into a full ny×nx mask with its line bookkeeping. */
export function lineMask(
  nx: number,
  ny: number,
  rows: Uint8Array,
  info: { pattern: string; requested: number | null; acs: number; seed: number | null },
): SampledMask {
  const mask = new Uint8Array(nx * ny);
  let lines = 0;
  for (let r = 0; r < ny; r++) {
    if (rows[r] === 0) continue;
    lines++;
    mask.fill(1, r * nx, (r + 1) * nx);
  }
  return cartesianSampledMask({
    nx,
    ny,
    mask,
    pattern: info.pattern,
    requested: info.requested,
    acquired: { count: lines, unit: 'lines' },
    total: ny,
    acs: info.acs > 0 ? { lines: info.acs } : null,
    seed: info.seed,
  });
}
