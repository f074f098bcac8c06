import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { buildApp } from '../src/app.ts';

/** The committed contract: openapi.yaml at the repository root. */
export const openapiPath = fileURLToPath(new URL('../openapi.yaml', import.meta.url));

/** The OpenAPI document the route schemas produce, as YAML (what GET /openapi.yaml serves). */
export async function generateOpenapiYaml(): Promise<string> {
  const dataDir = mkdtempSync(join(tmpdir(), 'kspace-openapi-'));
  const app = await buildApp({ dataDir, workers: 1 });
  try {
    return app.swagger({ yaml: true });
  } finally {
    await app.close();
    rmSync(dataDir, { recursive: true, force: true });
  }
}

// `npm run openapi` (`npx tsx scripts/openapi-file.ts`) regenerates openapi.yaml after a schema change.
if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  writeFileSync(openapiPath, await generateOpenapiYaml());
  process.stdout.write(`wrote ${openapiPath}\n`);
}
