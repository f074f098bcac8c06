import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SeededRandom } from '../../src/core/random.ts';
import { debianFile } from '../io/debian-files.ts';
import { type TestApp, testApp } from './helpers.ts';

/**
 * A bounded, seeded fuzz of every route with malformed requests: bad JSON, wrong types, huge and
 * non-finite numbers, deep nesting, long strings, unknown keys, corrupt PNG/DICOM/NIfTI uploads and
 * malformed multipart bodies. The contract (RFC 9457, RFC 9110 §15): no answer ≥ 500, every 4xx is
 * application/problem+json whose `status` equals the HTTP status, and the service keeps answering
 * /health. Limits are set small so that a mutation that happens to be valid stays cheap.
 */

const REQUESTS = 1200;

interface FuzzRequest {
  method: 'get' | 'post' | 'delete';
  url: string;
  contentType?: string;
  body?: string | Buffer;
  label: string;
}

const validBodies: Record<string, unknown> = {
  '/v1/masks': {
    matrix: { nx: 32, ny: 32 },
    sampling: { pattern: 'poisson-disc', acceleration: 3, acs: 8, seed: 1, density: { power: 2 } },
  },
  '/v1/reconstructions': {
    source: { phantom: 'shepp-logan-modified' },
    matrix: { nx: 24, ny: 24 },
    sampling: { pattern: 'cartesian-random', acceleration: 2, acs: 4, seed: 1 },
    noise: { snr: 40 },
    method: { name: 'cs-tv', iterations: 5 },
  },
  '/v1/scan-time': {
    matrix: { nx: 64, ny: 64 },
    protocol: { trMs: 500, echoTrainLength: 4, slices: 4 },
    sampling: { pattern: 'radial', acceleration: 2, angles: 'golden' },
  },
  '/v1/plans': {
    source: { phantom: 'shepp-logan-modified' },
    matrix: { nx: 16, ny: 16 },
    protocol: { trMs: 500 },
    patterns: [{ pattern: 'cartesian-uniform', acs: 4 }],
    accelerations: [2],
    methods: [{ name: 'zero-filled' }],
    seeds: 1,
    target: { metric: 'ssim', atLeast: 0.9 },
  },
  '/v1/phantoms/shepp-logan-modified/kspace': {
    points: [
      [0, 0],
      [0.5, -1],
    ],
  },
};

const strangeValues: unknown[] = [
  null,
  true,
  -1,
  0,
  1e308,
  -1e308,
  5e-324,
  2 ** 53 + 1,
  1.5,
  '',
  'NaN',
  'Infinity',
  '1e999',
  'x'.repeat(20_000),
  '\u0000\uffff\ud800',
  '../../etc/passwd',
  [],
  [1, 2, 3],
  {},
  { __proto__: { polluted: true } },
  { constructor: { prototype: { polluted: true } } },
];

function deepNest(depth: number, open: string, close: string): string {
  return open.repeat(depth) + close.repeat(depth);
}

/** Every leaf path of a JSON value, so a mutation can reach any field. */
function leafPaths(value: unknown, prefix: Array<string | number> = []): Array<Array<string | number>> {
  if (value === null || typeof value !== 'object') return [prefix];
  const entries = Array.isArray(value) ? Array.from(value, (v, i) => [i, v] as const) : Object.entries(value);
  const paths: Array<Array<string | number>> = [prefix];
  for (const [key, child] of entries) paths.push(...leafPaths(child, [...prefix, key]));
  return paths;
}

function mutate(random: SeededRandom, body: unknown): unknown {
  const copy = structuredClone(body) as Record<string | number, unknown>;
  const paths = leafPaths(copy).filter((p) => p.length > 0);
  if (paths.length === 0) return strangeValues[Math.floor(random.uniform() * strangeValues.length)];
  const path = paths[Math.floor(random.uniform() * paths.length)];
  let parent = copy;
  for (const key of path.slice(0, -1)) parent = parent[key] as Record<string | number, unknown>;
  const last = path[path.length - 1];
  const choice = random.uniform();
  if (choice < 0.2) delete parent[last];
  else if (choice < 0.3)
    (parent as Record<string, unknown>)[`unknown${Math.floor(random.uniform() * 9)}`] = 1;
  else parent[last] = strangeValues[Math.floor(random.uniform() * strangeValues.length)];
  return copy;
}

function pick<T>(random: SeededRandom, items: readonly T[]): T {
  return items[Math.floor(random.uniform() * items.length)];
}

function corrupt(random: SeededRandom, bytes: Buffer): Buffer {
  const out = Buffer.from(bytes);
  const mode = random.uniform();
  if (mode < 0.3) return out.subarray(0, Math.floor(random.uniform() * out.length));
  const flips = 1 + Math.floor(random.uniform() * 16);
  // Headers matter most: aim most flips at the first 512 bytes.
  for (let f = 0; f < flips; f++) {
    const span = random.uniform() < 0.8 ? Math.min(512, out.length) : out.length;
    out[Math.floor(random.uniform() * span)] = Math.floor(random.uniform() * 256);
  }
  return out;
}

function multipart(boundary: string, file: Buffer, filename: string, extra = ''): Buffer {
  return Buffer.concat([
    Buffer.from(
      `--${boundary}\r\n${extra}Content-Disposition: form-data; name="file"; filename="${filename}"\r\n` +
        'Content-Type: application/octet-stream\r\n\r\n',
    ),
    file,
    Buffer.from(`\r\n--${boundary}--\r\n`),
  ]);
}

function uploadRequest(random: SeededRandom, files: Record<string, Buffer>): FuzzRequest {
  const [name, bytes] = pick(random, Object.entries(files));
  const file = corrupt(random, bytes);
  const boundary = `b${Math.floor(random.uniform() * 1e9)}`;
  const shape = random.uniform();
  const body = multipart(boundary, file, name);
  if (shape < 0.6) {
    return {
      method: 'post',
      url: '/v1/images',
      contentType: `multipart/form-data; boundary=${boundary}`,
      body,
      label: `corrupt ${name}`,
    };
  }
  if (shape < 0.7)
    return {
      method: 'post',
      url: '/v1/images',
      contentType: 'multipart/form-data',
      body,
      label: 'no boundary',
    };
  if (shape < 0.8) {
    return {
      method: 'post',
      url: '/v1/images',
      contentType: 'multipart/form-data; boundary=other',
      body,
      label: 'mismatched boundary',
    };
  }
  if (shape < 0.9) {
    return {
      method: 'post',
      url: '/v1/images',
      contentType: `multipart/form-data; boundary=${boundary}`,
      body: body.subarray(0, Math.floor(random.uniform() * body.length)),
      label: 'cut-off multipart',
    };
  }
  return {
    method: 'post',
    url: '/v1/images',
    contentType: 'application/json',
    body: '{"file":1}',
    label: 'upload as JSON',
  };
}

function jsonRequest(random: SeededRandom): FuzzRequest {
  const url = pick(random, Object.keys(validBodies));
  const shape = random.uniform();
  let text: string;
  let label: string;
  if (shape < 0.55) {
    let body = validBodies[url];
    const rounds = 1 + Math.floor(random.uniform() * 3);
    for (let r = 0; r < rounds; r++) body = mutate(random, body);
    text = JSON.stringify(body);
    label = 'mutated body';
  } else if (shape < 0.65) {
    const full = JSON.stringify(validBodies[url]);
    text = full.slice(0, Math.floor(random.uniform() * full.length));
    label = 'truncated JSON';
  } else if (shape < 0.72) {
    text = deepNest(2000 + Math.floor(random.uniform() * 20_000), '[', ']');
    label = 'deep array nesting';
  } else if (shape < 0.78) {
    text = `${deepNest(5000, '{"a":', '}').replace(/}+$/, '')}1${'}'.repeat(5000)}`;
    label = 'deep object nesting';
  } else if (shape < 0.84) {
    text = pick(random, ['', 'null', '[]', '"x"', '1e999', '{"a":1,}', "{'a':1}", '\u0000', 'true']);
    label = 'not an object';
  } else if (shape < 0.9) {
    text = JSON.stringify({ ...(validBodies[url] as object), padding: 'y'.repeat(200_000) });
    label = 'long string field';
  } else {
    return {
      method: 'post',
      url,
      contentType: pick(random, [
        'text/plain',
        'application/xml',
        'application/x-www-form-urlencoded',
        'image/png',
      ]),
      body: JSON.stringify(validBodies[url]),
      label: 'wrong content type',
    };
  }
  return { method: 'post', url, contentType: 'application/json', body: text, label };
}

function pathRequest(random: SeededRandom): FuzzRequest {
  const id = pick(random, [
    'x',
    'x'.repeat(500),
    'x'.repeat(5000),
    '%zz',
    '%',
    '%00',
    '..%2f..%2fetc',
    '%F0%9F%92%A9',
    "'; drop table plans; --",
    '00000000-0000-0000-0000-000000000000',
  ]);
  const template = pick(random, [
    ['get', `/v1/images/${id}`],
    ['delete', `/v1/images/${id}`],
    ['get', `/v1/reconstructions/${id}`],
    ['get', `/v1/results/${id}/reconstruction.png`],
    ['get', `/v1/results/x/${id}.png`],
    ['get', `/v1/plans/${id}`],
    ['delete', `/v1/plans/${id}`],
    ['get', `/v1/plans/${id}/table.csv`],
    ['get', `/v1/phantoms/${id}`],
    ['get', `/v1/phantoms/shepp-logan-modified?nx=${id}&ny=-3`],
    ['get', `/problems/${id}`],
    ['get', `/web/${id}`],
  ] as const);
  return { method: template[0], url: template[1], label: 'bad path or id' };
}

describe('fuzz: malformed requests never give a 5xx (seeded, bounded)', () => {
  let t: TestApp;
  const files: Record<string, Buffer> = {};
  beforeAll(async () => {
    t = await testApp({
      limits: { maxMatrixSide: 64, maxIterations: 20, maxPlanCells: 8, maxUploadBytes: 512 * 1024 },
      maxQueuedPlans: 4,
      logger: false,
    });
    // Open files from Debian's python3-pydicom and python3-nibabel (MIT; see tests/io/debian-files.ts).
    files['MR_small.dcm'] = debianFile('pydicom', 'MR_small.dcm');
    files['MR_small_RLE.dcm'] = debianFile('pydicom', 'MR_small_RLE.dcm');
    files['anatomical.nii'] = debianFile('nibabel', 'anatomical.nii');
    files['example_nifti2.nii.gz'] = debianFile('nibabel', 'example_nifti2.nii.gz');
    files['camera64.png'] = readFileSync(new URL('../fixtures/io/camera64.png', import.meta.url));
    files['ramp16-le.tif'] = readFileSync(new URL('../fixtures/io/ramp16-le.tif', import.meta.url));
  });
  afterAll(async () => t.close());

  it(`${REQUESTS} requests: no status ≥ 500, every 4xx problem+json, /health still answers`, async () => {
    const random = new SeededRandom(20261202);
    // Worker threads share this process, so its RSS covers the decoders and engines too.
    const rssBefore = process.memoryUsage().rss;
    const failures: string[] = [];
    const statuses = new Map<number, number>();
    for (let n = 0; n < REQUESTS; n++) {
      const kind = random.uniform();
      const req =
        kind < 0.5 ? jsonRequest(random) : kind < 0.8 ? uploadRequest(random, files) : pathRequest(random);
      let call = t.http()[req.method](req.url);
      if (req.contentType) call = call.set('content-type', req.contentType);
      const res = req.body === undefined ? await call : await call.send(req.body);
      statuses.set(res.status, (statuses.get(res.status) ?? 0) + 1);
      if (res.status >= 500)
        failures.push(`${req.label} ${req.method} ${req.url.slice(0, 80)} → ${res.status}`);
      else if (res.status >= 400) {
        const type = String(res.headers['content-type'] ?? '');
        if (!type.startsWith('application/problem+json') || res.body?.status !== res.status) {
          failures.push(`${req.label} ${req.method} ${req.url.slice(0, 80)} → ${res.status} as ${type}`);
        }
      }
    }
    // One line per kind of failure (the long ids would otherwise repeat), all of them shown.
    const kinds = [...new Set(failures.map((line) => line.replace(/x{20,}/g, 'x…').replace(/%\S*/g, '%…')))];
    expect(kinds).toEqual([]);
    // The generator really did produce both refusals and some accepted requests.
    const refused = [...statuses].filter(([s]) => s >= 400).reduce((sum, [, c]) => sum + c, 0);
    expect(refused).toBeGreaterThan(REQUESTS / 2);
    expect((await t.http().get('/health')).status).toBe(200);
    const growthMb = (process.memoryUsage().rss - rssBefore) / 2 ** 20;
    const mb = (bytes: number) => (bytes / 2 ** 20).toFixed(0);
    console.info(
      `fuzz: ${REQUESTS} requests, statuses ${JSON.stringify([...statuses].sort())}, ` +
        `RSS ${mb(rssBefore)} → ${mb(process.memoryUsage().rss)} MB`,
    );
    // Bounded decompression and limits keep hostile inputs from holding memory (hardening issue: < 200 MB).
    expect(growthMb).toBeLessThan(200);
  }, 600_000);
});
