import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import type { RawKspace } from '../acquisition/index.ts';
import { boundEcho, boundFieldProblems, MAX_DETAIL_CHARS } from '../core/echo-bound.ts';
import type { FieldProblem } from '../core/errors.ts';
import type { RealImage } from '../core/real-image.ts';
import type { RealVolume } from '../core/real-volume.ts';
import type { CoilMaps, MultiCoilKspace } from '../encoding/index.ts';
import { type CellResult, cellResultSchema, type Plan, type PlanTable, planSchema } from '../plan/index.ts';

export type PlanStatus = 'queued' | 'running' | 'done' | 'failed' | 'cancelled';

/**
 * An imported raw k-space file as stored, shaped like stored coil maps (the k-space and noise
 * covariance are read separately); meta holds numbers of the file only, never a header string.
 */
export type StoredRawKspace = StoredCoilMaps;

/**
 * A result image at full precision: float32 values in the reconstruction's own units, row-major,
 * row 0 at the top, and the value its PNGs show as white. A volume result keeps nz such planes,
 * slice-major (src/core/real-volume.ts); absent nz: one plane.
 */
export interface ResultArray {
  nx: number;
  ny: number;
  nz?: number;
  white: number;
  data: Float32Array;
}

/**
 * A reconstruction's acquired data as stored (src/pipeline/acquired-data.ts): the export header
 * (JSON), the complex64 samples and the layout bytes (Cartesian: the uint8 mask; non-Cartesian:
 * none, the header's table has the points).
 */
export interface StoredAcquisition {
  header: Record<string, unknown>;
  samples: Float32Array;
  layout: Uint8Array;
}

/** Uploaded coil sensitivity maps as stored (the planes are read separately). */
export interface StoredCoilMaps {
  id: string;
  createdAt: string;
  /** Whitelisted facts only (format, datatype, dims); never a header string. */
  meta: Record<string, unknown>;
  nx: number;
  ny: number;
  coils: number;
}

export interface StoredImage {
  id: string;
  createdAt: string;
  /** Safe, whitelisted metadata only (never a header value that could identify a patient). */
  meta: Record<string, unknown>;
  nx: number;
  ny: number;
  /** Slices of the volume kept with the upload (slices=all); absent otherwise. */
  nz?: number;
}

/** Why a plan failed, as stored with it and shown in its status (problem-like, bounded). */
export interface PlanFailure {
  status: number;
  kind: string;
  detail: string;
  errors: FieldProblem[];
}

/** A plan's state as stored: what its status answer shows (the plan itself is read by the queue only). */
export interface StoredPlan {
  id: string;
  createdAt: string;
  updatedAt: string;
  status: PlanStatus;
  total: number;
  done: number;
  table: PlanTable | null;
  error: PlanFailure | null;
}

/** A queued or running plan to resume: its typed plan, parsed back with the plan schema. */
export interface UnfinishedPlan {
  id: string;
  plan: Plan;
  total: number;
  done: number;
}

/** One page of a list, newest first: `after` is the position to pass back for the next page. */
export interface ListPage<T> {
  items: T[];
  /** Position of the last item when more may follow; null on the last page. */
  after: number | null;
}

/** A stored plan as a list shows it: its state and its body (the label is drawn from it). */
export interface PlanListEntry {
  id: string;
  createdAt: string;
  status: PlanStatus;
  total: number;
  done: number;
  body: unknown;
}

/** An uploaded image's row without its pixels. */
interface ImageSqlRow {
  id: string;
  created_at: string;
  meta: string;
  nx: number;
  ny: number;
  nz?: number | null;
}

function imageFromRow(row: ImageSqlRow): StoredImage {
  return {
    id: row.id,
    createdAt: row.created_at,
    meta: JSON.parse(row.meta),
    nx: row.nx,
    ny: row.ny,
    ...(row.nz ? { nz: row.nz } : {}),
  };
}

/** One row of the plans table in SQLite, columns as stored (JSON in TEXT columns). */
interface PlanSqlRow {
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
CREATE TABLE IF NOT EXISTS coil_maps (
  id TEXT PRIMARY KEY, created_at TEXT NOT NULL, owner TEXT, meta TEXT NOT NULL,
  nx INTEGER NOT NULL, ny INTEGER NOT NULL, coils INTEGER NOT NULL, planes BLOB NOT NULL);
CREATE TABLE IF NOT EXISTS raw_kspace (
  id TEXT PRIMARY KEY, created_at TEXT NOT NULL, owner TEXT, meta TEXT NOT NULL,
  nx INTEGER NOT NULL, ny INTEGER NOT NULL, coils INTEGER NOT NULL, kspace BLOB NOT NULL,
  noise_covariance BLOB);
CREATE TABLE IF NOT EXISTS results (
  id TEXT PRIMARY KEY, created_at TEXT NOT NULL, kind TEXT NOT NULL, body TEXT NOT NULL);
CREATE TABLE IF NOT EXISTS result_images (
  result_id TEXT NOT NULL, name TEXT NOT NULL, png BLOB NOT NULL, PRIMARY KEY (result_id, name));
CREATE TABLE IF NOT EXISTS result_arrays (
  result_id TEXT NOT NULL, name TEXT NOT NULL, nx INTEGER NOT NULL, ny INTEGER NOT NULL,
  white REAL NOT NULL, data BLOB NOT NULL, PRIMARY KEY (result_id, name));
CREATE TABLE IF NOT EXISTS result_acquisitions (
  result_id TEXT PRIMARY KEY, header TEXT NOT NULL, samples BLOB NOT NULL, layout BLOB NOT NULL);
CREATE TABLE IF NOT EXISTS plans (
  seq INTEGER PRIMARY KEY AUTOINCREMENT, id TEXT NOT NULL UNIQUE, created_at TEXT NOT NULL,
  updated_at TEXT NOT NULL, status TEXT NOT NULL, body TEXT NOT NULL, total INTEGER NOT NULL,
  done INTEGER NOT NULL, table_json TEXT, error TEXT);
CREATE TABLE IF NOT EXISTS plan_cells (
  plan_id TEXT NOT NULL, idx INTEGER NOT NULL, result TEXT NOT NULL, PRIMARY KEY (plan_id, idx));
CREATE TABLE IF NOT EXISTS input_links (
  holder_kind TEXT NOT NULL, holder_id TEXT NOT NULL, input_kind TEXT NOT NULL, input_id TEXT NOT NULL,
  PRIMARY KEY (holder_kind, holder_id, input_kind, input_id));
CREATE INDEX IF NOT EXISTS input_links_by_input ON input_links (input_kind, input_id);
`;

/** Columns added after the first release; older databases get them through ALTER TABLE on open. */
const addedColumns: Array<{ table: string; column: string; type: string }> = [
  { table: 'images', column: 'owner', type: 'TEXT' },
  { table: 'results', column: 'owner', type: 'TEXT' },
  { table: 'plans', column: 'owner', type: 'TEXT' },
  // The plan a result belongs to (a row's representative seed-1 result), deleted with the plan.
  { table: 'results', column: 'plan_id', type: 'TEXT' },
  // A NIfTI uploaded with slices=all keeps its whole volume (float64, x fastest) beside the slice.
  { table: 'images', column: 'nz', type: 'INTEGER' },
  { table: 'images', column: 'volume', type: 'BLOB' },
  // A volume result keeps its images as whole volumes (nz slices; NULL: one plane).
  { table: 'result_arrays', column: 'nz', type: 'INTEGER' },
  // Raw k-space of a 3D acquisition keeps nz partitions per coil (NULL: one 2D slice).
  { table: 'raw_kspace', column: 'nz', type: 'INTEGER' },
];

interface InputKindSpec {
  /** Table with columns id, created_at, owner. */
  table: string;
  /** SQL expression for the bytes one row keeps. */
  bytesSql: string;
}

/**
 * Every kind of stored input a user sends (uploaded pixels today; raw k-space files or coil maps
 * tomorrow). Its table has id, created_at and owner columns; results and plans made from one list it
 * in input_links. Deleting an input then deletes every result and plan linked to it, and retention
 * ages it like everything else while sparing inputs a queued or running plan links to. A new kind is
 * one entry here plus the links written when a result or plan uses it.
 */
export const inputKinds = {
  image: { table: 'images', bytesSql: 'length(meta) + length(pixels) + coalesce(length(volume), 0)' },
  coilMaps: { table: 'coil_maps', bytesSql: 'length(meta) + length(planes)' },
  raw: {
    table: 'raw_kspace',
    bytesSql: 'length(meta) + length(kspace) + COALESCE(length(noise_covariance), 0)',
  },
} as const satisfies Record<string, InputKindSpec>;

export type InputKind = keyof typeof inputKinds;

/** Things that hold derived data: single results and plans. */
export type HolderKind = 'result' | 'plan';

/** Anything retention and deletion act on. */
export type EntryKind = InputKind | HolderKind;

export interface InputRef {
  kind: InputKind;
  id: string;
}

/**
 * Which rows a caller may see: all of them, or (tenant isolation) only those of one owner, the
 * SHA-256 digest of the caller's API key.
 */
export type Scope = 'all' | { owner: string };

/** One stored entry as retention sees it. */
export interface StoredEntry {
  kind: EntryKind;
  id: string;
  createdAt: string;
  bytes: number;
  /** A queued or running plan, or an input such a plan reads: never removed by retention. */
  pinned: boolean;
}

function scopeParams(scope: Scope): { everyone: number; owner: string | null } {
  return scope === 'all' ? { everyone: 1, owner: null } : { everyone: 0, owner: scope.owner };
}

/** SQL condition matching the rows a scope may see (named parameters @everyone, @owner). */
const visible = '(@everyone = 1 OR owner = @owner)';

const activePlanStatuses = `('queued', 'running')`;

/** Fills `into` from the blob and returns it: a fresh, aligned copy (SQLite blobs need not be aligned). */
function alignedCopy<T extends Float32Array | Float64Array>(blob: Buffer, into: T): T {
  new Uint8Array(into.buffer).set(blob.subarray(0, into.byteLength));
  return into;
}

function planFromRow(row: PlanSqlRow): StoredPlan {
  return {
    id: row.id,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
    status: row.status,
    total: row.total,
    done: row.done,
    table: row.table_json === null ? null : JSON.parse(row.table_json),
    error: row.error === null ? null : JSON.parse(row.error),
  };
}

/**
 * All persistent state of the service: one SQLite file, `service.sqlite`, under the data directory.
 * Deleted rows are overwritten with zeros (secure_delete) and every deletion ends with a truncating
 * WAL checkpoint (`scrub`), so removed pixels leave neither the database file nor its WAL.
 */
export class Store {
  readonly path: string;
  private readonly db: Database.Database;

  constructor(dataDir: string) {
    mkdirSync(dataDir, { recursive: true });
    this.path = join(dataDir, 'service.sqlite');
    this.db = new Database(this.path);
    this.db.pragma('journal_mode = WAL');
    this.db.pragma('synchronous = NORMAL');
    this.db.pragma('secure_delete = ON');
    this.db.exec(schemaSql);
    this.migrate();
  }

  /** Brings a database written by an earlier version up to the current schema. */
  private migrate(): void {
    for (const { table, column, type } of addedColumns) {
      const columns = this.db.pragma(`table_info(${table})`) as Array<{ name: string }>;
      if (!columns.some((c) => c.name === column)) {
        this.db.exec(`ALTER TABLE ${table} ADD COLUMN ${column} ${type}`);
      }
    }
    // Plans stored before input_links existed name their upload in the body.
    this.db.exec(`INSERT OR IGNORE INTO input_links (holder_kind, holder_id, input_kind, input_id)
      SELECT 'plan', id, 'image', json_extract(body, '$.source.imageId') FROM plans
      WHERE json_valid(body) AND json_type(body, '$.source.imageId') = 'text'`);
  }

  close(): void {
    if (this.db.open) this.db.close();
  }

  get isOpen(): boolean {
    return this.db.open;
  }

  /**
   * Moves every page of the WAL into the database and truncates the WAL to zero bytes, so content
   * deleted (and zeroed by secure_delete) leaves no older copy in the WAL. False when a reader
   * blocked it (this service holds one connection, so only an outside reader can).
   */
  scrub(): boolean {
    const [outcome] = this.db.pragma('wal_checkpoint(TRUNCATE)') as Array<{ busy: number }>;
    return outcome?.busy === 0;
  }

  /** `columns` of the row of `table` with this id, when the scope may see it. */
  private visibleRow<Row>(table: string, columns: string, id: string, scope: Scope): Row | undefined {
    return this.db
      .prepare(`SELECT ${columns} FROM ${table} WHERE id = @id AND ${visible}`)
      .get({ id, ...scopeParams(scope) }) as Row | undefined;
  }

  // --- uploaded images -------------------------------------------------------------------

  putImage(
    id: string,
    image: RealImage,
    meta: Record<string, unknown>,
    owner: string | null = null,
    volume?: RealVolume,
  ): StoredImage {
    const createdAt = new Date().toISOString();
    const bytes = (data: Float64Array) => Buffer.from(data.buffer, data.byteOffset, data.byteLength);
    this.db
      .prepare(
        'INSERT INTO images (id, created_at, meta, nx, ny, pixels, owner, nz, volume) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)',
      )
      .run(
        id,
        createdAt,
        JSON.stringify(meta),
        image.nx,
        image.ny,
        bytes(image.data),
        owner,
        volume ? volume.nz : null,
        volume ? bytes(volume.data) : null,
      );
    return { id, createdAt, meta, nx: image.nx, ny: image.ny, ...(volume ? { nz: volume.nz } : {}) };
  }

  /** The whole volume of an upload made with slices=all; undefined when absent or not kept. */
  getImageVolume(id: string, scope: Scope = 'all'): RealVolume | undefined {
    const row = this.db
      .prepare(`SELECT nx, ny, nz, volume FROM images WHERE id = @id AND ${visible}`)
      .get({ id, ...scopeParams(scope) }) as
      | { nx: number; ny: number; nz: number | null; volume: Buffer | null }
      | undefined;
    if (!row || row.nz === null || row.volume === null) return undefined;
    // Copy into a fresh, aligned buffer: SQLite blobs need not be 8-byte aligned.
    const data = new Float64Array(row.nx * row.ny * row.nz);
    new Uint8Array(data.buffer).set(row.volume.subarray(0, data.byteLength));
    return { nx: row.nx, ny: row.ny, nz: row.nz, data };
  }

  getImageInfo(id: string, scope: Scope = 'all'): StoredImage | undefined {
    const row = this.visibleRow<ImageSqlRow>('images', 'id, created_at, meta, nx, ny, nz', id, scope);
    return row && imageFromRow(row);
  }

  getImagePixels(id: string, scope: Scope = 'all'): RealImage | undefined {
    const row = this.visibleRow<{ nx: number; ny: number; pixels: Buffer }>(
      'images',
      'nx, ny, pixels',
      id,
      scope,
    );
    if (!row) return undefined;
    return { nx: row.nx, ny: row.ny, data: alignedCopy(row.pixels, new Float64Array(row.nx * row.ny)) };
  }

  // --- uploaded coil maps -----------------------------------------------------------------

  /**
   * Stores maps as float32 in the host's byte order, as pixels are stored: both upload forms carry
   * float32, so nothing is rounded, and it is half the bytes of float64 for the largest inputs kept.
   */
  putCoilMaps(
    id: string,
    maps: CoilMaps,
    meta: Record<string, unknown>,
    owner: string | null = null,
  ): StoredCoilMaps {
    const createdAt = new Date().toISOString();
    const planes = Buffer.from(Float32Array.from(maps.data).buffer);
    this.db
      .prepare(
        `INSERT INTO coil_maps (id, created_at, owner, meta, nx, ny, coils, planes)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?)`,
      )
      .run(id, createdAt, owner, JSON.stringify(meta), maps.nx, maps.ny, maps.coils, planes);
    return { id, createdAt, meta, nx: maps.nx, ny: maps.ny, coils: maps.coils };
  }

  getCoilMapsInfo(id: string, scope: Scope = 'all'): StoredCoilMaps | undefined {
    return this.coilInputInfo('coil_maps', id, scope);
  }

  /** The row of a multi-coil input (coil maps, raw k-space) without its arrays. */
  private coilInputInfo(
    table: 'coil_maps' | 'raw_kspace',
    id: string,
    scope: Scope,
  ): StoredCoilMaps | undefined {
    const row = this.visibleRow<{
      id: string;
      created_at: string;
      meta: string;
      nx: number;
      ny: number;
      coils: number;
    }>(table, 'id, created_at, meta, nx, ny, coils', id, scope);
    return (
      row && {
        id: row.id,
        createdAt: row.created_at,
        meta: JSON.parse(row.meta),
        nx: row.nx,
        ny: row.ny,
        coils: row.coils,
      }
    );
  }

  getCoilMaps(id: string, scope: Scope = 'all'): CoilMaps | undefined {
    const row = this.visibleRow<{ nx: number; ny: number; coils: number; planes: Buffer }>(
      'coil_maps',
      'nx, ny, coils, planes',
      id,
      scope,
    );
    if (!row) return undefined;
    const stored = alignedCopy(row.planes, new Float32Array(2 * row.coils * row.nx * row.ny));
    return { coils: row.coils, nx: row.nx, ny: row.ny, data: Float64Array.from(stored) };
  }

  // --- imported raw k-space (ISMRMRD) -----------------------------------------------------

  /**
   * Stores the fully sampled coil k-space as float32 (ISMRMRD carries float32 samples; the readout
   * crop in float64 is rounded back once) and the noise covariance as float64, both host byte order.
   * A 3D acquisition keeps its nz partitions per coil (RawKspace); nz is NULL for a 2D slice.
   */
  putRawKspace(
    id: string,
    raw: { kspace: MultiCoilKspace; noiseCovariance: Float64Array | null; nz?: number },
    meta: Record<string, unknown>,
    owner: string | null = null,
  ): StoredRawKspace {
    const createdAt = new Date().toISOString();
    const { kspace, noiseCovariance } = raw;
    const samples = Buffer.from(Float32Array.from(kspace.data).buffer);
    const noise = noiseCovariance ? Buffer.from(Float64Array.from(noiseCovariance).buffer) : null;
    this.db
      .prepare(
        `INSERT INTO raw_kspace (id, created_at, owner, meta, nx, ny, nz, coils, kspace, noise_covariance)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
      )
      .run(
        id,
        createdAt,
        owner,
        JSON.stringify(meta),
        kspace.nx,
        kspace.ny,
        (raw.nz ?? 1) > 1 ? raw.nz : null,
        kspace.coils,
        samples,
        noise,
      );
    return { id, createdAt, meta, nx: kspace.nx, ny: kspace.ny, coils: kspace.coils };
  }

  getRawKspaceInfo(id: string, scope: Scope = 'all'): StoredRawKspace | undefined {
    return this.coilInputInfo('raw_kspace', id, scope);
  }

  getRawKspace(id: string, scope: Scope = 'all'): RawKspace | undefined {
    const row = this.visibleRow<{
      nx: number;
      ny: number;
      nz: number | null;
      coils: number;
      kspace: Buffer;
      noise_covariance: Buffer | null;
    }>('raw_kspace', 'nx, ny, nz, coils, kspace, noise_covariance', id, scope);
    if (!row) return undefined;
    const nz = row.nz ?? 1;
    const samples = alignedCopy(row.kspace, new Float32Array(2 * row.coils * nz * row.nx * row.ny));
    const noiseCovariance = row.noise_covariance
      ? alignedCopy(row.noise_covariance, new Float64Array(2 * row.coils * row.coils))
      : null;
    const kspace = { coils: row.coils, nx: row.nx, ny: row.ny, data: Float64Array.from(samples) };
    return { kspace, noiseCovariance, ...(nz > 1 ? { nz } : {}) };
  }

  // --- single results (reconstructions, masks) ---------------------------------------------

  /**
   * Stores a result with the inputs it was made from. Returns false (and stores nothing) when one
   * of those inputs has been deleted meanwhile: a result must not outlive what it was derived from.
   */
  putResult(
    id: string,
    kind: string,
    body: unknown,
    images: Record<string, Buffer>,
    provenance: { owner?: string | null; inputs?: InputRef[]; planId?: string } = {},
    arrays: Record<string, ResultArray> = {},
    acquisition?: StoredAcquisition,
  ): boolean {
    const createdAt = new Date().toISOString();
    const inputs = provenance.inputs ?? [];
    const insertArray = this.db.prepare(
      'INSERT OR IGNORE INTO result_arrays (result_id, name, nx, ny, nz, white, data) VALUES (?, ?, ?, ?, ?, ?, ?)',
    );
    // OR IGNORE: content-addressed results (equal requests, equal ids) may be stored twice by racing requests.
    const insertImage = this.db.prepare(
      'INSERT OR IGNORE INTO result_images (result_id, name, png) VALUES (?, ?, ?)',
    );
    return this.db.transaction(() => {
      if (!inputs.every((input) => this.inputExists(input))) return false;
      const planId = provenance.planId ?? null;
      if (planId !== null && !this.db.prepare('SELECT 1 FROM plans WHERE id = ?').get(planId)) return false;
      this.db
        .prepare(
          'INSERT OR IGNORE INTO results (id, created_at, kind, body, owner, plan_id) VALUES (?, ?, ?, ?, ?, ?)',
        )
        .run(id, createdAt, kind, JSON.stringify(body), provenance.owner ?? null, planId);
      for (const [name, png] of Object.entries(images)) insertImage.run(id, name, png);
      for (const [name, a] of Object.entries(arrays)) {
        const bytes = Buffer.from(a.data.buffer, a.data.byteOffset, a.data.byteLength);
        insertArray.run(id, name, a.nx, a.ny, a.nz ?? null, a.white, bytes);
      }
      if (acquisition) {
        const { samples, layout } = acquisition;
        this.db
          .prepare(
            'INSERT OR IGNORE INTO result_acquisitions (result_id, header, samples, layout) VALUES (?, ?, ?, ?)',
          )
          .run(
            id,
            JSON.stringify(acquisition.header),
            Buffer.from(samples.buffer, samples.byteOffset, samples.byteLength),
            Buffer.from(layout.buffer, layout.byteOffset, layout.byteLength),
          );
      }
      this.link('result', id, inputs);
      return true;
    })();
  }

  /** The acquired data stored with a result the scope may see. */
  getResultAcquisition(id: string, scope: Scope = 'all'): StoredAcquisition | undefined {
    const row = this.db
      .prepare(
        `SELECT header, samples, layout FROM result_acquisitions WHERE result_id = @id
         AND EXISTS (SELECT 1 FROM results WHERE id = @id AND ${visible})`,
      )
      .get({ id, ...scopeParams(scope) }) as { header: string; samples: Buffer; layout: Buffer } | undefined;
    if (!row) return undefined;
    // Fresh, aligned copies: SQLite blobs need not be 4-byte aligned.
    const samples = new Float32Array(row.samples.byteLength / 4);
    new Uint8Array(samples.buffer).set(row.samples);
    return { header: JSON.parse(row.header), samples, layout: Uint8Array.from(row.layout) };
  }

  /** The full-precision images of a result the scope may see, in the order they were stored. */
  getResultArrays(id: string, scope: Scope = 'all'): Map<string, ResultArray> {
    const rows = this.db
      .prepare(
        `SELECT name, nx, ny, nz, white, data FROM result_arrays WHERE result_id = @id
         AND EXISTS (SELECT 1 FROM results WHERE id = @id AND ${visible}) ORDER BY rowid`,
      )
      .all({ id, ...scopeParams(scope) }) as Array<{
      name: string;
      nx: number;
      ny: number;
      nz: number | null;
      white: number;
      data: Buffer;
    }>;
    const arrays = new Map<string, ResultArray>();
    for (const row of rows) {
      const data = alignedCopy(row.data, new Float32Array(row.nx * row.ny * (row.nz ?? 1)));
      const nz = row.nz === null ? {} : { nz: row.nz };
      arrays.set(row.name, { nx: row.nx, ny: row.ny, ...nz, white: row.white, data });
    }
    return arrays;
  }

  getResult(
    id: string,
    scope: Scope = 'all',
  ): { kind: string; body: unknown; createdAt: string } | undefined {
    const row = this.visibleRow<{ kind: string; body: string; created_at: string }>(
      'results',
      'kind, body, created_at',
      id,
      scope,
    );
    return row && { kind: row.kind, body: JSON.parse(row.body), createdAt: row.created_at };
  }

  getResultImage(id: string, name: string, scope: Scope = 'all'): Buffer | undefined {
    const row = this.db
      .prepare(
        `SELECT png FROM result_images WHERE result_id = @id AND name = @name
         AND EXISTS (SELECT 1 FROM results WHERE results.id = @id AND ${visible})`,
      )
      .get({ id, name, ...scopeParams(scope) }) as { png: Buffer } | undefined;
    return row?.png;
  }

  // --- plans ---------------------------------------------------------------------------------

  createPlan(
    id: string,
    body: Plan,
    total: number,
    provenance: { owner?: string | null; inputs?: InputRef[] } = {},
  ): StoredPlan {
    const now = new Date().toISOString();
    this.db.transaction(() => {
      this.db
        .prepare(
          `INSERT INTO plans (id, created_at, updated_at, status, body, total, done, owner)
           VALUES (?, ?, ?, 'queued', ?, ?, 0, ?)`,
        )
        .run(id, now, now, JSON.stringify(body), total, provenance.owner ?? null);
      this.link('plan', id, provenance.inputs ?? []);
    })();
    return this.getPlan(id)!;
  }

  getPlan(id: string, scope: Scope = 'all'): StoredPlan | undefined {
    const row = this.visibleRow<PlanSqlRow>('plans', '*', id, scope);
    return row && planFromRow(row);
  }

  /** Who owns a plan and which inputs it reads: what the results made for it are stored with. */
  planProvenance(id: string): { owner: string | null; inputs: InputRef[] } | undefined {
    const row = this.db.prepare('SELECT owner FROM plans WHERE id = ?').get(id) as
      | { owner: string | null }
      | undefined;
    if (!row) return undefined;
    const inputs = this.db
      .prepare(
        `SELECT input_kind AS kind, input_id AS id FROM input_links WHERE holder_kind = 'plan' AND holder_id = ?`,
      )
      .all(id) as InputRef[];
    return { owner: row.owner, inputs };
  }

  /**
   * Plans the scope may see, newest first, `limit` at most, after position `after` (exclusive).
   * Positions are the insertion sequence, so a plan created while a client pages never shifts the
   * pages it has still to read.
   */
  listPlans(
    scope: Scope,
    options: { limit: number; after?: number; status?: PlanStatus },
  ): ListPage<PlanListEntry> {
    const rows = this.db
      .prepare(
        `SELECT seq, id, created_at, status, total, done, body FROM plans
         WHERE ${visible} AND (@after IS NULL OR seq < @after) AND (@status IS NULL OR status = @status)
         ORDER BY seq DESC LIMIT @take`,
      )
      .all({
        ...scopeParams(scope),
        after: options.after ?? null,
        status: options.status ?? null,
        take: options.limit + 1,
      }) as Array<{
      seq: number;
      id: string;
      created_at: string;
      status: PlanStatus;
      total: number;
      done: number;
      body: string;
    }>;
    return pageOf(rows, options.limit, (row) => ({
      id: row.id,
      createdAt: row.created_at,
      status: row.status,
      total: row.total,
      done: row.done,
      body: parseJson(row.body),
    }));
  }

  /** Uploaded images the scope may see, newest first, paged like `listPlans` (by rowid). */
  listImages(scope: Scope, options: { limit: number; after?: number }): ListPage<StoredImage> {
    const rows = this.db
      .prepare(
        `SELECT rowid AS seq, id, created_at, meta, nx, ny, nz FROM images
         WHERE ${visible} AND (@after IS NULL OR rowid < @after) ORDER BY rowid DESC LIMIT @take`,
      )
      .all({ ...scopeParams(scope), after: options.after ?? null, take: options.limit + 1 }) as Array<
      ImageSqlRow & { seq: number }
    >;
    return pageOf(rows, options.limit, imageFromRow);
  }

  /**
   * Plans that were queued or running when the service stopped, oldest first, each parsed back with
   * the plan schema once. A plan an earlier version stored that no longer parses is marked failed
   * (naming the fields) instead of stopping the service.
   */
  unfinishedPlans(): UnfinishedPlan[] {
    const rows = this.db
      .prepare(`SELECT * FROM plans WHERE status IN ('queued', 'running') ORDER BY seq`)
      .all() as PlanSqlRow[];
    const plans: UnfinishedPlan[] = [];
    for (const row of rows) {
      const parsed = parseStoredPlan(row.body);
      if (parsed.ok) plans.push({ id: row.id, plan: parsed.plan, total: row.total, done: row.done });
      else this.setPlanStatus(row.id, 'failed', { error: parsed.failure });
    }
    return plans;
  }

  setPlanStatus(
    id: string,
    status: PlanStatus,
    extra: { table?: PlanTable; error?: PlanFailure } = {},
  ): void {
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
  putPlanCell(planId: string, index: number, result: CellResult): number {
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

  /**
   * Finished cells of a plan by index. A cell stored in a shape this version does not read is left
   * out, so a resumed plan runs it again.
   */
  planCells(planId: string): Map<number, CellResult> {
    const rows = this.db
      .prepare('SELECT idx, result FROM plan_cells WHERE plan_id = ?')
      .all(planId) as Array<{
      idx: number;
      result: string;
    }>;
    const cells = new Map<number, CellResult>();
    for (const row of rows) {
      const parsed = cellResultSchema.safeParse(parseJson(row.result));
      if (parsed.success) cells.set(row.idx, parsed.data);
    }
    return cells;
  }
  // --- deletion and retention ------------------------------------------------------------------

  inputExists(input: InputRef): boolean {
    const { table } = inputKinds[input.kind];
    return this.db.prepare(`SELECT 1 FROM ${table} WHERE id = ?`).get(input.id) !== undefined;
  }

  private link(holderKind: HolderKind, holderId: string, inputs: InputRef[]): void {
    const insert = this.db.prepare(
      'INSERT OR IGNORE INTO input_links (holder_kind, holder_id, input_kind, input_id) VALUES (?, ?, ?, ?)',
    );
    for (const input of inputs) insert.run(holderKind, holderId, input.kind, input.id);
  }

  /** Whether an entry exists and the scope may see it. */
  visible(kind: EntryKind, id: string, scope: Scope): boolean {
    return this.visibleRow(tableOf(kind), '1', id, scope) !== undefined;
  }

  /** The inputs a result or plan was made from (through input_links). */
  inputsOf(holderKind: HolderKind, holderId: string): InputRef[] {
    return this.db
      .prepare(
        'SELECT input_kind AS kind, input_id AS id FROM input_links WHERE holder_kind = ? AND holder_id = ?',
      )
      .all(holderKind, holderId) as InputRef[];
  }

  /** Plans and results made from an input (through input_links). */
  holdersOf(input: InputRef): Array<{ kind: HolderKind; id: string }> {
    return (
      this.db
        .prepare(
          'SELECT holder_kind AS kind, holder_id AS id FROM input_links WHERE input_kind = ? AND input_id = ?',
        )
        .all(input.kind, input.id) as Array<{ kind: HolderKind; id: string }>
    ).filter((holder) =>
      this.db.prepare(`SELECT 1 FROM ${tableOf(holder.kind)} WHERE id = ?`).get(holder.id),
    );
  }

  /**
   * Deletes an entry and, for an input, every result and plan linked to it, in one transaction.
   * Returns every entry removed (empty when the id was unknown). Callers cancel running plans
   * first and call `scrub` afterwards (see DataLifecycle).
   */
  deleteCascade(kind: EntryKind, id: string): Array<{ kind: EntryKind; id: string }> {
    return this.db.transaction(() => {
      if (!this.db.prepare(`SELECT 1 FROM ${tableOf(kind)} WHERE id = ?`).get(id)) return [];
      const removed: Array<{ kind: EntryKind; id: string }> = [];
      if (kind !== 'result' && kind !== 'plan') {
        for (const holder of this.holdersOf({ kind, id })) {
          this.deleteHolder(holder.kind, holder.id);
          removed.push(holder);
        }
        this.db.prepare(`DELETE FROM ${inputKinds[kind].table} WHERE id = ?`).run(id);
        this.db.prepare('DELETE FROM input_links WHERE input_kind = ? AND input_id = ?').run(kind, id);
      } else {
        this.deleteHolder(kind, id);
      }
      removed.push({ kind, id });
      return removed;
    })();
  }

  private deleteHolder(kind: HolderKind, id: string): void {
    if (kind === 'result') {
      this.db.prepare('DELETE FROM result_images WHERE result_id = ?').run(id);
      this.db.prepare('DELETE FROM result_arrays WHERE result_id = ?').run(id);
      this.db.prepare('DELETE FROM result_acquisitions WHERE result_id = ?').run(id);
      this.db.prepare('DELETE FROM results WHERE id = ?').run(id);
    } else {
      const results = this.db.prepare('SELECT id FROM results WHERE plan_id = ?').all(id) as Array<{
        id: string;
      }>;
      for (const result of results) this.deleteHolder('result', result.id);
      this.db.prepare('DELETE FROM plan_cells WHERE plan_id = ?').run(id);
      this.db.prepare('DELETE FROM plans WHERE id = ?').run(id);
    }
    this.db.prepare('DELETE FROM input_links WHERE holder_kind = ? AND holder_id = ?').run(kind, id);
  }

  /** Every stored entry with its size, oldest first (ties: inputs before what was made from them). */
  inventory(): StoredEntry[] {
    const pinnedInput = (kind: InputKind, table: string) =>
      `EXISTS (SELECT 1 FROM input_links l JOIN plans p ON p.id = l.holder_id
        WHERE l.holder_kind = 'plan' AND l.input_kind = '${kind}' AND l.input_id = ${table}.id
        AND p.status IN ${activePlanStatuses})`;
    const inputs = (Object.entries(inputKinds) as Array<[InputKind, InputKindSpec]>).map(
      ([kind, spec]) =>
        `SELECT '${kind}' AS kind, id, created_at, ${spec.bytesSql} AS bytes,
          ${pinnedInput(kind, spec.table)} AS pinned, 0 AS rank FROM ${spec.table}`,
    );
    const resultBytes = (r: string) =>
      `length(${r}.body) + COALESCE((SELECT SUM(length(png)) FROM result_images WHERE result_id = ${r}.id), 0)
        + COALESCE((SELECT SUM(length(data)) FROM result_arrays WHERE result_id = ${r}.id), 0)
        + COALESCE((SELECT length(samples) + length(layout) + length(header) FROM result_acquisitions
          WHERE result_id = ${r}.id), 0)`;
    // A plan's row results are part of the plan: counted in its bytes, aged and removed with it.
    const results = `SELECT 'result', id, created_at, ${resultBytes('results')}, 0, 1 FROM results
      WHERE plan_id IS NULL`;
    const plans = `SELECT 'plan', id, created_at,
      length(body) + COALESCE(length(table_json), 0) + COALESCE(length(error), 0)
        + COALESCE((SELECT SUM(length(result)) FROM plan_cells WHERE plan_id = plans.id), 0)
        + COALESCE((SELECT SUM(${resultBytes('r')}) FROM results r WHERE r.plan_id = plans.id), 0),
      status IN ${activePlanStatuses}, 1 FROM plans`;
    const rows = this.db
      .prepare(`${[...inputs, results, plans].join(' UNION ALL ')} ORDER BY created_at, rank, id`)
      .all() as Array<{ kind: EntryKind; id: string; created_at: string; bytes: number; pinned: number }>;
    return rows.map((row) => ({
      kind: row.kind,
      id: row.id,
      createdAt: row.created_at,
      bytes: row.bytes,
      pinned: row.pinned === 1,
    }));
  }
}

/** `limit` rows of the `limit + 1` read, and the position after the last when there were more. */
function pageOf<R extends { seq: number }, T>(rows: R[], limit: number, map: (row: R) => T): ListPage<T> {
  const more = rows.length > limit;
  const kept = more ? rows.slice(0, limit) : rows;
  return { items: kept.map(map), after: more ? kept[kept.length - 1].seq : null };
}

function parseJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}

/** A stored plan body through the plan schema: the typed plan, or the failure to store instead. */
function parseStoredPlan(body: string): { ok: true; plan: Plan } | { ok: false; failure: PlanFailure } {
  const parsed = planSchema.safeParse(parseJson(body));
  if (parsed.success) return { ok: true, plan: parsed.data };
  const errors = parsed.error.issues.map((issue) => ({
    field: issue.path.length === 0 ? 'body' : issue.path.map(String).join('.'),
    message: issue.message,
  }));
  return {
    ok: false,
    failure: {
      status: 422,
      kind: 'validation',
      detail: boundEcho(
        'the stored plan does not match the plan schema of this version; submit it again',
        MAX_DETAIL_CHARS,
      ),
      errors: boundFieldProblems(errors),
    },
  };
}

function tableOf(kind: EntryKind): string {
  if (kind === 'result') return 'results';
  if (kind === 'plan') return 'plans';
  return inputKinds[kind].table;
}
