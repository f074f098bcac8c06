import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import type { RealImage } from '../core/real-image.ts';

export type PlanStatus = 'queued' | 'running' | 'done' | 'failed' | 'cancelled';

export interface StoredImage {
  id: string;
  createdAt: string;
  /** Safe, whitelisted metadata only (never a header value that could identify a patient). */
  meta: Record<string, unknown>;
  nx: number;
  ny: number;
}

export interface StoredPlan {
  id: string;
  createdAt: string;
  updatedAt: string;
  status: PlanStatus;
  body: unknown;
  total: number;
  done: number;
  table: unknown | null;
  error: unknown | null;
}

interface PlanRow {
  id: string;
  created_at: string;
  updated_at: string;
  status: PlanStatus;
  body: string;
  total: number;
  done: number;
  table_json: string | null;
  error: string | null;
}

const schemaSql = `
CREATE TABLE IF NOT EXISTS images (
  id TEXT PRIMARY KEY, created_at TEXT NOT NULL, meta TEXT NOT NULL,
  nx INTEGER NOT NULL, ny INTEGER NOT NULL, pixels BLOB NOT NULL);
CREATE TABLE IF NOT EXISTS results (
  id TEXT PRIMARY KEY, created_at TEXT NOT NULL, kind TEXT NOT NULL, body TEXT NOT NULL);
CREATE TABLE IF NOT EXISTS result_images (
  result_id TEXT NOT NULL, name TEXT NOT NULL, png BLOB NOT NULL, PRIMARY KEY (result_id, name));
CREATE TABLE IF NOT EXISTS plans (
  seq INTEGER PRIMARY KEY AUTOINCREMENT, id TEXT NOT NULL UNIQUE, created_at TEXT NOT NULL,
  updated_at TEXT NOT NULL, status TEXT NOT NULL, body TEXT NOT NULL, total INTEGER NOT NULL,
  done INTEGER NOT NULL, table_json TEXT, error TEXT);
CREATE TABLE IF NOT EXISTS plan_cells (
  plan_id TEXT NOT NULL, idx INTEGER NOT NULL, result TEXT NOT NULL, PRIMARY KEY (plan_id, idx));
`;

function planFromRow(row: PlanRow): StoredPlan {
  return {
    id: row.id,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
    status: row.status,
    body: JSON.parse(row.body),
    total: row.total,
    done: row.done,
    table: row.table_json === null ? null : JSON.parse(row.table_json),
    error: row.error === null ? null : JSON.parse(row.error),
  };
}

/** All persistent state of the service: one SQLite file, `service.sqlite`, under the data directory. */
export class Store {
  readonly path: string;
  private readonly db: Database.Database;

  constructor(dataDir: string) {
    mkdirSync(dataDir, { recursive: true });
    this.path = join(dataDir, 'service.sqlite');
    this.db = new Database(this.path);
    this.db.pragma('journal_mode = WAL');
    this.db.pragma('synchronous = NORMAL');
    this.db.exec(schemaSql);
  }

  close(): void {
    if (this.db.open) this.db.close();
  }

  get isOpen(): boolean {
    return this.db.open;
  }

  // --- uploaded images -------------------------------------------------------------------

  putImage(id: string, image: RealImage, meta: Record<string, unknown>): StoredImage {
    const createdAt = new Date().toISOString();
    const pixels = Buffer.from(image.data.buffer, image.data.byteOffset, image.data.byteLength);
    this.db
      .prepare('INSERT INTO images (id, created_at, meta, nx, ny, pixels) VALUES (?, ?, ?, ?, ?, ?)')
      .run(id, createdAt, JSON.stringify(meta), image.nx, image.ny, pixels);
    return { id, createdAt, meta, nx: image.nx, ny: image.ny };
  }

  getImageInfo(id: string): StoredImage | undefined {
    const row = this.db.prepare('SELECT id, created_at, meta, nx, ny FROM images WHERE id = ?').get(id) as
      | { id: string; created_at: string; meta: string; nx: number; ny: number }
      | undefined;
    return (
      row && { id: row.id, createdAt: row.created_at, meta: JSON.parse(row.meta), nx: row.nx, ny: row.ny }
    );
  }

  getImagePixels(id: string): RealImage | undefined {
    const row = this.db.prepare('SELECT nx, ny, pixels FROM images WHERE id = ?').get(id) as
      | { nx: number; ny: number; pixels: Buffer }
      | undefined;
    if (!row) return undefined;
    // Copy into a fresh, aligned buffer: SQLite blobs need not be 8-byte aligned.
    const data = new Float64Array(row.nx * row.ny);
    new Uint8Array(data.buffer).set(row.pixels.subarray(0, data.byteLength));
    return { nx: row.nx, ny: row.ny, data };
  }

  deleteImage(id: string): boolean {
    return this.db.prepare('DELETE FROM images WHERE id = ?').run(id).changes > 0;
  }

  // --- single results (reconstructions, masks) ---------------------------------------------

  putResult(id: string, kind: string, body: unknown, images: Record<string, Buffer>): void {
    const createdAt = new Date().toISOString();
    // OR IGNORE: content-addressed results (equal requests, equal ids) may be stored twice by racing requests.
    const insertImage = this.db.prepare(
      'INSERT OR IGNORE INTO result_images (result_id, name, png) VALUES (?, ?, ?)',
    );
    this.db.transaction(() => {
      this.db
        .prepare('INSERT OR IGNORE INTO results (id, created_at, kind, body) VALUES (?, ?, ?, ?)')
        .run(id, createdAt, kind, JSON.stringify(body));
      for (const [name, png] of Object.entries(images)) insertImage.run(id, name, png);
    })();
  }

  getResult(id: string): { kind: string; body: unknown; createdAt: string } | undefined {
    const row = this.db.prepare('SELECT kind, body, created_at FROM results WHERE id = ?').get(id) as
      | { kind: string; body: string; created_at: string }
      | undefined;
    return row && { kind: row.kind, body: JSON.parse(row.body), createdAt: row.created_at };
  }

  getResultImage(id: string, name: string): Buffer | undefined {
    const row = this.db
      .prepare('SELECT png FROM result_images WHERE result_id = ? AND name = ?')
      .get(id, name) as { png: Buffer } | undefined;
    return row?.png;
  }

  // --- plans ---------------------------------------------------------------------------------

  createPlan(id: string, body: unknown, total: number): StoredPlan {
    const now = new Date().toISOString();
    this.db
      .prepare(
        `INSERT INTO plans (id, created_at, updated_at, status, body, total, done) VALUES (?, ?, ?, 'queued', ?, ?, 0)`,
      )
      .run(id, now, now, JSON.stringify(body), total);
    return this.getPlan(id)!;
  }

  getPlan(id: string): StoredPlan | undefined {
    const row = this.db.prepare('SELECT * FROM plans WHERE id = ?').get(id) as PlanRow | undefined;
    return row && planFromRow(row);
  }

  /** Plans that were queued or running when the service stopped, oldest first. */
  unfinishedPlans(): StoredPlan[] {
    const rows = this.db
      .prepare(`SELECT * FROM plans WHERE status IN ('queued', 'running') ORDER BY seq`)
      .all() as PlanRow[];
    return rows.map(planFromRow);
  }

  setPlanStatus(id: string, status: PlanStatus, extra: { table?: unknown; error?: unknown } = {}): void {
    this.db
      .prepare(
        'UPDATE plans SET status = ?, updated_at = ?, table_json = COALESCE(?, table_json), error = ? WHERE id = ?',
      )
      .run(
        status,
        new Date().toISOString(),
        extra.table === undefined ? null : JSON.stringify(extra.table),
        extra.error === undefined ? null : JSON.stringify(extra.error),
        id,
      );
  }

  /** Records one finished cell and the new done count atomically, so a restart resumes after it. */
  putPlanCell(planId: string, index: number, result: unknown): number {
    return this.db.transaction(() => {
      this.db
        .prepare('INSERT OR REPLACE INTO plan_cells (plan_id, idx, result) VALUES (?, ?, ?)')
        .run(planId, index, JSON.stringify(result));
      const { n } = this.db.prepare('SELECT COUNT(*) AS n FROM plan_cells WHERE plan_id = ?').get(planId) as {
        n: number;
      };
      this.db
        .prepare('UPDATE plans SET done = ?, updated_at = ? WHERE id = ?')
        .run(n, new Date().toISOString(), planId);
      return n;
    })();
  }

  planCells(planId: string): Map<number, unknown> {
    const rows = this.db
      .prepare('SELECT idx, result FROM plan_cells WHERE plan_id = ?')
      .all(planId) as Array<{
      idx: number;
      result: string;
    }>;
    return new Map(rows.map((row) => [row.idx, JSON.parse(row.result)]));
  }
}
