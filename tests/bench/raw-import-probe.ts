import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildApp } from '../../src/app.ts';
import { readRawKspace } from '../../src/io/ismrmrd/read-raw-kspace.ts';
import { medianMs } from './timing.ts';

/**
 * One raw-import measurement in a fresh process, so its peak resident set is the import's own:
 * `read` times readRawKspace in this thread; `post` times POST /v1/raw on a service with one
 * worker thread (the import runs there). Prints { medianMs, peakRssMiB, baselineRssMiB } as JSON.
 * Run by raw-import.bench.ts: tsx tests/bench/raw-import-probe.ts read|post FILE
 */
const [mode, path] = process.argv.slice(2);
const bytes = new Uint8Array(readFileSync(path));
const mib = (kib: number) => kib / 1024;
const baselineRssMiB = mib(process.resourceUsage().maxRSS);
let median: number;
if (mode === 'read') {
  median = await medianMs(() => readRawKspace(bytes), 3, 1);
} else {
  const dataDir = mkdtempSync(join(tmpdir(), 'kspace-bench-raw-'));
  // The generator's 32-coil 256² file (≈ 81 MiB) is above the default 64 MiB MAX_UPLOAD_BYTES.
  const app = await buildApp({ dataDir, workers: 1, limits: { maxUploadBytes: 256 * 2 ** 20 } });
  try {
    await app.listen({ port: 0, host: '127.0.0.1' });
    const address = app.server.address();
    const url = `http://127.0.0.1:${typeof address === 'object' && address ? address.port : 0}/v1/raw`;
    median = await medianMs(
      async () => {
        const form = new FormData();
        form.append('file', new Blob([bytes]), 'raw.h5');
        const res = await fetch(url, { method: 'POST', body: form });
        if (res.status !== 201) throw new Error(`raw import refused: ${res.status} ${await res.text()}`);
        await res.arrayBuffer();
      },
      3,
      1,
    );
  } finally {
    await app.close();
    rmSync(dataDir, { recursive: true, force: true });
  }
}
console.log(
  JSON.stringify({ medianMs: median, peakRssMiB: mib(process.resourceUsage().maxRSS), baselineRssMiB }),
);
