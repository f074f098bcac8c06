import { readFileSync } from 'node:fs';
import { describe, it } from 'vitest';
import { expectProblem, sharedTestApp } from './helpers.ts';

/**
 * A file over MAX_UPLOAD_BYTES sent by fetch (undici's FormData, whose chunks can end exactly at
 * the limit) is a 413 on `file`, never a cut file decoded as damaged (RFC 9110 §15.5.14).
 */
describe('upload limit through fetch', () => {
  const fixture = readFileSync(new URL('../fixtures/ismrmrd/shepp-logan-4coil.h5', import.meta.url));
  const limit = 4 * 2 ** 20;
  const t = sharedTestApp({ limits: { maxUploadBytes: limit } });

  it('POST /v1/raw with a valid ISMRMRD file padded to three times the limit: 413 naming file', async () => {
    // Cut at the limit, the file would still be the whole valid fixture (padding follows it).
    const padded = Buffer.alloc(3 * limit);
    fixture.copy(padded);
    await t.app.listen({ port: 0, host: '127.0.0.1' });
    const address = t.app.server.address();
    const port = typeof address === 'object' && address ? address.port : 0;
    const form = new FormData();
    form.append('file', new Blob([padded]), 'raw.h5');
    const res = await fetch(`http://127.0.0.1:${port}/v1/raw`, { method: 'POST', body: form });
    const text = await res.text();
    expectProblem(
      {
        status: res.status,
        headers: { 'content-type': res.headers.get('content-type') ?? '' },
        body: JSON.parse(text),
        text,
      },
      413,
      'file',
    );
  });
});
