import { describe, expect, it } from 'vitest';
import { expectProblem, sharedTestApp } from './helpers.ts';
import { rawRequest } from './raw-http.ts';

// Every error is application/problem+json with `status` equal to the HTTP status (RFC 9457 §3.1.4),
// also those raised before a route runs. Status codes: RFC 9110 §15.5.1 (400), §15.5.15 (414);
// RFC 6585 §5 (431). Node's default header limit (16 KiB, `--max-http-header-size`) is from its docs.

describe('errors raised by the router and by the HTTP parser are RFC 9457 problems', () => {
  const t = sharedTestApp();

  it.each([
    [
      '400 for a URL that is not valid percent-encoding (RFC 3986 §2.1), naming url',
      'GET /v1/images/%zz HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n',
      'url',
    ],
    [
      '400 for a Content-Length that is not a number, written by the clientError handler',
      'POST /v1/scan-time HTTP/1.1\r\nHost: x\r\nContent-Type: application/json\r\nContent-Length: ten\r\n\r\n{}',
      'request',
    ],
    [
      '400 for two different Content-Length values (RFC 9112 §6.3)',
      'POST /v1/scan-time HTTP/1.1\r\nHost: x\r\nContent-Type: application/json\r\n' +
        'Content-Length: 2\r\nContent-Length: 3\r\n\r\n{}',
      'request',
    ],
  ])('%s', async (_title, raw, field) => {
    expectProblem(await rawRequest(t.app, raw), 400, field);
  });

  it('414 for a path segment longer than the ids the service issues, naming url', async () => {
    const res = await rawRequest(
      t.app,
      `GET /v1/images/${'a'.repeat(5000)} HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n`,
    );
    const problem = expectProblem(res, 414, 'url');
    expect(problem.type).toBe('/problems/uri-too-long');
    // The path itself is not echoed back whole.
    expect(res.body.length).toBeLessThan(2000);
  });

  it('an id of up to 200 characters still reaches the route (404 naming id)', async () => {
    const res = await t.http().get(`/v1/images/${'a'.repeat(200)}`);
    expectProblem(res, 404, 'id');
  });

  it('414 for a URL beyond the parser limit (the request line alone fills it), from the clientError handler', async () => {
    const res = await rawRequest(
      t.app,
      `GET /v1/images/${'a'.repeat(40_000)} HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n`,
    );
    expectProblem(res, 414, 'url');
    expect(res.body.length).toBeLessThan(2000);
  });

  it('431 for headers beyond the parser limit, written by the clientError handler', async () => {
    const res = await rawRequest(
      t.app,
      `GET /health HTTP/1.1\r\nHost: x\r\nX-Padding: ${'p'.repeat(20_000)}\r\n\r\n`,
    );
    const problem = expectProblem(res, 431, 'headers');
    expect(problem.type).toBe('/problems/headers-too-large');
  });

  it('the service keeps answering after the refused connections', async () => {
    const res = await t.http().get('/health');
    expect(res.status).toBe(200);
    expect(res.body.status).toBe('ok');
  });
});
