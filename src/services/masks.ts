import { z } from 'zod';
import {
  type MaskDiagnostics,
  orderedSampleTable,
  type SampledMask,
  type SampleOrdering,
  type SampleTable,
  type SamplingSpec,
  sampleTable,
  sampleTableCsv,
  sampleTableJson,
} from '../../sampling/index.ts';
import type { Limits } from '../core/limits.ts';
import type { Matrix } from '../core/matrix.ts';
import type { Store } from '../jobs/store.ts';
import type { WorkerPool } from '../jobs/worker-pool.ts';
import { greyPng, maskPng } from '../render/png.ts';
import type { Caller } from './caller.ts';
import { contentId } from './content-id.ts';
import { resultImageUrl } from './result-images.ts';
import { psfSummary, psfSummarySchema, sampledSummary, sampledSummarySchema } from './sampled-summary.ts';

/** Stored beside a mask's PNGs: its sample table (served by GET /v1/masks/{id}/table.csv|.json). */
const TABLE_CSV = 'table.csv';
const TABLE_JSON = 'table.json';

/** The stored JSON sample table (sampleTableJson), as far as reordering reads it. */
interface StoredTableJson {
  unit: SampleTable['unit'];
  count: number;
  samples: number[][];
}

/** A drawn mask as stored and answered: its summary, PSF side lobes and the URLs of its two PNGs. */
export const maskResultSchema = sampledSummarySchema.extend({
  id: z.string().describe('Result id: the PNGs stay available under /v1/results/{id}/'),
  psf: psfSummarySchema,
  images: z
    .object({ mask: z.string(), psf: z.string() })
    .describe('URLs of the mask and |PSF| (log scale) PNGs'),
  tables: z
    .object({ csv: z.string(), json: z.string() })
    .describe('URLs of the sample table in acquisition order (GET /v1/masks/{id}/table.csv|.json)'),
});

export type MaskResult = z.infer<typeof maskResultSchema>;

export interface MaskRequest {
  matrix: Matrix;
  sampling: SamplingSpec;
}

/** Draws masks on the worker pool; the described ones are stored with their PNGs for the caller. */
export class MaskService {
  constructor(private readonly deps: { pool: WorkerPool; store: Store; limits: Limits }) {}

  /** The mask alone as an 8-bit PNG (255 = acquired); nothing is stored. */
  async png(request: MaskRequest, signal?: AbortSignal): Promise<Buffer> {
    const { sampled } = await this.draw(request, false, signal);
    return maskPng(sampled);
  }

  /**
   * The mask's summary and PSF, stored with both PNGs. Masks are a pure function of the request, so
   * equal requests share one id and one stored result (per tenant under isolation: the owner digest
   * joins the id, undefined otherwise).
   */
  async describe(request: MaskRequest, caller: Caller, signal?: AbortSignal): Promise<MaskResult> {
    const { store } = this.deps;
    const { matrix, sampling } = request;
    const { owner, scope } = caller;
    // 'mask-tables': masks stored before sample tables existed keep their own ids.
    const id = contentId('mask-tables', { matrix, sampling, owner: scope === 'all' ? undefined : owner });
    const stored = store.getResult(id, scope);
    if (stored) return stored.body as MaskResult;
    const { sampled, diagnostics } = await this.draw(request, true, signal);
    const psf = diagnostics!;
    const body: MaskResult = {
      id,
      ...sampledSummary(sampled),
      psf: psfSummary(psf),
      images: { mask: resultImageUrl(id, 'mask'), psf: resultImageUrl(id, 'psf') },
      tables: { csv: `/v1/masks/${id}/table.csv`, json: `/v1/masks/${id}/table.json` },
    };
    const table = sampleTable(sampled);
    const files = {
      mask: await maskPng(sampled),
      psf: await greyPng(psf.psf, { scale: 'log' }),
      [TABLE_CSV]: Buffer.from(sampleTableCsv(table)),
      [TABLE_JSON]: Buffer.from(JSON.stringify(sampleTableJson(sampled, table))),
    };
    store.putResult(id, 'mask', body, files, { owner });
    return body;
  }

  /**
   * The stored sample table of a described mask (docs/design.md §4.7), CSV or JSON; undefined for
   * an unknown id, another tenant's mask or a result that is not a mask.
   */
  table(
    id: string,
    format: 'csv' | 'json',
    caller: Caller,
    ordering: SampleOrdering = 'linear',
  ): Buffer | { notCartesian: true } | undefined {
    const { store } = this.deps;
    if (store.getResult(id, caller.scope)?.kind !== 'mask') return undefined;
    if (ordering === 'linear') {
      return store.getResultImage(id, format === 'csv' ? TABLE_CSV : TABLE_JSON, caller.scope);
    }
    // Other orders are the stored (linear) table's rows permuted: nothing to draw again.
    const stored = store.getResultImage(id, TABLE_JSON, caller.scope);
    if (!stored) return undefined;
    const json = JSON.parse(stored.toString('utf8')) as StoredTableJson;
    if (json.unit !== 'grid index') return { notCartesian: true };
    const linear: SampleTable = {
      columns: ['order', 'ky', 'kx'],
      unit: 'grid index',
      ordering: 'linear',
      values: Float64Array.from(json.samples.flat()),
      count: json.count,
    };
    const table = orderedSampleTable(linear, ordering);
    if (format === 'csv') return Buffer.from(sampleTableCsv(table));
    const samples: number[][] = [];
    for (let i = 0; i < table.values.length; i += 3) {
      samples.push([table.values[i], table.values[i + 1], table.values[i + 2]]);
    }
    return Buffer.from(JSON.stringify({ ...json, ordering, samples }));
  }

  private draw(
    { matrix, sampling }: MaskRequest,
    diagnostics: boolean,
    signal?: AbortSignal,
  ): Promise<{ sampled: SampledMask; diagnostics: MaskDiagnostics | null }> {
    return this.deps.pool.runForRequest(
      'mask',
      { matrix, sampling, limits: this.deps.limits, diagnostics },
      signal,
    );
  }
}
