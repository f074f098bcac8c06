import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { buildTable } from '../../src/plan/build-table.ts';
import { metricNames } from '../../src/plan/metric-direction.ts';
import { csvColumns, csvField, tableToCsv } from '../../src/plan/table-csv.ts';
import { at, cellResult, handPlan, referencePosition } from './hand-made.ts';

function sampleTable() {
  // Two cs-tv entries make labels with commas ("cs-tv (iterations 40, lambda 0.01)"), which must be quoted.
  const plan = handPlan({
    patterns: [{ pattern: 'cartesian-uniform' }],
    methods: [
      { name: 'cs-tv', lambda: 0.01, iterations: 40 },
      { name: 'cs-tv', lambda: 0.1, iterations: 40 },
    ] as never,
    seeds: 2,
    target: { metric: 'ssim', atLeast: 0.9 },
  });
  const results = [
    cellResult(referencePosition, { lines: 256, ssim: 1, nrmse: 0, psnr: null, hfen: 0, seed: 1 }),
    cellResult(referencePosition, { lines: 256, ssim: 1, nrmse: 0, psnr: null, hfen: 0, seed: 2 }),
  ];
  for (const [j, lines] of [128, 64].entries()) {
    for (const m of [0, 1]) {
      results.push(cellResult(at(0, j, m), { lines, ssim: 0.9 + 0.01 * m + 0.001 * j, seed: 1 }));
      results.push(cellResult(at(0, j, m), { lines: lines + 1, ssim: 0.93 - 0.02 * j, seed: 2 }));
    }
  }
  return buildTable(plan, results);
}

/** Number() with the CSV's spellings of the table's nulls: a mean of +∞ and an undefined spread. */
function readNumber(text: string): number | null {
  return text === 'Infinity' || text === '' ? null : Number(text);
}

describe('tradeoff table as RFC 4180 CSV (docs/references.md §10.5)', () => {
  it('records end in CRLF, the header names carry units, every record has the header field count', () => {
    const csv = tableToCsv(sampleTable());
    expect(csv.endsWith('\r\n')).toBe(true);
    expect(csv.replace(/\r\n/g, '')).not.toMatch(/[\r\n]/);
    const header = csv.split('\r\n')[0].split(',');
    for (const name of [
      'scan_s',
      'scan_mmss',
      'time_saved_pct',
      'recon_ms',
      'psnr_db_mean',
      'acquired_unit',
    ]) {
      expect(header).toContain(name);
    }
    const records = parse(csv, { relax_column_count: false }) as string[][];
    expect(records.length).toBe(1 + sampleTable().rows.length);
    for (const record of records) expect(record.length).toBe(header.length);
  });

  it('a 2D plan has no acquisition column: its header is the fixed column list (volumes add one)', () => {
    const header = (parse(tableToCsv(sampleTable()), { to_line: 1 }) as string[][])[0];
    expect(header).toEqual(csvColumns.map((c) => c.name));
    expect(header).not.toContain('acquisition');
  });

  it('csv-parse reads back the same numbers, to the decimals written', () => {
    const table = sampleTable();
    const records = parse(tableToCsv(table), { columns: true }) as Record<string, string>[];
    records.forEach((record, i) => {
      const row = table.rows[i];
      expect(record.pattern).toBe(row.pattern);
      expect(record.method).toBe(row.method);
      expect(record.reference).toBe(String(row.reference));
      expect(Number(record.scan_s)).toBeCloseTo(row.scanSeconds, 3);
      expect(record.scan_mmss).toBe(row.scanFormatted);
      expect(Number(record.time_saved_pct)).toBeCloseTo(row.timeSavedPct, 2);
      expect(Number(record.actual_r)).toBeCloseTo(row.actualR, 3);
      expect(Number(record.acquired)).toBeCloseTo(row.acquired, 2);
      expect(Number(record.recon_ms)).toBeCloseTo(row.reconMs, 1);
      expect(Number(record.seeds)).toBe(row.seeds);
      expect(record.pareto).toBe(String(row.pareto));
      expect(record.meets_target).toBe(String(row.meetsTarget));
      for (const metric of metricNames) {
        const name = metric === 'psnr' ? 'psnr_db' : metric;
        const digits = metric === 'psnr' ? 3 : 6;
        for (const stat of ['mean', 'sd'] as const) {
          const back = readNumber(record[`${name}_${stat}`]);
          const value = row.metrics[metric][stat];
          if (value === null) expect(back).toBeNull();
          else expect(back).toBeCloseTo(value, digits);
        }
      }
    });
    expect(records[0].psnr_db_mean).toBe('Infinity');
    expect(records[0].psnr_db_sd).toBe('');
    expect(records[0].requested_r).toBe('1.00');
  });

  it('fixed decimals with "." as separator (common practice, docs/references.md §10.5)', () => {
    const records = parse(tableToCsv(sampleTable()), { columns: true }) as Record<string, string>[];
    expect(records[1].scan_s).toMatch(/^\d+\.\d{3}$/);
    expect(records[1].ssim_mean).toMatch(/^\d\.\d{6}$/);
    expect(records[1].time_saved_pct).toMatch(/^\d+\.\d{2}$/);
  });

  it('fields with comma, quote or line break are quoted and inner quotes doubled (RFC 4180 §2)', () => {
    expect(csvField('He said "hi", ok')).toBe('"He said ""hi"", ok"');
    expect(csvField('two\r\nlines')).toBe('"two\r\nlines"');
    expect(csvField('plain text')).toBe('plain text');
    expect(parse(`${csvField('He said "hi", ok')}\r\n`)).toEqual([['He said "hi", ok']]);
    const csv = tableToCsv(sampleTable());
    expect(csv).toContain('"cs-tv (iterations 40, lambda 0.01)"');
  });
});
