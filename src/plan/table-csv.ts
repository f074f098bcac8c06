import type { PlanRow, PlanTable } from './plan-table.ts';
import { taskMetricNames, taskMetrics } from './task-metrics.ts';

/** One CSV column: header name (units in the name) and how a row fills it. */
interface Column {
  name: string;
  value(row: PlanRow): string;
}

/**
 * Fixed decimals with '.' whatever the locale (toFixed ignores it). A null mean (+∞, see
 * metric-direction.ts) is written `Infinity`, which JavaScript's Number() and Python's float() read;
 * a null standard deviation (undefined spread of an infinite mean) is left empty.
 */
function fixed(decimals: number, read: (row: PlanRow) => number | null, nullText = 'Infinity') {
  return (row: PlanRow): string => {
    const value = read(row);
    return value === null ? nullText : value.toFixed(decimals);
  };
}

export const csvColumns: readonly Column[] = [
  { name: 'pattern', value: (r) => r.pattern },
  { name: 'method', value: (r) => r.method },
  { name: 'coils', value: (r) => r.coils },
  { name: 'coil_count', value: (r) => String(r.coilCount) },
  { name: 'reference', value: (r) => String(r.reference) },
  { name: 'requested_r', value: (r) => (r.requestedR === null ? '' : r.requestedR.toFixed(2)) },
  { name: 'actual_r', value: fixed(3, (r) => r.actualR) },
  { name: 'acquired', value: fixed(2, (r) => r.acquired) },
  { name: 'acquired_unit', value: (r) => r.acquiredUnit },
  { name: 'scan_s', value: fixed(3, (r) => r.scanSeconds) },
  { name: 'scan_mmss', value: (r) => r.scanFormatted },
  { name: 'time_saved_pct', value: fixed(2, (r) => r.timeSavedPct) },
  { name: 'effective_te_ms', value: fixed(1, (r) => r.effectiveTeMs ?? null, '') },
  { name: 'nrmse_mean', value: fixed(6, (r) => r.metrics.nrmse.mean) },
  { name: 'nrmse_sd', value: fixed(6, (r) => r.metrics.nrmse.sd, '') },
  { name: 'psnr_db_mean', value: fixed(3, (r) => r.metrics.psnr.mean) },
  { name: 'psnr_db_sd', value: fixed(3, (r) => r.metrics.psnr.sd, '') },
  { name: 'ssim_mean', value: fixed(6, (r) => r.metrics.ssim.mean) },
  { name: 'ssim_sd', value: fixed(6, (r) => r.metrics.ssim.sd, '') },
  { name: 'hfen_mean', value: fixed(6, (r) => r.metrics.hfen.mean) },
  { name: 'hfen_sd', value: fixed(6, (r) => r.metrics.hfen.sd, '') },
  { name: 'g_factor_mean', value: fixed(4, (r) => r.gFactorMean, '') },
  { name: 'g_factor_max', value: fixed(4, (r) => r.gFactorMax, '') },
  { name: 'g_factor_method', value: (r) => r.gFactorMethod ?? '' },
  { name: 'iterations_run', value: fixed(1, (r) => r.iterationsRun ?? null, '') },
  { name: 'iteration_limit', value: (r) => (r.iterationLimit == null ? '' : String(r.iterationLimit)) },
  { name: 'converged', value: (r) => (r.converged == null ? '' : String(r.converged)) },
  { name: 'recon_ms', value: fixed(1, (r) => r.reconMs) },
  { name: 'seeds', value: (r) => String(r.seeds) },
  { name: 'pareto', value: (r) => String(r.pareto) },
  { name: 'meets_target', value: (r) => (r.meetsTarget === null ? '' : String(r.meetsTarget)) },
];

/** The fidelity column group (plans with lesions): each task score's mean and sd, empty where a row has none. */
export const fidelityCsvColumns: readonly Column[] = taskMetricNames.flatMap((m) => {
  const decimals = taskMetrics[m].decimals + 2;
  const read = (key: 'mean' | 'sd') => (r: PlanRow) => {
    const summary = r.fidelity?.[m];
    if (!summary) return '';
    const v = summary[key];
    return v === null ? (key === 'mean' ? 'Infinity' : '') : v.toFixed(decimals);
  };
  const name = m.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`);
  return [
    { name: `${name}_mean`, value: read('mean') },
    { name: `${name}_sd`, value: read('sd') },
  ];
});

/**
 * The acquisition column of a volume plan ('3d' or 'multi-slice', design §2.5), placed after
 * coil_count. Only volume plans carry it, so a 2D plan's header stays as it was.
 */
export const acquisitionCsvColumn: Column = { name: 'acquisition', value: (r) => r.acquisition ?? '' };

/** The columns of a table: the fixed ones, a volume plan's acquisition, a lesion plan's fidelity group. */
function tableColumns(table: PlanTable): readonly Column[] {
  const columns = [...csvColumns];
  if (table.rows.some((r) => r.acquisition !== undefined)) {
    columns.splice(columns.findIndex((c) => c.name === 'coil_count') + 1, 0, acquisitionCsvColumn);
  }
  if (table.rows.some((r) => r.fidelity)) columns.push(...fidelityCsvColumns);
  return columns;
}

/** RFC 4180 field: quoted when it holds a comma, a double quote, CR or LF; inner quotes doubled. */
export function csvField(text: string): string {
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** The tradeoff table as RFC 4180 CSV: header row, one record per table row, every record ends in CRLF. */
export function tableToCsv(table: PlanTable): string {
  const columns = tableColumns(table);
  const lines = [columns.map((c) => csvField(c.name)).join(',')];
  for (const row of table.rows) lines.push(columns.map((c) => csvField(c.value(row))).join(','));
  return `${lines.join('\r\n')}\r\n`;
}
