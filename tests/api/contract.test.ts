import { readFileSync } from 'node:fs';
import SwaggerParser from '@apidevtools/swagger-parser';
import { describe, expect, it } from 'vitest';
import { parse } from 'yaml';
import { generateOpenapiYaml, openapiPath } from '../../scripts/openapi-file.ts';
import { loadSpec, sharedTestApp } from './helpers.ts';

const methods = ['get', 'post', 'put', 'patch', 'delete'];

/** fastify `/v1/results/:id/:image.png` → OpenAPI `/v1/results/{id}/{image}.png`. */
function template(url: string): string {
  return url.replace(/:([A-Za-z0-9_]+)/g, '{$1}');
}

describe('the OpenAPI 3.1 contract (openapi.yaml)', () => {
  const t = sharedTestApp();

  it('is a valid OpenAPI 3.1.0 document per @apidevtools/swagger-parser (docs/references.md §10.6)', async () => {
    const document = parse(readFileSync(openapiPath, 'utf8'));
    expect(document.openapi).toBe('3.1.0');
    await expect(SwaggerParser.validate(document)).resolves.toBeTruthy();
  });

  it('is not stale: regenerating from the route schemas gives the committed file (run `npm run openapi`)', async () => {
    expect(await generateOpenapiYaml()).toBe(readFileSync(openapiPath, 'utf8'));
  });

  it('GET /openapi.yaml serves the committed contract', async () => {
    const res = await t.http().get('/openapi.yaml');
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^application\/yaml/);
    expect(res.text).toBe(readFileSync(openapiPath, 'utf8'));
  });

  it('served routes and spec operations are equal in both directions', async () => {
    const spec = await loadSpec();
    const served = new Set(
      t.app.services.routes
        // HEAD mirrors GET; hidden routes are the /docs viewer and the web page's static files.
        .filter((r) => r.method !== 'HEAD' && r.method !== 'OPTIONS' && (!r.hidden || r.url === '/'))
        .map((r) => `${r.method} ${template(r.url)}`),
    );
    const documented = new Set<string>();
    for (const [path, item] of Object.entries(spec.paths)) {
      for (const method of Object.keys(item))
        if (methods.includes(method)) documented.add(`${method.toUpperCase()} ${path}`);
    }
    expect(
      [...served].filter((r) => !documented.has(r)),
      'served but not documented',
    ).toEqual([]);
    expect(
      [...documented].filter((r) => !served.has(r)),
      'documented but not served',
    ).toEqual([]);
    // Every route of the v1 table in docs/design.md §4.2 is in both.
    const designTable = [
      'GET /health',
      'GET /openapi.yaml',
      'GET /',
      'GET /v1/phantoms',
      'GET /v1/phantoms/{name}',
      'POST /v1/phantoms/{name}/kspace',
      'POST /v1/images',
      'GET /v1/images/{id}',
      'DELETE /v1/images/{id}',
      'POST /v1/masks',
      'POST /v1/reconstructions',
      'GET /v1/results/{id}/{image}.png',
      'POST /v1/scan-time',
      'POST /v1/plans',
      'GET /v1/plans/{id}',
      'GET /v1/plans/{id}/table.csv',
      'GET /v1/plans/{id}/events',
      'DELETE /v1/plans/{id}',
      'GET /problems/{name}',
    ];
    for (const route of designTable) expect(served.has(route), route).toBe(true);
  });

  it('GET /docs serves the interactive viewer from this server (no external script or style URLs)', async () => {
    const page = await t.http().get('/docs');
    expect(page.status).toBe(200);
    expect(page.headers['content-type']).toMatch(/^text\/html/);
    expect(page.text).toMatch(/swagger-ui/i);
    expect(page.text).toContain('<title>k-space planner API</title>');
    expect(page.text).not.toMatch(/(src|href)="https?:\/\//);
    const script = /src="([^"]*swagger-ui-bundle\.js)"/.exec(page.text);
    expect(script).not.toBeNull();
    const bundle = await t.http().get(script![1]);
    expect(bundle.status).toBe(200);
    const json = await t.http().get('/docs/json');
    expect(json.status).toBe(200);
    expect(json.body.openapi).toBe('3.1.0');
  });
});
