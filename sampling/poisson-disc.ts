import { type FieldProblem, throwIfAborted, ValidationError } from '../src/core/errors.ts';
import type { Matrix } from '../src/core/matrix.ts';
import { SeededRandom } from '../src/core/random.ts';
import { formatBound } from './cartesian-lines.ts';
import { cartesianSampledMask, centredBlockStart, type SampledMask } from './sampled-mask.ts';
import type { PoissonDiscSpec } from './schema.ts';
import { seededPatternSettings } from './seed.ts';
import { inclusionProbabilities } from './unequal-probability-sampling.ts';

export const DEFAULT_POISSON_POWER = 2;
/** Candidates tried around an active sample before it is retired (Bridson 2007: k = 30 typical). */
export const CANDIDATES_PER_SAMPLE = 30;
/** The radius scale is searched until the actual R is within this relative error of the request. */
export const TARGET_RELATIVE_ERROR = 0.01;
const MAX_SCALE_STEPS = 16;
/** The search also stops when the bracket [low, high] of the scale is this narrow (count jumps there). */
const MIN_BRACKET_RATIO = 1 + 1e-4;
/**
 * Samples per r² that this dart throwing reaches, the starting guess of the scale search: measured
 * on 128²–320², R 2–12, power 2 (0.65 for random disc packing left the scale 4–9 % too high).
 */
const PACKING_DENSITY = 0.57;

/**
 * Radius law of the variable-density Poisson-disc pattern, in grid units:
 *   r(k) = s · g(k),   g(k) = (1 + ρ)^(p/2),   ρ = √(((u − ⌊nx/2⌋)/(nx/2))² + ((v − ⌊ny/2⌋)/(ny/2))²)
 * (u column, v row; ρ = 1 at the middle of each edge, √2 in the corners). The local density of
 * samples goes as 1/r² ∝ (1 + ρ)^(−p), so p is the fall-off power (0.5 ≤ p ≤ 8, schema.ts says why).
 * Two samples a and b are never closer than (r(a) + r(b))/2 (discs of radius r/2 do not overlap);
 * ACS points count as samples for the samples around them but not among themselves.
 */
export function poissonRadiusProfile(nx: number, ny: number, power: number): Float64Array {
  const g = normalisedRadius(nx, ny);
  for (let i = 0; i < g.length; i++) g[i] = (1 + g[i]) ** (power / 2);
  return g;
}

/** Integer offsets (dx, dy) with dx² + dy² < reach², sorted by distance, nearest first. */
function neighbourOffsets(reach: number): { dx: Int32Array; dy: Int32Array; d2: Float64Array } {
  const m = Math.ceil(reach);
  const list: [number, number, number][] = [];
  for (let dy = -m; dy <= m; dy++) {
    for (let dx = -m; dx <= m; dx++) {
      const d2 = dx * dx + dy * dy;
      if (d2 > 0 && d2 < reach * reach) list.push([dx, dy, d2]);
    }
  }
  list.sort((a, b) => a[2] - b[2]);
  return {
    dx: Int32Array.from(list, (e) => e[0]),
    dy: Int32Array.from(list, (e) => e[1]),
    d2: Float64Array.from(list, (e) => e[2]),
  };
}

/** Normalised distance ρ of every grid point from the k-space centre (see the radius law). */
function normalisedRadius(nx: number, ny: number): Float64Array {
  const rho = new Float64Array(nx * ny);
  const cx = Math.floor(nx / 2);
  const cy = Math.floor(ny / 2);
  for (let v = 0; v < ny; v++) {
    const dy = (v - cy) / (ny / 2);
    for (let u = 0; u < nx; u++) {
      const dx = (u - cx) / (nx / 2);
      rho[v * nx + u] = Math.sqrt(dx * dx + dy * dy);
    }
  }
  return rho;
}

/** Reusable state of dart-throwing runs on a fixed matrix, radius law and ACS. */
class DartThrower {
  readonly mask: Uint8Array;
  private readonly active: Int32Array;
  private readonly reach2: Float64Array;
  private readonly rho: Float64Array;
  private readonly gMax: number;

  constructor(
    private readonly nx: number,
    private readonly ny: number,
    private readonly g: Float64Array,
    private readonly power: number,
    private readonly acs: number,
  ) {
    this.mask = new Uint8Array(nx * ny);
    this.active = new Int32Array(nx * ny);
    this.reach2 = new Float64Array(nx * ny);
    this.rho = normalisedRadius(nx, ny);
    let gMax = 0;
    for (let i = 0; i < g.length; i++) if (g[i] > gMax) gMax = g[i];
    this.gMax = gMax;
  }

  /**
   * Squared search radius around each grid point c: a sample q conflicts with c only if
   * d < (r(c) + r(q))/2 ≤ D0 = (r(c) + r_max)/2, and then ρ(q) ≤ ρ(c) + D0/(min(nx, ny)/2), which
   * bounds r(q) and so gives a tighter D = (r(c) + r(q)_max)/2 (the radius law grows with ρ).
   */
  private prepareReach(scale: number): number {
    const { g, rho, reach2 } = this;
    const rMax = scale * this.gMax;
    const half = Math.min(this.nx, this.ny) / 2;
    const exponent = this.power / 2;
    let largest = 0;
    for (let i = 0; i < g.length; i++) {
      const rc = scale * g[i];
      const d0 = (rc + rMax) / 2;
      const rq = Math.min(rMax, scale * (1 + rho[i] + d0 / half) ** exponent);
      const d = (rc + rq) / 2;
      reach2[i] = d * d;
      if (d > largest) largest = d;
    }
    // No two grid points are farther apart than the diagonal.
    return Math.min(largest, Math.hypot(this.nx, this.ny) + 1);
  }

  /**
   * Bridson 2007 dart throwing on the integer grid with the radius law above and scale s: an active
   * sample p proposes up to k candidates uniformly (by area) in the annulus [ρ, 2ρ], ρ = max(r(p), 1),
   * rounded to the nearest grid point; a candidate c is accepted if no sample q lies closer than (r(c) + r(q))/2.
   * Starts from the ACS square's border (or the k-space centre when there is no ACS). Returns the
   * number of sampled points, ACS included; the mask is left in `this.mask`.
   */
  run(scale: number, seed: number): number {
    const { nx, ny, g, mask, active, reach2 } = this;
    const rng = new SeededRandom(seed);
    const offsets = neighbourOffsets(this.prepareReach(scale));
    const { dx: offX, dy: offY, d2: offD2 } = offsets;
    const nOffsets = offD2.length;
    mask.fill(0);
    let activeCount = 0;
    let count = 0;
    const acs = this.acs;
    if (acs > 0) {
      const r0 = centredBlockStart(ny, acs);
      const c0 = centredBlockStart(nx, acs);
      for (let v = r0; v < r0 + acs; v++) {
        for (let u = c0; u < c0 + acs; u++) {
          const i = v * nx + u;
          mask[i] = 1;
          count++;
          if (v === r0 || v === r0 + acs - 1 || u === c0 || u === c0 + acs - 1) active[activeCount++] = i;
        }
      }
    } else {
      const centre = Math.floor(ny / 2) * nx + Math.floor(nx / 2);
      mask[centre] = 1;
      count = 1;
      active[activeCount++] = centre;
    }
    const toUnit = 1 / 4294967296;
    while (activeCount > 0) {
      const slot = rng.integer(activeCount);
      const p = active[slot];
      const px = p % nx;
      const py = (p - px) / nx;
      // Below one grid step every neighbour is far enough, so candidates need to reach at least
      // the neighbours (an annulus inside one step would round back onto p itself).
      const rp = Math.max(scale * g[p], 1);
      let accepted = false;
      for (let attempt = 0; attempt < CANDIDATES_PER_SAMPLE; attempt++) {
        // 32 random bits each are ample for a radius and an angle on a grid of ≤ 2^16 points a side.
        const distance = rp * Math.sqrt(1 + 3 * rng.nextUint32() * toUnit);
        const angle = 2 * Math.PI * rng.nextUint32() * toUnit;
        const cu = Math.round(px + distance * Math.cos(angle));
        const cv = Math.round(py + distance * Math.sin(angle));
        if (cu < 0 || cu >= nx || cv < 0 || cv >= ny) continue;
        const c = cv * nx + cu;
        if (mask[c] !== 0) continue;
        const rc = scale * g[c];
        const limit2 = reach2[c];
        let free = true;
        for (let o = 0; o < nOffsets; o++) {
          const d2 = offD2[o];
          if (d2 >= limit2) break;
          const qu = cu + offX[o];
          const qv = cv + offY[o];
          if (qu < 0 || qu >= nx || qv < 0 || qv >= ny) continue;
          const q = qv * nx + qu;
          if (mask[q] === 0) continue;
          const limit = (rc + scale * g[q]) / 2;
          if (d2 < limit * limit) {
            free = false;
            break;
          }
        }
        if (free) {
          mask[c] = 1;
          count++;
          active[activeCount++] = c;
          accepted = true;
          break;
        }
      }
      if (!accepted) active[slot] = active[--activeCount];
    }
    return count;
  }
}

function checkPoissonRequest(nx: number, ny: number, R: number, acs: number): number {
  const total = nx * ny;
  if (R > total) {
    throw new ValidationError({
      field: 'sampling.acceleration',
      message: `${R} leaves less than one of the ${total} grid points`,
      allowed: `1 ≤ acceleration ≤ ${total} (nx·ny)`,
    });
  }
  const side = Math.min(nx, ny);
  if (acs > side) {
    throw new ValidationError({
      field: 'sampling.acs',
      message: `an ${acs}×${acs} ACS square does not fit in ${ny}×${nx}`,
      allowed: `0 ≤ acs ≤ ${side} (min(nx, ny))`,
    });
  }
  const target = Math.round(total / R);
  if (target < total && acs * acs >= target) {
    const maxAcs = Math.floor(Math.sqrt(target - 1));
    const problems: FieldProblem[] = [
      {
        field: 'sampling.acs',
        message: `the ${acs}×${acs} ACS square uses all round(nx·ny / R) = ${target} points, leaving none to draw`,
        allowed: `0 ≤ acs ≤ ${maxAcs} (acs² < round(nx·ny / R))`,
      },
      {
        field: 'sampling.acceleration',
        message: `R = ${R} leaves no points outside the ACS square`,
        allowed: `1 ≤ acceleration ≤ ${formatBound(total / (acs * acs + 0.5))} (nx·ny / (acs² + ½), acs = ${acs})`,
      },
    ];
    throw new ValidationError(problems);
  }
  return target;
}

/**
 * Variable-density Poisson-disc sampling of the whole ny×nx plane (the phase-encode plane of a 3D
 * acquisition) with a fully sampled central acs×acs square. The radius scale s is searched — secant
 * steps on log count against log s inside a bisection bracket — until the acquired count is within
 * TARGET_RELATIVE_ERROR of round(nx·ny / R); the closest run found is kept and its relative count
 * error reported. With little or no density fall-off (power ≲ 1) every disc has nearly the same
 * radius, the grid makes the count jump as the radius crosses √(integer), and some R cannot be met
 * closely: the actual R says so. Every run is seeded with the request's seed, so the same request
 * gives the same mask. An aborted `signal` stops the search between runs (CancelledError).
 */
export function poissonDiscMask(matrix: Matrix, spec: PoissonDiscSpec, signal?: AbortSignal): SampledMask {
  const { nx, ny } = matrix;
  const settings = seededPatternSettings(spec, 'poisson-disc', DEFAULT_POISSON_POWER);
  const { acceleration: R, acs, seed, power } = settings;
  const target = checkPoissonRequest(nx, ny, R, acs);
  const total = nx * ny;
  const g = poissonRadiusProfile(nx, ny, power);

  let mask: Uint8Array;
  let count: number;
  let scale = 0;
  let steps = 0;
  if (target >= total) {
    mask = new Uint8Array(total).fill(1);
    count = total;
  } else {
    const thrower = new DartThrower(nx, ny, g, power, acs);
    let inverseSquareSum = 0;
    for (let i = 0; i < total; i++) inverseSquareSum += 1 / (g[i] * g[i]);
    scale = Math.sqrt((PACKING_DENSITY * inverseSquareSum) / target);
    let low = 0; // largest scale known to give too many points
    let high = Number.POSITIVE_INFINITY; // smallest scale known to give too few
    let bestScale = scale;
    let bestError = Number.POSITIVE_INFINITY;
    let best = new Uint8Array(0);
    let bestCount = 0;
    let previous: { scale: number; n: number } | null = null;
    for (steps = 1; steps <= MAX_SCALE_STEPS; steps++) {
      throwIfAborted(signal);
      const n = thrower.run(scale, seed);
      const error = n / target - 1;
      if (Math.abs(error) < Math.abs(bestError)) {
        bestError = error;
        bestScale = scale;
        bestCount = n;
        best = thrower.mask.slice();
      }
      if (Math.abs(error) <= TARGET_RELATIVE_ERROR) break;
      if (error > 0) low = Math.max(low, scale);
      else high = Math.min(high, scale);
      if (low > 0 && high / low < MIN_BRACKET_RATIO) break;
      // Secant step in log–log (count ∝ scale^−a locally, a = 2 until two runs are known) …
      let exponent = 2;
      if (previous && previous.n !== n && previous.scale !== scale) {
        const measured = -Math.log(n / previous.n) / Math.log(scale / previous.scale);
        if (measured > 0.2 && measured < 20) exponent = measured;
      }
      previous = { scale, n };
      let next = scale * (n / target) ** (1 / exponent);
      // … kept inside the bracket, else geometric bisection (or doubling / halving while one side is open).
      if (!(next > low && next < high)) {
        if (low > 0 && Number.isFinite(high)) next = Math.sqrt(low * high);
        else next = Number.isFinite(high) ? high / 2 : 2 * low;
      }
      scale = next;
    }
    steps = Math.min(steps, MAX_SCALE_STEPS);
    scale = bestScale;
    count = bestCount;
    mask = best;
  }

  // Expected local sampling probability ∝ 1/r², scaled to the drawn count, 1 inside the ACS.
  const density = new Float64Array(total);
  const weights = new Float64Array(total);
  for (let i = 0; i < total; i++) weights[i] = 1 / (g[i] * g[i]);
  const acsRow = centredBlockStart(ny, acs);
  const acsCol = centredBlockStart(nx, acs);
  for (let v = acsRow; v < acsRow + acs; v++) weights.fill(0, v * nx + acsCol, v * nx + acsCol + acs);
  const outerProbabilities = inclusionProbabilities(weights, Math.min(count - acs * acs, total - acs * acs));
  density.set(outerProbabilities);
  for (let v = acsRow; v < acsRow + acs; v++) density.fill(1, v * nx + acsCol, v * nx + acsCol + acs);

  return cartesianSampledMask({
    nx,
    ny,
    mask,
    pattern: 'poisson-disc',
    requested: R,
    acquired: { count, unit: 'points' },
    total,
    acs: acs > 0 ? { size: [acs, acs] } : null,
    seed,
    density,
    details: {
      radiusLaw: 'r = s*(1 + rho)^(p/2) grid units; rho = normalised |k|; min distance (r(a) + r(b))/2',
      radiusScale: scale,
      densityPower: power,
      scaleSearchSteps: steps,
      relativeCountError: count / target - 1,
    },
  });
}
