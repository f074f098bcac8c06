import type { ScoredOutcome, VolumeTaskInputs } from '../jobs/tasks.ts';
import type { WorkerPool } from '../jobs/worker-pool.ts';
import { joinPlanes, splitPlanes } from '../volume/plane-reconstruction.ts';

/**
 * A volume reconstruction on the worker pool, the event loop only passing data along: one task
 * acquires the volume and splits it into planes, the planes go out in one contiguous run per
 * thread (each reconstructed and scored there), and one task stacks and scores the volume.
 * The k-space of the planes is not sent back for the last step: it needs only the references.
 */
export async function volumeOnPool(
  pool: WorkerPool,
  input: VolumeTaskInputs,
  signal?: AbortSignal,
): Promise<ScoredOutcome> {
  const prepared = await pool.runForRequest('volume-prepare', input, signal);
  const runs = splitPlanes(prepared.batch, pool.size);
  const results = await Promise.all(
    runs.map((batch) => pool.run('volume-planes', { batch, limits: input.limits }, signal)),
  );
  const withoutKspace = { ...prepared, batch: { ...prepared.batch, inputs: [] } };
  return pool.run('volume-finish', { prepared: withoutKspace, planes: joinPlanes(results) }, signal);
}
