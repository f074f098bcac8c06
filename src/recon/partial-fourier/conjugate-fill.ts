import type { ComplexImage } from '../../core/complex-image.ts';

/**
 * The conjugate partner of k-space row v and column u on the centred grid: (2·⌊ny/2⌋ − v,
 * 2·⌊nx/2⌋ − u), i.e. −k. On an odd side every index has one; on an even side the index −n/2 (row
 * or column 0) has none, because +n/2 is not on the grid.
 */
export function conjugatePartner(index: number, n: number): number {
  const partner = 2 * Math.floor(n / 2) - index;
  return partner >= 0 && partner < n ? partner : -1;
}

/**
 * Fills the rows before `firstRow` from their conjugate partners: a real-valued object has a
 * Hermitian spectrum, K(−k) = K(k)*, so a missing row is the conjugate of its mirror through the
 * centre (Bernstein, King & Zhou 2004, partial Fourier; docs/references.md §5.6). Points without a
 * partner on the grid (row or column 0 of an even side) stay as they are. Writes `kspace` in place.
 */
export function conjugateFill(kspace: ComplexImage, firstRow: number): ComplexImage {
  const { nx, ny, data } = kspace;
  for (let v = 0; v < firstRow; v++) {
    const pv = conjugatePartner(v, ny);
    if (pv < firstRow) continue; // no partner, or the partner is missing too
    for (let u = 0; u < nx; u++) {
      const pu = conjugatePartner(u, nx);
      if (pu < 0) continue;
      const from = 2 * (pv * nx + pu);
      data[2 * (v * nx + u)] = data[from];
      data[2 * (v * nx + u) + 1] = -data[from + 1];
    }
  }
  return kspace;
}
