import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { buildTable } from '../../src/plan/build-table.ts';
import { cellResultSchema } from '../../src/plan/cell-result.ts';
import { planTableSchema } from '../../src/plan/plan-table.ts';
import { planSchema } from '../../src/plan/schema.ts';
import { protocolSchema } from '../../src/protocol/schema.ts';
import { at, cellResult, handPlan, referencePosition } from './hand-made.ts';

// One schema is the type, the validator and the OpenAPI schema (docs/design.md §5): the schemas must turn
// into JSON Schema 2020-12 (what OpenAPI 3.1 uses, docs/references.md §10.6) and describe what the engine returns.
describe('plan and protocol schemas', () => {
  it('convert to JSON Schema (OpenAPI 3.1 dialect)', () => {
    for (const schema of [protocolSchema, planSchema, planTableSchema, cellResultSchema]) {
      const json = z.toJSONSchema(schema, { io: 'input', unrepresentable: 'any' }) as Record<string, unknown>;
      expect(json.$schema).toBe('https://json-schema.org/draft/2020-12/schema');
    }
    const plan = z.toJSONSchema(planSchema, { io: 'input' }) as { required: string[]; properties: object };
    expect(plan.required).toEqual(
      expect.arrayContaining([
        'source',
        'matrix',
        'protocol',
        'patterns',
        'accelerations',
        'methods',
        'seeds',
      ]),
    );
  });

  it('a built table and its cells satisfy the response schemas, JSON round trip included', () => {
    const results = [
      cellResult(referencePosition, { lines: 256, ssim: 1, nrmse: 0, psnr: null, hfen: 0 }),
      cellResult(at(0, 0, 0), { lines: 128, ssim: 0.9 }),
    ];
    for (const result of results) expect(cellResultSchema.safeParse(result).success).toBe(true);
    const table = buildTable(handPlan({ target: { metric: 'ssim', atLeast: 0.95 } }), results);
    const parsed = planTableSchema.safeParse(JSON.parse(JSON.stringify(table)));
    expect(parsed.error?.issues ?? []).toEqual([]);
    expect(parsed.data).toEqual(table);
  });
});
