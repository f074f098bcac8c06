import type { RealImage } from '../core/real-image.ts';
import type { WorkerPool } from '../jobs/worker-pool.ts';
import { greyPng } from '../render/png.ts';

/** Which raster of a phantom: ny×nx pixels, each the mean of supersample² point samples. */
export interface RasterRequest {
  name: string;
  nx: number;
  ny: number;
  supersample: number;
}

/** Phantom rasters and exact k-space, computed on the worker pool (never on the event loop). */
export class PhantomService {
  constructor(private readonly deps: { pool: WorkerPool }) {}

  raster({ name, nx, ny, supersample }: RasterRequest, signal?: AbortSignal): Promise<RealImage> {
    return this.deps.pool.runForRequest('phantom-raster', { name, nx, ny, supersample }, signal);
  }

  /** The raster as a 16-bit grey PNG, normalised to its peak so the PNG uses its full range. */
  async rasterPng(request: RasterRequest, signal?: AbortSignal): Promise<Buffer> {
    return greyPng(await this.raster(request, signal), { bits: 16 });
  }

  /** Interleaved [re, im] of the exact transform at each (kx[i], ky[i]). */
  kspace(name: string, kx: Float64Array, ky: Float64Array, signal?: AbortSignal): Promise<Float64Array> {
    return this.deps.pool.runForRequest('phantom-kspace', { name, kx, ky }, signal);
  }
}
