import type { AddressInfo } from 'node:net';
import { connect } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { expectProblem, type TestApp, testApp } from './helpers.ts';

/**
 * The API key is checked on the route the router matched, never on the raw URL string (a hostile
 * client spells the same route many ways). Request targets are written to a raw socket so that no
 * client library normalises them first. Request-target forms: RFC 9112 §3.2 (origin form and
 * absolute form); percent-encoding and dot segments: RFC 3986 §2.1 and §5.2.4.
 */

interface RawResponse {
  status: number;
  contentType: string;
  body: string;
}

function rawRequest(
  port: number,
  target: string,
  headers: Record<string, string> = {},
): Promise<RawResponse> {
  return new Promise((resolve, reject) => {
    const socket = connect(port, '127.0.0.1');
    const chunks: Buffer[] = [];
    const extra = Object.entries(headers)
      .map(([name, value]) => `${name}: ${value}\r\n`)
      .join('');
    socket.on('connect', () => {
      socket.write(`GET ${target} HTTP/1.1\r\nHost: 127.0.0.1\r\n${extra}Connection: close\r\n\r\n`);
    });
    socket.on('data', (chunk) => chunks.push(chunk));
    socket.on('error', reject);
    socket.on('end', () => {
      const text = Buffer.concat(chunks).toString('utf8');
      const [head, ...rest] = text.split('\r\n\r\n');
      const status = Number(/^HTTP\/1\.1 (\d{3})/.exec(head)?.[1] ?? 0);
      const contentType = /\r\ncontent-type: ([^\r]*)/i.exec(head)?.[1] ?? '';
      resolve({ status, contentType, body: rest.join('\r\n\r\n') });
    });
  });
}

/** Spellings of GET /v1/phantoms that a router might decode or normalise to the real route. */
const spellings = [
  '/%761/phantoms',
  '/%76%31/phantoms',
  '/v%31/phantoms',
  '/v1/%70hantoms',
  '/%76%31/%70%68%61%6e%74%6f%6d%73',
  '//v1/phantoms',
  '/v1//phantoms',
  '/x/../v1/phantoms',
  '/./v1/phantoms',
  '/v1/./phantoms',
  '/v1/phantoms/',
  '/v1/phantoms?x=/health',
  'http://x/v1/phantoms',
  'http://x/%761/phantoms',
  'http://127.0.0.1/v1/phantoms',
];

describe('API keys cannot be bypassed by how the URL is spelt', () => {
  let t: TestApp;
  let port: number;
  beforeAll(async () => {
    t = await testApp({ apiKeys: ['k-one'] });
    await t.app.listen({ host: '127.0.0.1', port: 0 });
    port = (t.app.server.address() as AddressInfo).port;
  });
  afterAll(async () => t.close());

  it('the bypasses once reported (percent-encoded v1, absolute form) do reach the route with a key', async () => {
    // Without this the 401s below could come from a route that no spelling reaches at all.
    for (const target of ['/%761/phantoms', 'http://x/v1/phantoms']) {
      const keyed = await rawRequest(port, target, { 'x-api-key': 'k-one' });
      expect(keyed.status, target).toBe(200);
      expect(JSON.parse(keyed.body).phantoms.length).toBeGreaterThan(0);
    }
  });

  it.each(spellings)('%s without a key is never answered with data', async (target) => {
    const res = await rawRequest(port, target);
    expect([400, 401, 404], `${target} → ${res.status}`).toContain(res.status);
    expect(res.contentType).toMatch(/^application\/problem\+json/);
    expect(JSON.parse(res.body).status).toBe(res.status);
    expect(res.body).not.toContain('shepp-logan');
  });

  it('every registered /v1 route answers 401 without a key (the route decides, not its URL)', async () => {
    const v1 = t.app.services.routes.filter(
      (route) => route.url.startsWith('/v1') && route.method !== 'HEAD',
    );
    expect(v1.length).toBeGreaterThanOrEqual(15);
    for (const route of v1) {
      const url = route.url.replace(/:(\w+)/g, 'x');
      const res = await t.http()[route.method.toLowerCase() as 'get' | 'post' | 'delete'](url);
      expectProblem(res, 401, 'x-api-key');
    }
  });

  it('the open routes stay open: /health, the page, its assets, the contract, /docs, problem types', async () => {
    for (const url of [
      '/health',
      '/',
      '/web/app.js',
      '/web/styles.css',
      '/openapi.yaml',
      '/problems/not-found',
    ]) {
      expect((await t.http().get(url)).status, url).toBe(200);
    }
    const docs = await t.http().get('/docs/');
    expect(docs.status).toBe(200);
    expect(docs.text).toContain('<html');
  });
});
