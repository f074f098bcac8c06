import { z } from 'zod';

/**
 * What an acquired count counts: phase-encode lines (Cartesian 2D), k-space points (a 2D point mask,
 * or ky–kz points in 3D) radial spokes or spiral interleaves. Masks, scan times, plan cells and plan rows all use it.
 */
export const acquiredUnitSchema = z.enum(['lines', 'points', 'spokes', 'interleaves']);

export type AcquiredUnit = z.infer<typeof acquiredUnitSchema>;
