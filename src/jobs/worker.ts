/**
 * Worker-thread entry (piscina): runs one CPU-heavy task off the service's event loop. Engine
 * modules are imported on first use, so a worker starts fast and loads only what its tasks need.
 * Engine errors come back as data (WorkerFailure) and are rebuilt as typed errors by the pool.
 */
import { CancelledError, LimitError, ValidationError } from '../core/errors.ts';
import type { RealImage } from '../core/real-image.ts';
import { DecodeError } from '../io/decode-error.ts';
import type { UploadedPixels, WorkerReply, WorkerTask } from './tasks.ts';

function imageLoader(uploaded: UploadedPixels | undefined): (id: string) => Promise<RealImage> {
  return async (id: string) => {
    if (uploaded && uploaded.id === id) return uploaded.image;
    throw new ValidationError({ field: 'source.imageId', message: `no uploaded image ${id}` });
  };
}

async function run(task: WorkerTask): Promise<unknown> {
  switch (task.kind) {
    case 'decode': {
      const { decodeImage } = await import('../io/decode-image.ts');
      const bytes = Buffer.from(task.bytes.buffer, task.bytes.byteOffset, task.bytes.byteLength);
      return decodeImage(bytes, task.options);
    }
    case 'phantom-kspace': {
      const { getPhantom } = await import('../phantoms/index.ts');
      return getPhantom(task.name).kspaceAt(task.kx, task.ky);
    }
    case 'phantom-raster': {
      const { getPhantom } = await import('../phantoms/index.ts');
      const phantom = getPhantom(task.name);
      return phantom.rasterize(
        task.nx,
        task.ny,
        task.supersample ? { supersample: task.supersample } : undefined,
      );
    }
    case 'mask': {
      const { resolveSampling, maskDiagnostics } = await import('../../sampling/index.ts');
      const sampled = await resolveSampling(task.matrix, task.sampling as never, task.limits);
      return { sampled, diagnostics: task.diagnostics ? maskDiagnostics(sampled) : null };
    }
    case 'reconstruction': {
      const { runReconstruction } = await import('../pipeline/run-reconstruction.ts');
      const { maskDiagnostics } = await import('../../sampling/index.ts');
      const outcome = await runReconstruction(task.request as never, task.seed, {
        loadImage: imageLoader(task.image),
        limits: task.limits,
      });
      return { outcome, diagnostics: maskDiagnostics(outcome.sampled) };
    }
    case 'validate-plan': {
      // Draws every pattern × R mask once: at large matrices that is real work, so not on the event loop.
      const { validatePlan } = await import('../plan/index.ts');
      return validatePlan(task.body, { limits: task.limits, checkMasks: true });
    }
    case 'cell': {
      const { runCell } = await import('../plan/index.ts');
      return runCell(task.plan as never, task.cell as never, {
        loadImage: imageLoader(task.image),
        limits: task.limits,
      });
    }
  }
}

export default async function runTask(task: WorkerTask): Promise<WorkerReply<unknown>> {
  try {
    return { ok: true, value: await run(task) };
  } catch (error) {
    if (error instanceof LimitError)
      return { ok: false, error: { kind: 'limit', message: error.message, problems: error.problems } };
    if (error instanceof ValidationError) {
      return { ok: false, error: { kind: 'validation', message: error.message, problems: error.problems } };
    }
    if (error instanceof CancelledError)
      return { ok: false, error: { kind: 'cancelled', message: 'cancelled', problems: [] } };
    if (error instanceof DecodeError) {
      return {
        ok: false,
        error: {
          kind: 'decode',
          message: error.message,
          problems: [{ field: error.field, message: error.message }],
        },
      };
    }
    const message = error instanceof Error ? `${error.name}: ${error.message}` : String(error);
    return { ok: false, error: { kind: 'internal', message, problems: [] } };
  }
}
