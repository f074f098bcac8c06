/**
 * Worker-thread entry (piscina): runs one CPU-heavy task off the service's event loop. Engine
 * modules are imported on first use, so a worker starts fast and loads only what its tasks need.
 * Engine errors come back as data (WorkerFailure) and are rebuilt as the same classes by the pool.
 */

import type { RawKspace } from '../acquisition/index.ts';
import { toWorkerFailure } from '../core/error-transport.ts';
import { NotFoundError, ValidationError } from '../core/errors.ts';
import type { RealImage } from '../core/real-image.ts';
import type { RealVolume } from '../core/real-volume.ts';
import type { CoilMaps } from '../encoding/index.ts';
import type { ReconstructionOutcome } from '../pipeline/run-reconstruction.ts';
import type {
  ScoredOutcome,
  TaskInput,
  TaskInputs,
  TaskKind,
  TaskOutput,
  UploadedCoilMaps,
  UploadedPixels,
  UploadedRawKspace,
  WorkerReply,
  WorkerTask,
} from './tasks.ts';

function imageLoader(uploaded: UploadedPixels | undefined): (id: string) => Promise<RealImage> {
  return async (id: string) => {
    if (uploaded && uploaded.id === id) return uploaded.image;
    throw new ValidationError({ field: 'source.imageId', message: `no uploaded image ${id}` });
  };
}

function volumeLoader(uploaded: UploadedPixels | undefined): (id: string) => Promise<RealVolume> {
  return async (id: string) => {
    if (uploaded?.volume && uploaded.id === id) return uploaded.volume;
    throw new ValidationError({ field: 'source.imageId', message: `no uploaded volume ${id}` });
  };
}

/** The outcome with its mask diagnostics and the zero-filled image's scores. */
async function scored(outcome: ReconstructionOutcome): Promise<ScoredOutcome> {
  const { maskDiagnostics } = await import('../../sampling/index.ts');
  const { zeroFilledMetrics } = await import('../pipeline/zero-filled-metrics.ts');
  return {
    outcome,
    diagnostics: maskDiagnostics(outcome.sampled),
    zeroFilledMetrics: zeroFilledMetrics(outcome),
  };
}

/** Maps the service loaded for this task (the caller's own, checked there); any other id is a 404. */
function coilMapsLoader(uploaded: UploadedCoilMaps[] | undefined): (id: string) => Promise<CoilMaps> {
  return async (id: string) => {
    const found = uploaded?.find((entry) => entry.id === id);
    if (found) return found.maps;
    throw new NotFoundError({ field: 'coils.mapsId', message: `no uploaded coil maps ${id}` });
  };
}

/** The raw k-space the service loaded for this task (the caller's own, checked there); any other id is a 404. */
function rawLoader(uploaded: UploadedRawKspace | undefined): (id: string) => Promise<RawKspace> {
  return async (id: string) => {
    if (uploaded && uploaded.id === id) return uploaded.raw;
    throw new NotFoundError({ field: 'source.rawId', message: `no imported raw data ${id}` });
  };
}

/** The pipeline's context for a task: loaders that answer only the uploads loaded for it, and its limits. */
function inputContext({ image, coilMaps, raw, limits }: TaskInputs) {
  return {
    loadImage: imageLoader(image),
    loadVolume: volumeLoader(image),
    loadCoilMaps: coilMapsLoader(coilMaps),
    loadRaw: rawLoader(raw),
    limits,
  };
}

/** One handler per task kind; the mapped type keeps each input and output tied to its kind. */
const handlers: { [K in TaskKind]: (input: TaskInput<K>) => Promise<TaskOutput<K>> } = {
  async decode({ bytes, options }) {
    const { decodeImage } = await import('../io/decode-image.ts');
    return decodeImage(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength), options);
  },
  async 'decode-coil-maps'(upload) {
    const { decodeCoilMaps } = await import('../io/decode-coil-maps.ts');
    return decodeCoilMaps(upload);
  },
  async 'read-raw-kspace'({ bytes, limits }) {
    const { importRawKspace } = await import('../io/ismrmrd/import-raw-kspace.ts');
    return importRawKspace(bytes, limits);
  },
  async 'read-acquisition-bundle'({ nifti, header, limits }) {
    const { readAcquisitionBundle } = await import('../io/read-acquisition-bundle.ts');
    return readAcquisitionBundle(nifti, header, limits);
  },
  async 'phantom-kspace'({ name, kx, ky }) {
    const { getPhantom } = await import('../phantoms/index.ts');
    return getPhantom(name).kspaceAt(kx, ky);
  },
  async 'phantom-raster'({ name, nx, ny, supersample }) {
    const { getPhantom } = await import('../phantoms/index.ts');
    return getPhantom(name).rasterize(nx, ny, supersample ? { supersample } : undefined);
  },
  async mask({ matrix, sampling, limits, diagnostics }) {
    const { resolveSampling, maskDiagnostics } = await import('../../sampling/index.ts');
    const sampled = await resolveSampling(matrix, sampling, limits);
    return { sampled, diagnostics: diagnostics ? maskDiagnostics(sampled) : null };
  },
  async reconstruction(input) {
    const { runReconstruction } = await import('../pipeline/run-reconstruction.ts');
    const outcome = await runReconstruction(input.request, input.seed, inputContext(input));
    return scored(outcome);
  },
  async 'volume-prepare'({ request, seed, image, raw, limits }) {
    const { prepareVolume } = await import('../pipeline/volume-reconstruction.ts');
    const { noiseSeedFor } = await import('../pipeline/run-reconstruction.ts');
    const ctx = { loadVolume: volumeLoader(image), loadRaw: rawLoader(raw), limits };
    return prepareVolume(request, seed, ctx, noiseSeedFor);
  },
  async 'volume-planes'({ batch, limits }) {
    const { reconstructPlanes } = await import('../volume/plane-reconstruction.ts');
    return reconstructPlanes(batch, { limits });
  },
  async 'volume-finish'({ prepared, planes }) {
    const { finishVolume } = await import('../pipeline/volume-reconstruction.ts');
    return scored(finishVolume(prepared, planes));
  },
  async 'validate-plan'({ plan, limits }) {
    // Draws every pattern × R mask once: at large matrices that is real work, so not on the event loop.
    // The plan was parsed once at the edge (route or runPlan); here only what needs a computation.
    const { checkPlan } = await import('../plan/index.ts');
    return checkPlan(plan, { limits, checkMasks: true });
  },
  async cell(input) {
    const { plan, cell, keepOutcome } = input;
    const { runCellOutcome } = await import('../plan/index.ts');
    const { result, outcome } = await runCellOutcome(plan, cell, inputContext(input));
    // Only the row's representative (seed 1) pays for diagnostics, zero-filled scores and the transfer.
    return keepOutcome && cell.seed === 1 ? { result, outcome: await scored(outcome) } : { result };
  },
};

function dispatch<K extends TaskKind>(kind: K, input: TaskInput<K>): Promise<TaskOutput<K>> {
  return handlers[kind](input);
}

export default async function runTask(task: WorkerTask): Promise<WorkerReply<TaskKind>> {
  try {
    return { ok: true, value: await dispatch(task.kind, task.input) };
  } catch (error) {
    return { ok: false, error: toWorkerFailure(error) };
  }
}
