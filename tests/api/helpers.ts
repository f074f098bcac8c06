import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Writable } from 'node:stream';
import SwaggerParser from '@apidevtools/swagger-parser';
import { Ajv2020 } from 'ajv/dist/2020.js';
import addFormats from 'ajv-formats';
import type { FastifyInstance } from 'fastify';
import request from 'supertest';
import { afterAll, beforeAll, expect } from 'vitest';
import { openapiPath } from '../../scripts/openapi-file.ts';
import { type AppOptions, buildApp } from '../../src/app.ts';

export interface TestApp {
  app: FastifyInstance;
  dataDir: string;
  /** Every pino line the app wrote. */
  logs: string[];
  http: () => ReturnType<typeof request>;
  close: () => Promise<void>;
}

/** An isolated app on its own temp data directory, one worker, pino logs captured. */
export async function testApp(options: AppOptions = {}): Promise<TestApp> {
  const dataDir = options.dataDir ?? mkdtempSync(join(tmpdir(), 'kspace-api-'));
  const logs: string[] = [];
  const logStream = new Writable({
    write(chunk, _encoding, callback) {
      logs.push(String(chunk));
      callback();
    },
  });
  const app = await buildApp({ workers: 1, logger: { level: 'info' }, logStream, ...options, dataDir });
  return { app, dataDir, logs, http: () => request(app.server), close: () => app.close() };
}

/**
 * One test app for the enclosing describe block (or file): started in its beforeAll, closed in its
 * afterAll. The returned handle reads the running app, so it is used only inside the tests.
 */
export function sharedTestApp(options: AppOptions = {}): TestApp {
  let current: TestApp | undefined;
  beforeAll(async () => {
    current = await testApp(options);
  });
  afterAll(async () => current?.close());
  const running = (): TestApp => {
    if (current === undefined) throw new Error('the shared test app is used before its beforeAll ran');
    return current;
  };
  return {
    get app() {
      return running().app;
    },
    get dataDir() {
      return running().dataDir;
    },
    get logs() {
      return running().logs;
    },
    http: () => running().http(),
    close: () => running().close(),
  };
}

/** The smallest valid reconstruction request: 32×32 Shepp–Logan, uniform lines at R 2, zero-filled. */
export const oneReconstruction = {
  source: { phantom: 'shepp-logan' },
  matrix: { nx: 32, ny: 32 },
  sampling: { pattern: 'cartesian-uniform', acceleration: 2 },
  method: { name: 'zero-filled' },
};

/** The smallest valid plan: 32×32 Shepp–Logan, one uniform pattern at R 2, zero-filled, one seed. */
export const oneCellPlan = {
  source: { phantom: 'shepp-logan' },
  matrix: { nx: 32, ny: 32 },
  protocol: { trMs: 500 },
  patterns: [{ pattern: 'cartesian-uniform' }],
  accelerations: [2],
  methods: [{ name: 'zero-filled' }],
  seeds: 1,
};

type OpenApiDocument = {
  paths: Record<
    string,
    Record<string, { responses: Record<string, { content?: Record<string, { schema: unknown }> }> }>
  >;
};

let specPromise: Promise<OpenApiDocument> | null = null;

/** The committed openapi.yaml, validated by @apidevtools/swagger-parser (OpenAPI 3.1) and dereferenced. */
export function loadSpec(): Promise<OpenApiDocument> {
  specPromise ??= (async () => {
    const text = readFileSync(openapiPath, 'utf8');
    const parsed = (await import('yaml')).parse(text);
    await SwaggerParser.validate(structuredClone(parsed));
    return (await SwaggerParser.dereference(parsed)) as unknown as OpenApiDocument;
  })();
  return specPromise;
}

const ajv = new Ajv2020({ strict: false, allErrors: true });
addFormats.default(ajv);
const compiled = new WeakMap<object, ReturnType<typeof ajv.compile>>();

function specPathFor(spec: OpenApiDocument, url: string): string {
  const path = url.split('?')[0];
  for (const template of Object.keys(spec.paths)) {
    const pattern = new RegExp(`^${template.replace(/[.]/g, '\\.').replace(/\{[^}]+\}/g, '[^/]+')}$`);
    if (pattern.test(path)) return template;
  }
  throw new Error(`no spec path matches ${path}`);
}

/** POSTs `body` as JSON to `path`; the request can still be awaited or extended. */
export function postJson(t: Pick<TestApp, 'http'>, path: string, body: string | object) {
  return t.http().post(path).send(body);
}

/**
 * POSTs `file` under the multipart field "file" with the client's `filename` to an upload route
 * (default /v1/images); the request can still be awaited or extended.
 */
export function uploadFile(t: Pick<TestApp, 'http'>, file: Buffer, filename: string, path = '/v1/images') {
  return t.http().post(path).attach('file', file, filename);
}

/** GET the resource a 201 named in Location: 200, documented, and the very body the POST answered. */
export async function expectStoredCopy(
  t: Pick<TestApp, 'http'>,
  created: { headers: Record<string, string>; body: unknown },
): Promise<void> {
  const location = created.headers.location;
  const stored = await t.http().get(location);
  expect(stored.status).toBe(200);
  await expectDocumented('GET', location, stored);
  expect(stored.body).toEqual(created.body);
}

/**
 * Asserts that a response is documented: its status and media type appear under the operation
 * in openapi.yaml, and a JSON body validates against that schema with ajv's JSON Schema 2020-12
 * (the dialect of OpenAPI 3.1, docs/references.md §10.6).
 */
export async function expectDocumented(
  method: string,
  url: string,
  response: { status: number; headers: Record<string, string>; body: unknown; text?: string },
): Promise<void> {
  const spec = await loadSpec();
  const operation = spec.paths[specPathFor(spec, url)][method.toLowerCase()];
  expect(operation, `${method} ${url} is in the spec`).toBeDefined();
  const documented = operation.responses[String(response.status)];
  expect(documented, `${method} ${url} documents status ${response.status}`).toBeDefined();
  const mediaType = (response.headers['content-type'] ?? '').split(';')[0].trim();
  if (response.status === 204) return;
  const content = documented.content?.[mediaType];
  expect(content, `${method} ${url} ${response.status} documents ${mediaType}`).toBeDefined();
  if (!mediaType.endsWith('json')) return;
  const schema = content!.schema as object;
  let validate = compiled.get(schema);
  if (!validate) {
    validate = ajv.compile(schema);
    compiled.set(schema, validate);
  }
  const body =
    response.text !== undefined && response.text !== '' ? JSON.parse(response.text) : response.body;
  const valid = validate(body);
  expect(valid, `${method} ${url} body matches its schema: ${ajv.errorsText(validate.errors)}`).toBe(true);
}

/** RFC 9457 §3 members plus the service's `errors` list, and the problem media type (docs/references.md §10.4). */
export function expectProblem(
  response: { status: number; headers: Record<string, string>; body: unknown; text: string },
  status: number,
  field?: string,
): {
  type: string;
  title: string;
  status: number;
  detail: string;
  errors: Array<{ field: string; message: string; allowed?: string }>;
} {
  expect(response.status).toBe(status);
  expect(response.headers['content-type']).toMatch(/^application\/problem\+json/);
  const problem = JSON.parse(response.text);
  expect(typeof problem.type).toBe('string');
  expect(typeof problem.title).toBe('string');
  expect(problem.status).toBe(status);
  expect(typeof problem.detail).toBe('string');
  expect(Array.isArray(problem.errors)).toBe(true);
  if (field !== undefined) expect(problem.errors.map((e: { field: string }) => e.field)).toContain(field);
  return problem;
}

function collectBinary(res: NodeJS.ReadableStream, done: (error: Error | null, body: Buffer) => void): void {
  const chunks: Buffer[] = [];
  res.on('data', (chunk: Buffer) => chunks.push(chunk));
  res.on('end', () => done(null, Buffer.concat(chunks)));
}

/** supertest parser that keeps a binary body (PNG) as a Buffer; superagent passes the raw response stream. */
export const binary = collectBinary as unknown as (
  res: request.Response,
  callback: (error: Error | null, body: unknown) => void,
) => void;

/** POSTs a JSON body and asserts the answer is the problem `expectProblem` describes; returns it. */
export async function postProblem(
  t: TestApp,
  path: string,
  body: unknown,
  status: number,
  field?: string,
): Promise<ReturnType<typeof expectProblem>> {
  return expectProblem(await postJson(t, path, body as object), status, field);
}

/** The body of plan `id` once it is done, failed or cancelled (polled every 25 ms, a minute at most). */
export async function finishedPlanBody(t: Pick<TestApp, 'http'>, id: string) {
  for (let i = 0; i < 2400; i++) {
    const res = await t.http().get(`/v1/plans/${id}`);
    if (['done', 'failed', 'cancelled'].includes(res.body.status)) return res.body;
    await new Promise((resolve) => setTimeout(resolve, 25));
  }
  throw new Error(`plan ${id} did not finish in time`);
}
