/**
 * A short label of a stored plan for lists: source, matrix, what it sweeps, seeds
 * ("shepp-logan-modified 64×64 · cartesian-random, poisson-disc × R 2, 4 × zero-filled, cs-tv · 2 seeds").
 * Read loosely from the stored body, so a plan an earlier version stored still gets one; an upload is
 * named "uploaded image", never by its id.
 */
export function planLabel(body: unknown): string {
  const plan = isRecord(body) ? body : {};
  const source = isRecord(plan.source) ? plan.source : {};
  const what = typeof source.phantom === 'string' ? source.phantom : 'uploaded image';
  const matrix = isRecord(plan.matrix) ? `${plan.matrix.ny}×${plan.matrix.nx}` : '?';
  const names = (list: unknown, key: string) =>
    [...new Set((Array.isArray(list) ? list : []).map((s) => (isRecord(s) ? String(s[key]) : '?')))].join(
      ', ',
    );
  const accelerations = Array.isArray(plan.accelerations) ? plan.accelerations.join(', ') : '?';
  const seeds = typeof plan.seeds === 'number' ? plan.seeds : 1;
  const label =
    `${what} ${matrix} · ${names(plan.patterns, 'pattern')} × R ${accelerations} × ` +
    `${names(plan.methods, 'name')} · ${seeds} seed${seeds === 1 ? '' : 's'}`;
  return label.length > 160 ? `${label.slice(0, 159)}…` : label;
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}
