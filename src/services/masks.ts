import { z } from 'zod';
import type { MaskDiagnostics, SampledMask, SamplingSpec } from '../../sampling/index.ts';
import type { Limits } from '../core/limits.ts';
import type { Matrix } from '../core/matrix.ts';
import type { Store } from '../jobs/store.ts';
import type { WorkerPool } from '../jobs/worker-pool.ts';
import { greyPng, maskPng } from '../render/png.ts';
import type { Caller } from './caller.ts';
import { contentId } from './content-id.ts';
import { resultImageUrl } from './result-images.ts';
import { psfSummary, psfSummarySchema, sampledSummary, sampledSummarySchema } from './sampled-summary.ts';

/** A drawn mask as stored and answered: its summary, PSF side lobes and the URLs of its two PNGs. */
export const maskResultSchema = sampledSummarySchema.extend({
  id: z.string().describe('Result id: the PNGs stay available under /v1/results/{id}/'),
  psf: psfSummarySchema,
  images: z
    .object({ mask: z.string(), psf: z.string() })
    .describe('URLs of the mask and |PSF| (log scale) PNGs'),
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
    const id = contentId('mask', { matrix, sampling, owner: scope === 'all' ? undefined : owner });
    const stored = store.getResult(id, scope);
    if (stored) return stored.body as MaskResult;
    const { sampled, diagnostics } = await this.draw(request, true, signal);
    const psf = diagnostics!;
    const body: MaskResult = {
      id,
      ...sampledSummary(sampled),
      psf: psfSummary(psf),
      images: { mask: resultImageUrl(id, 'mask'), psf: resultImageUrl(id, 'psf') },
    };
    const pngs = { mask: await maskPng(sampled), psf: await greyPng(psf.psf, { scale: 'log' }) };
    store.putResult(id, 'mask', body, pngs, { owner });
    return body;
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
