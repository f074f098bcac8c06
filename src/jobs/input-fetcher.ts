import type { RealImage } from '../core/real-image.ts';
import type { CoilMaps } from '../encoding/index.ts';
import { fromWireJson } from './wire-json.ts';

/** Where a worker process finds the uploads its cells name: the service, with the worker key. */
export interface InputSource {
  /** SERVICE_URL: the service's base URL as the workers reach it. */
  serviceUrl: string;
  /** WORKER_KEY: needed when the service has API_KEYS. */
  workerKey?: string;
}

/** The worker routes (routes/worker-inputs.ts) that answer an upload as wire JSON. */
export function workerInputPath(kind: 'images' | 'coil-maps', id: string): string {
  return `/internal/worker/${kind}/${encodeURIComponent(id)}`;
}

/** Uploads kept per worker process; a plan names at most one image and a few coil-map sets. */
const CACHE_ENTRIES = 16;

/**
 * Fetches each upload once and keeps it (a plan's cells share one image), so a plan's thousand
 * cells cost one download per worker process.
 */
export class InputFetcher {
  private readonly cache = new Map<string, Promise<unknown>>();

  constructor(private readonly source: InputSource | undefined) {}

  image(id: string): Promise<RealImage> {
    return this.cached('images', id) as Promise<RealImage>;
  }

  coilMaps(id: string): Promise<CoilMaps> {
    return this.cached('coil-maps', id) as Promise<CoilMaps>;
  }

  private cached(kind: 'images' | 'coil-maps', id: string): Promise<unknown> {
    const key = `${kind}/${id}`;
    let entry = this.cache.get(key);
    if (!entry) {
      entry = this.fetchInput(kind, id);
      // A failed fetch is not kept: the retry fetches again.
      entry.catch(() => this.cache.delete(key));
      this.cache.set(key, entry);
      while (this.cache.size > CACHE_ENTRIES) this.cache.delete(this.cache.keys().next().value as string);
    }
    return entry;
  }

  private async fetchInput(kind: 'images' | 'coil-maps', id: string): Promise<unknown> {
    if (!this.source) throw new Error(`this cell needs upload ${id}: start the worker with SERVICE_URL`);
    const headers: Record<string, string> = this.source.workerKey
      ? { 'x-api-key': this.source.workerKey }
      : {};
    const response = await fetch(new URL(workerInputPath(kind, id), this.source.serviceUrl), { headers });
    if (!response.ok) throw new Error(`fetching ${kind} ${id} from the service answered ${response.status}`);
    return fromWireJson(await response.text());
  }
}
