import type { SampledMask, SamplingSpec } from '../../sampling/index.ts';
import type { Limits } from '../core/limits.ts';
import type { Matrix } from '../core/matrix.ts';
import type { WorkerPool } from '../jobs/worker-pool.ts';
import { type Protocol, type ScanTime, scanTime } from '../protocol/index.ts';

/** The scan-time model (src/protocol) for a protocol, fully sampled or with a mask drawn on the pool. */
export class ScanTimeService {
  constructor(private readonly deps: { pool: WorkerPool; limits: Limits }) {}

  async compute(matrix: Matrix, protocol: Protocol, sampling?: SamplingSpec): Promise<ScanTime> {
    let sampled: SampledMask | undefined;
    if (sampling) {
      ({ sampled } = await this.deps.pool.runForRequest('mask', {
        matrix,
        sampling,
        limits: this.deps.limits,
        diagnostics: false,
      }));
    }
    return scanTime(matrix, protocol, sampled);
  }
}
