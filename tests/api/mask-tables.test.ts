import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { expectDocumented, postJson, sharedTestApp } from './helpers.ts';

/**
 * Sample tables (docs/design.md §4.10): every described mask can be downloaded as CSV (RFC 4180:
 * one header row, CRLF, no comments; read back here with csv-parse, an independent parser) and
 * JSON, and a Cartesian table comes back as the same mask through `sampling.table`.
 */
describe('GET /v1/masks/{id}/table.csv|.json', () => {
  const t = sharedTestApp();
  const matrix = { nx: 32, ny: 32 };

  async function describeMask(sampling: object) {
    const res = await postJson(t, '/v1/masks', { matrix, sampling }).expect(200);
    return res.body as { id: string; acquired: { count: number }; tables: { csv: string; json: string } };
  }

  it('Cartesian: order,ky,kx relative to the centre, linear order, and a round trip through sampling.table', async () => {
    const spec = { pattern: 'cartesian-random', acceleration: 3, acs: 6, seed: 4 };
    const mask = await describeMask(spec);
    const csvRes = await t.http().get(mask.tables.csv).expect(200);
    expect(csvRes.headers['content-type']).toMatch(/^text\/csv/);
    await expectDocumented('GET', '/v1/masks/{id}/table.csv', csvRes);
    expect(csvRes.text.endsWith('\r\n')).toBe(true);
    const rows = parse(csvRes.text, { columns: true, cast: true }) as {
      order: number;
      ky: number;
      kx: number;
    }[];
    // Every acquired line is whole: acquired lines × 32 columns.
    expect(rows.length).toBe(mask.acquired.count * matrix.nx);
    expect(rows.map((r) => r.order)).toEqual(rows.map((_, i) => i));
    expect(Math.min(...rows.map((r) => r.kx))).toBe(-16);
    expect(Math.max(...rows.map((r) => r.kx))).toBe(15);
    // ACS: rows ⌊ny/2⌋ − 3 … ⌊ny/2⌋ + 2, i.e. ky = 3 … −2 (rows run against ky).
    for (const ky of [-2, -1, 0, 1, 2, 3]) expect(rows.some((r) => r.ky === ky)).toBe(true);
    // Linear: ky never decreases along the order.
    for (let i = 1; i < rows.length; i++) expect(rows[i].ky).toBeGreaterThanOrEqual(rows[i - 1].ky);

    const json = await t.http().get(mask.tables.json).expect(200);
    await expectDocumented('GET', '/v1/masks/{id}/table.json', json);
    expect(json.body).toMatchObject({ matrix, pattern: 'cartesian-random', seed: 4, ordering: 'linear' });
    expect(json.body.samples.length).toBe(rows.length);

    const pngOf = async (sampling: object) =>
      (await t.http().post('/v1/masks').set('accept', 'image/png').send({ matrix, sampling }).expect(200))
        .body;
    const original = await pngOf(spec);
    const back = await pngOf({ pattern: 'custom', table: csvRes.text });
    expect(Buffer.compare(back, original)).toBe(0);
  });

  it('non-Cartesian radial: order,kx,ky in cycles per FOV, spoke by spoke', async () => {
    const mask = await describeMask({ pattern: 'radial', acceleration: 4, angles: 'golden' });
    const csv = (await t.http().get(mask.tables.csv).expect(200)).text;
    expect(csv.split('\r\n')[0]).toBe('order,kx,ky');
    const rows = parse(csv, { columns: true, cast: true }) as { kx: number; ky: number }[];
    // ⌈π/2·32⌉ = 51 Nyquist spokes; R 4 → 13 spokes of 2·32 samples (2× readout oversampling).
    expect(mask.acquired.count).toBe(13);
    expect(rows.length).toBe(13 * 64);
    // Spoke 0 lies along kx (angle 0), its centre sample (index 32) at the origin, spacing ½.
    expect(rows[32]).toEqual({ order: 32, kx: 0, ky: 0 });
    expect(rows[33].kx).toBeCloseTo(0.5, 9);
    // Spoke 1 is the golden angle 180°/φ on: its direction has the angle 111.246°.
    const angle = (Math.atan2(rows[64 + 63].ky, rows[64 + 63].kx) * 180) / Math.PI;
    expect((angle + 360) % 180).toBeCloseTo(111.2461, 3);
    const refused = await postJson(t, '/v1/masks', {
      matrix,
      sampling: { pattern: 'custom', table: csv },
    }).expect(422);
    expect(refused.body.errors[0].field).toBe('sampling.table');
  });

  it('unknown ids are a 404 problem; a custom mask needs exactly one of maskPng and table', async () => {
    const res = await t.http().get('/v1/masks/mask-nothing/table.csv').expect(404);
    expect(res.headers['content-type']).toMatch(/problem\+json/);
    const both = await postJson(t, '/v1/masks', { matrix, sampling: { pattern: 'custom' } }).expect(422);
    expect(both.body.errors[0].field).toBe('sampling');
    const bad = await postJson(t, '/v1/masks', {
      matrix,
      sampling: { pattern: 'custom', table: 'order,ky,kx\r\n0,40,0\r\n' },
    }).expect(422);
    expect(bad.body.errors[0]).toMatchObject({ field: 'sampling.table' });
  });

  describe('acquisition orders (docs/references.md §3.8)', () => {
    type Row = { order: number; ky: number; kx: number };
    const rowsOf = async (url: string): Promise<Row[]> =>
      parse((await t.http().get(url).expect(200)).text, { columns: true, cast: true }) as Row[];
    const key = (r: Row) => `${r.ky},${r.kx}`;
    const pngOf = async (sampling: object) =>
      (await t.http().post('/v1/masks').set('accept', 'image/png').send({ matrix, sampling }).expect(200))
        .body;

    for (const spec of [
      { pattern: 'cartesian-random', acceleration: 3, acs: 6, seed: 4 },
      { pattern: 'poisson-disc', acceleration: 4, seed: 2 },
      { pattern: 'lattice', acceleration: 4, rows: 2, shift: 1 },
    ]) {
      it(`${spec.pattern}: every order is a permutation of the linear table and reads back as the same mask`, async () => {
        const mask = await describeMask(spec);
        const linear = await rowsOf(mask.tables.csv);
        const original = await pngOf(spec);
        for (const order of ['linear', 'centre-out', 'spiral-out']) {
          const csv = (await t.http().get(`${mask.tables.csv}?order=${order}`).expect(200)).text;
          const rows = parse(csv, { columns: true, cast: true }) as Row[];
          expect(
            rows.map((r) => r.order),
            order,
          ).toEqual(rows.map((_, i) => i));
          expect(rows.map(key).sort(), order).toEqual(linear.map(key).sort());
          const back = await pngOf({ pattern: 'custom', table: csv });
          expect(Buffer.compare(back, original), order).toBe(0);
          const json = await t.http().get(`${mask.tables.json}?order=${order}`).expect(200);
          await expectDocumented('GET', '/v1/masks/{id}/table.json', json);
          expect(json.body.ordering).toBe(order);
          expect(json.body.samples).toEqual(rows.map((r) => [r.order, r.ky, r.kx]));
        }
      });
    }

    it('centre-out: distance from the centre never decreases; spiral-out: shells outwards, angle within a shell', async () => {
      const mask = await describeMask({ pattern: 'poisson-disc', acceleration: 3, acs: 8, seed: 7 });
      const centric = await rowsOf(`${mask.tables.csv}?order=centre-out`);
      const radius = (r: Row) => Math.hypot(r.ky, r.kx);
      // The 8×8 calibration square is fully sampled, so the origin is acquired and comes first.
      expect(key(centric[0])).toBe('0,0');
      for (let i = 1; i < centric.length; i++) {
        expect(radius(centric[i])).toBeGreaterThanOrEqual(radius(centric[i - 1]));
      }
      const spiral = await rowsOf(`${mask.tables.csv}?order=spiral-out`);
      const shell = (r: Row) => Math.round(radius(r));
      const angle = (r: Row) => {
        const a = Math.atan2(r.ky, r.kx);
        return a === Math.PI ? -Math.PI : a;
      };
      let turns = 0;
      for (let i = 1; i < spiral.length; i++) {
        const [a, b] = [spiral[i - 1], spiral[i]];
        expect(shell(b)).toBeGreaterThanOrEqual(shell(a));
        if (shell(b) === shell(a)) expect(angle(b)).toBeGreaterThanOrEqual(angle(a));
        else turns++;
      }
      // One turn per occupied shell after the first.
      expect(turns).toBe(new Set(spiral.map(shell)).size - 1);
    });

    it('a trajectory table takes only the linear order; an unknown order is a 422 naming order', async () => {
      const radial = await describeMask({ pattern: 'radial', acceleration: 4 });
      const refused = await t.http().get(`${radial.tables.csv}?order=centre-out`).expect(422);
      expect(refused.body.errors[0]).toMatchObject({ field: 'order', allowed: 'linear' });
      await t.http().get(`${radial.tables.csv}?order=linear`).expect(200);
      const cartesian = await describeMask({ pattern: 'cartesian-uniform', acceleration: 2 });
      const unknown = await t.http().get(`${cartesian.tables.csv}?order=zigzag`).expect(422);
      expect(unknown.body.errors[0].field).toBe('order');
    });
  });
});
