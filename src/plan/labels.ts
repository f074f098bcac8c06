/**
 * Short human labels for a plan's patterns and methods: the name alone when it is unique in the plan,
 * otherwise the name with the parameters that tell the entries apart ("cs-tv (lambda 0.01)"), and a
 * position as the last resort ("custom [2]").
 */
export function specLabels(specs: readonly Record<string, unknown>[], nameKey: string): string[] {
  const names = specs.map((spec) => String(spec[nameKey]));
  const details = specs.map((spec) => describeParameters(spec, nameKey));
  const labels = specs.map((_, i) => {
    if (names.filter((n) => n === names[i]).length === 1) return names[i];
    return details[i] === '' ? names[i] : `${names[i]} (${details[i]})`;
  });
  return labels.map((label, i) =>
    labels.filter((l) => l === label).length === 1 ? label : `${label} [${i + 1}]`,
  );
}

/** "acs 24, density.power 2": scalar parameters in key order; embedded mask images left out. */
function describeParameters(spec: Record<string, unknown>, nameKey: string, prefix = ''): string {
  const parts: string[] = [];
  for (const key of Object.keys(spec).sort()) {
    if (prefix === '' && (key === nameKey || key === 'maskPng' || key === 'table')) continue;
    const value = spec[key];
    if (value !== null && typeof value === 'object' && !Array.isArray(value)) {
      const inner = describeParameters(value as Record<string, unknown>, nameKey, `${prefix}${key}.`);
      if (inner !== '') parts.push(inner);
    } else if (value !== undefined) {
      parts.push(`${prefix}${key} ${Array.isArray(value) ? value.join('×') : String(value)}`);
    }
  }
  return parts.join(', ');
}
