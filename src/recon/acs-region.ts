import { ValidationError } from '../core/errors.ts';

/** A fully sampled block of k-space rows × columns containing the centre (⌊ny/2⌋, ⌊nx/2⌋). */
export interface AcsBlock {
  rowStart: number;
  rows: number;
  colStart: number;
  cols: number;
}

/**
 * The largest fully sampled rectangle of the mask that contains the k-space centre: the
 * auto-calibration (ACS) region of an auto-calibrating acquisition (Griswold et al. 2002; a
 * centred block of lines or a centred square, docs/references.md §3.2). For each row the run of
 * acquired columns through the centre column is measured; over every span of rows through the
 * centre row the block is as wide as the narrowest of those runs, and the span of largest area
 * wins (ties: more rows). Null when the centre itself was not acquired. O(ny² + ny·nx).
 */
export function findAcsBlock(mask: Uint8Array, nx: number, ny: number): AcsBlock | null {
  if (mask.length !== nx * ny) throw new RangeError(`mask must hold ny·nx = ${nx * ny} entries`);
  const cy = Math.floor(ny / 2);
  const cx = Math.floor(nx / 2);
  if (!mask[cy * nx + cx]) return null;
  // left[i], right[i]: acquired columns of row i from the centre column outwards (−1: centre missing).
  const left = new Int32Array(ny);
  const right = new Int32Array(ny);
  for (let i = 0; i < ny; i++) {
    const row = i * nx;
    if (!mask[row + cx]) {
      left[i] = -1;
      right[i] = -1;
      continue;
    }
    let l = 0;
    while (cx - l - 1 >= 0 && mask[row + cx - l - 1]) l++;
    let r = 0;
    while (cx + r + 1 < nx && mask[row + cx + r + 1]) r++;
    left[i] = l;
    right[i] = r;
  }
  let best: AcsBlock | null = null;
  let bestArea = 0;
  let upLeft = left[cy];
  let upRight = right[cy];
  for (let top = cy; top >= 0 && left[top] >= 0; top--) {
    upLeft = Math.min(upLeft, left[top]);
    upRight = Math.min(upRight, right[top]);
    let l = upLeft;
    let r = upRight;
    for (let bottom = cy; bottom < ny && left[bottom] >= 0; bottom++) {
      l = Math.min(l, left[bottom]);
      r = Math.min(r, right[bottom]);
      const rows = bottom - top + 1;
      const area = rows * (l + r + 1);
      if (area > bestArea || (area === bestArea && best && rows > best.rows)) {
        bestArea = area;
        best = { rowStart: top, rows, colStart: cx - l, cols: l + r + 1 };
      }
    }
  }
  return best;
}

/**
 * The ACS block of the mask, refused (ValidationError naming `sampling.acs`) when it has fewer
 * than `minRows` rows or `minCols` columns: the method calibrates from it and cannot without it.
 */
export function requireAcsBlock(
  mask: Uint8Array,
  nx: number,
  ny: number,
  minRows: number,
  minCols: number,
  method: string,
): AcsBlock {
  const block = findAcsBlock(mask, nx, ny);
  if (!block || block.rows < minRows || block.cols < minCols) {
    const found = block
      ? `${block.rows} rows × ${block.cols} columns`
      : 'none (the k-space centre was not acquired)';
    throw new ValidationError({
      field: 'sampling.acs',
      message: `${method} calibrates from a fully sampled centred block (ACS) of at least ${minRows} rows × ${minCols} columns; the mask has ${found}`,
      allowed: `acs ≥ ${minRows} lines (a centred block of fully sampled phase-encode lines)`,
    });
  }
  return block;
}
