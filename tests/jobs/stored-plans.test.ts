import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { describe, expect, it } from 'vitest';
import { Store } from '../../src/jobs/store.ts';
import { planSchema } from '../../src/plan/index.ts';
import { oneCellPlan } from '../api/helpers.ts';

const planBody = { ...oneCellPlan, protocol: { trMs: 5 } };

/** A data folder with one queued plan whose body was written as given (as an older version might have). */
function folderWithQueuedPlan(body: string, cells: Array<[number, string]> = []): string {
  const dataDir = mkdtempSync(join(tmpdir(), 'kspace-stored-plan-'));
  new Store(dataDir).close();
  const db = new Database(join(dataDir, 'service.sqlite'));
  db.prepare(
    `INSERT INTO plans (id, created_at, updated_at, status, body, total, done) VALUES ('p', ?, ?, 'queued', ?, 2, ?)`,
  ).run('2026-01-01T00:00:00.000Z', '2026-01-01T00:00:00.000Z', body, cells.length);
  for (const [index, result] of cells)
    db.prepare('INSERT INTO plan_cells VALUES (?, ?, ?)').run('p', index, result);
  db.close();
  return dataDir;
}

describe('stored plans are read back typed', () => {
  it('a queued plan is parsed back with the plan schema (the same typed plan as at submission)', () => {
    const store = new Store(folderWithQueuedPlan(JSON.stringify(planSchema.parse(planBody))));
    try {
      const [plan] = store.unfinishedPlans();
      expect(plan).toMatchObject({ id: 'p', total: 2, done: 0 });
      expect(plan.plan).toEqual(planSchema.parse(planBody));
    } finally {
      store.close();
    }
  });

  it('a queued plan that no longer parses is marked failed with the fields named, not resumed', () => {
    const { patterns: _, ...withoutPatterns } = planBody;
    const store = new Store(folderWithQueuedPlan(JSON.stringify({ ...withoutPatterns, sweep: [] })));
    try {
      expect(store.unfinishedPlans()).toEqual([]);
      const stored = store.getPlan('p')!;
      expect(stored.status).toBe('failed');
      expect(stored.error).toMatchObject({ status: 422, kind: 'validation' });
      expect(stored.error?.detail).toContain('does not match the plan schema');
      expect(stored.error?.errors.map((e) => e.field)).toEqual(expect.arrayContaining(['patterns']));
      // Not offered again on the next start.
      expect(store.unfinishedPlans()).toEqual([]);
    } finally {
      store.close();
    }
  });

  it('a body that is not JSON at all is a failed plan as well', () => {
    const store = new Store(folderWithQueuedPlan('{not json'));
    try {
      expect(store.unfinishedPlans()).toEqual([]);
      expect(store.getPlan('p')?.status).toBe('failed');
    } finally {
      store.close();
    }
  });

  it('a finished cell in a shape this version does not read is left out, so it runs again', () => {
    const cell = {
      index: 0,
      reference: true,
      patternIndex: null,
      accelerationIndex: null,
      methodIndex: null,
      seed: 1,
      requestedR: 1,
      actualR: 1,
      acquired: 32,
      acquiredUnit: 'lines',
      scanSeconds: 0.16,
      mask: { acquired: 32, unit: 'lines', fraction: 1 },
      metrics: { nrmse: 0, psnr: null, ssim: 1, hfen: 0 },
      reconMs: 1,
      notes: [],
    };
    const dataDir = folderWithQueuedPlan(JSON.stringify(planBody), [
      [0, JSON.stringify(cell)],
      [1, '{"ok":true}'],
    ]);
    const store = new Store(dataDir);
    try {
      const cells = store.planCells('p');
      expect([...cells.keys()]).toEqual([0]);
      expect(cells.get(0)).toEqual(cell);
    } finally {
      store.close();
    }
  });
});
