import { ValidationError } from '../core/errors.ts';
import { SeededRandom } from '../core/random.ts';
import { checkLesionSpec, type Lesion, type LesionSpec } from './lesion.ts';

/**
 * Margins (our choice, pixels): a lesion centre keeps every pixel within `edgeClearance` of it
 * inside the object (the lesion's radius plus half a diameter of background, at least 3 px), and
 * two centres are at least `separation` apart (two diameters of background between discs, at
 * least 8 px), so one lesion's response barely reaches another's disc.
 */
export function lesionMargins(diameter: number): { edgeClearance: number; separation: number } {
  return { edgeClearance: Math.max(diameter, 3), separation: Math.max(3 * diameter, 8) };
}

/**
 * Draws `spec.count` lesion centres on pixel centres inside the object (a ny×nx 0/1 mask) with the
 * margins above: the eligible pixels are shuffled by SeededRandom(spec.seed) (Fisher–Yates) and
 * taken in that order when far enough from those already chosen. The amplitude is
 * contrast × `meanIntensity` (the object's mean, DEVELOPERS.md "Feature fidelity"). Too crowded an
 * object is a ValidationError on `lesions.count` with the number that fitted.
 */
export function placeLesions(
  objectMask: Uint8Array,
  nx: number,
  ny: number,
  meanIntensity: number,
  spec: LesionSpec,
): Lesion[] {
  checkLesionSpec(spec);
  const { separation } = lesionMargins(spec.diameter);
  const candidates = lesionCandidates(objectMask, nx, ny, spec.diameter);
  const eligible: number[] = [];
  for (let i = 0; i < candidates.length; i++) if (candidates[i]) eligible.push(i);
  const rng = new SeededRandom(spec.seed);
  for (let i = eligible.length - 1; i > 0; i--) {
    const j = rng.integer(i + 1);
    const t = eligible[i];
    eligible[i] = eligible[j];
    eligible[j] = t;
  }
  const lesions: Lesion[] = [];
  const amplitude = spec.contrast * meanIntensity;
  for (const index of eligible) {
    if (lesions.length === spec.count) break;
    const row = Math.floor(index / nx);
    const col = index - row * nx;
    const clear = lesions.every((l) => (l.row - row) ** 2 + (l.col - col) ** 2 >= separation * separation);
    if (clear) lesions.push({ row, col, diameter: spec.diameter, amplitude, shape: spec.shape });
  }
  if (lesions.length < spec.count) {
    throw new ValidationError({
      field: 'lesions.count',
      message: `only ${lesions.length} lesions of diameter ${spec.diameter} px could be placed inside the object with the margins`,
      allowed:
        lesions.length > 0
          ? `count ≤ ${lesions.length} (or a smaller diameter)`
          : 'a smaller diameter (the object has no room for one lesion with its margins)',
    });
  }
  return lesions;
}

/**
 * Where a lesion of this diameter may be centred: object pixels whose every pixel within the edge
 * clearance is object too (the object eroded by a disc). False lesions are counted over the same
 * region, so edge artefacts that no lesion could sit on are not called lesions.
 */
export function lesionCandidates(
  objectMask: Uint8Array,
  nx: number,
  ny: number,
  diameter: number,
): Uint8Array {
  const { edgeClearance } = lesionMargins(diameter);
  const reach = Math.ceil(edgeClearance);
  const ring: number[] = [];
  for (let dr = -reach; dr <= reach; dr++) {
    for (let dc = -reach; dc <= reach; dc++) {
      if (dr * dr + dc * dc <= edgeClearance * edgeClearance) ring.push(dr, dc);
    }
  }
  const out = new Uint8Array(nx * ny);
  for (let row = reach; row < ny - reach; row++) {
    for (let col = reach; col < nx - reach; col++) {
      if (!objectMask[row * nx + col]) continue;
      let inside = true;
      for (let k = 0; k < ring.length && inside; k += 2) {
        inside = objectMask[(row + ring[k]) * nx + col + ring[k + 1]] === 1;
      }
      if (inside) out[row * nx + col] = 1;
    }
  }
  return out;
}
