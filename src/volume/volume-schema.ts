import { z } from 'zod';

/**
 * How a volume (matrix.nz > 1) is acquired (docs/design.md §2.5):
 * - '3d': one 3D Cartesian acquisition, readout along x fully sampled, the pattern drawn on the
 *   ky–kz plane (ny rows × nz columns); each x-plane of hybrid space is reconstructed as a 2D problem.
 * - 'multi-slice': nz separate 2D acquisitions of the z-slices (ky rows × kx columns), one pattern
 *   drawn once and used for every slice.
 */
export const volumeAcquisitionSchema = z
  .enum(['3d', 'multi-slice'])
  .describe(
    "for a volume (matrix.nz > 1): '3d' undersamples the ky–kz plane of one 3D acquisition (default); " +
      "'multi-slice' acquires each z-slice as its own 2D acquisition with the same ky–kx pattern " +
      "(not for 3D raw data, which are '3d' only)",
  );

export type VolumeAcquisitionMode = z.infer<typeof volumeAcquisitionSchema>;
