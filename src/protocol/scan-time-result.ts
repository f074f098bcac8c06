import { z } from 'zod';
import { acquiredUnitSchema } from '../../sampling/index.ts';

/** What the scan-time model returns (POST /v1/scan-time answers with it; plan tables embed it). */
export const scanTimeResultSchema = z.object({
  seconds: z.number().describe('acquisition time in seconds (calibration and preparation scans excluded)'),
  formatted: z.string().describe('m:ss, tenths shown when not zero (163.84 s → "2:43.8"), h:mm:ss from 1 h'),
  acquired: z
    .number()
    .describe('count that costs time: phase-encode lines (2D), ky–kz points (3D) or spokes (radial)'),
  unit: acquiredUnitSchema,
  shots: z.int().describe('⌈acquired / echoTrainLength⌉: TRs per pass and per average'),
  passes: z.int().describe('⌈slices / slicesPerPass⌉, slicesPerPass defaulting to slicesPerTr (2D); 1 in 3D'),
  slicesPerTr: z
    .int()
    .describe(
      '2D slices acquired within one TR: ⌊TR / (echoTrainLength × echoSpacingMs + sliceOverheadMs)⌋ with ' +
        'echoSpacingMs, else slicesPerPass (default all slices); 1 in 3D',
    ),
  effectiveTeMs: z
    .number()
    .nullable()
    .describe(
      'time of the echo that acquires the k-space centre, ms (from echoSpacingMs and the ordering, or teMs); ' +
        'null when neither is given',
    ),
});

export type ScanTime = z.infer<typeof scanTimeResultSchema>;
