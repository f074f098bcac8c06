import { z } from 'zod';
import type { VolumeOutcome } from '../pipeline/volume-reconstruction.ts';
import { finiteOrNull } from './json-safe.ts';

const planeScores = z
  .array(z.number().nullable())
  .describe('one per reconstructed plane; null where the reference plane is empty (or PSNR is +∞)');

/** What a reconstruction of a volume answers beside its volume scores (docs/design.md §2.5). */
export const volumeSummarySchema = z
  .object({
    acquisition: z.enum(['3d', 'multi-slice']),
    matrix: z.object({ nx: z.int(), ny: z.int(), nz: z.int() }),
    planeAxis: z
      .enum(['x', 'z'])
      .describe(
        'x: the hybrid-space x-planes of a 3D acquisition (ny × nz); z: the slices of multi-slice (ny × nx)',
      ),
    slices: z
      .object({ nrmse: planeScores, psnr: planeScores, ssim: planeScores, hfen: planeScores })
      .describe('the 2D scores of every plane, in planeAxis order'),
  })
  .describe(
    'volumes (matrix.nz > 1): metrics are over the volume (NRMSE, PSNR over every voxel; SSIM, HFEN the mean ' +
      'over planes with content); images show the central z-slice',
  );

export type VolumeSummary = z.infer<typeof volumeSummarySchema>;

export function volumeSummary(volume: VolumeOutcome): VolumeSummary {
  const plain = (values: (number | null)[]) => values.map((v) => (v === null ? null : finiteOrNull(v)));
  return {
    acquisition: volume.acquisition,
    matrix: volume.matrix,
    planeAxis: volume.planeAxis,
    slices: {
      nrmse: plain(volume.slices.nrmse),
      psnr: plain(volume.slices.psnr),
      ssim: plain(volume.slices.ssim),
      hfen: plain(volume.slices.hfen),
    },
  };
}
