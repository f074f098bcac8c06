/** Where a cell or row sits in a plan's grid. The reference row has no pattern or method index. */
export interface GridPosition {
  reference: boolean;
  patternIndex: number | null;
  /** Index into the plan's accelerations; null for the reference row and custom masks. */
  accelerationIndex: number | null;
  methodIndex: number | null;
  /** Index into the plan's coilArrays; absent or 0 for the first (the reference row uses it). */
  coilIndex?: number;
  /** Index into a volume plan's acquisitions; absent or 0 for the first (the reference row uses it). */
  acquisitionIndex?: number;
}

/**
 * Stable row id: 'reference', 'p0-r2-m1' (pattern 0, accelerations[2], methods[1]), 'p3-m0' (custom
 * mask), with '-c1' appended for coilArrays[1] (nothing for the first array, so plans without
 * coilArrays keep their keys) and '-a1' for a volume plan's acquisitions[1] (likewise).
 */
export function rowKey(position: GridPosition): string {
  if (position.reference) return 'reference';
  const r = position.accelerationIndex === null ? '' : `-r${position.accelerationIndex}`;
  const c = position.coilIndex ? `-c${position.coilIndex}` : '';
  const a = position.acquisitionIndex ? `-a${position.acquisitionIndex}` : '';
  return `p${position.patternIndex}${r}-m${position.methodIndex}${c}${a}`;
}
