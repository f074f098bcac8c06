import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildApp } from '../../src/app.ts';
import { decodeCoilPlanes } from '../../src/io/coil-planes.ts';
import { decodeNiftiCoilMaps } from '../../src/io/nifti-coil-maps.ts';
import { float32Base64 } from '../io/float32-base64.ts';
import { type BenchRow, medianMs } from './timing.ts';

const coils = 32;
const side = 256;

/** Smooth invented maps: 32 coils of 256², as JSON planes. */
function planes() {
  const out: Array<{ re: string; im: string }> = [];
  for (let c = 0; c < coils; c++) {
    const re = new Float32Array(side * side);
    const im = new Float32Array(side * side);
    for (let p = 0; p < re.length; p++) {
      re[p] = Math.sin(p * 1e-3 + c);
      im[p] = Math.cos(p * 2e-3 - c);
    }
    out.push({ re: float32Base64(re), im: float32Base64(im) });
  }
  return { nx: side, ny: side, coils: out };
}

/** The same shape as a NIfTI-1 file, (x, y, 1, coils) complex64 (nifti1.h header offsets). */
function nifti(): Buffer {
  const header = Buffer.alloc(352);
  header.writeInt32LE(348, 0);
  [4, side, side, 1, coils, 1, 1, 1].forEach((d, i) => {
    header.writeInt16LE(d, 40 + 2 * i);
  });
  header.writeInt16LE(32, 70);
  header.writeInt16LE(64, 72);
  header.writeFloatLE(352, 108);
  header.write('n+1\0', 344, 'latin1');
  const data = new Float32Array(2 * coils * side * side);
  for (let p = 0; p < data.length; p++) data[p] = Math.sin(p * 7e-4) + 0.1;
  return Buffer.concat([header, Buffer.from(data.buffer)]);
}

/** Decoding 32 coils of 256² in either form, and the whole POST /v1/coil-maps round trip. */
export async function benchCoilMaps(): Promise<BenchRow[]> {
  const body = planes();
  const file = nifti();
  const bounds = { maxSide: 1024, maxBytes: 64 * 1024 * 1024 };
  const rows: BenchRow[] = [
    {
      name: `decode JSON planes, ${coils}×${side}²`,
      medianMs: await medianMs(() => decodeCoilPlanes(body), 5, 1),
    },
    {
      name: `decode NIfTI complex64, ${coils}×${side}²`,
      medianMs: await medianMs(() => decodeNiftiCoilMaps(file, bounds), 5, 1),
    },
  ];
  const dataDir = mkdtempSync(join(tmpdir(), 'kspace-bench-'));
  const app = await buildApp({ dataDir, workers: 1, maxJsonBytes: 32 * 1024 * 1024 });
  try {
    await app.listen({ port: 0, host: '127.0.0.1' });
    const address = app.server.address();
    const base = `http://127.0.0.1:${typeof address === 'object' && address ? address.port : 0}`;
    const json = JSON.stringify(body);
    const post = async (init: RequestInit) => {
      const res = await fetch(`${base}/v1/coil-maps`, { method: 'POST', ...init });
      if (res.status !== 201) throw new Error(`coil maps refused: ${res.status} ${await res.text()}`);
      await res.arrayBuffer();
    };
    rows.push({
      name: `POST /v1/coil-maps JSON, ${coils}×${side}² (MAX_JSON_BYTES 32 MiB)`,
      medianMs: await medianMs(
        () => post({ headers: { 'content-type': 'application/json' }, body: json }),
        3,
        1,
      ),
      note: `${(json.length / 2 ** 20).toFixed(1)} MiB of JSON`,
    });
    rows.push({
      name: `POST /v1/coil-maps NIfTI, ${coils}×${side}²`,
      medianMs: await medianMs(
        () => {
          const form = new FormData();
          form.append('file', new Blob([new Uint8Array(file)]), 'maps.nii');
          return post({ body: form });
        },
        3,
        1,
      ),
      note: `${(file.length / 2 ** 20).toFixed(1)} MiB file`,
    });
  } finally {
    await app.close();
    rmSync(dataDir, { recursive: true, force: true });
  }
  return rows;
}
