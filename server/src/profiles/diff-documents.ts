import type { ParameterChange } from '@clearbase/contracts';

/**
 * Flattens a JSON value to leaf paths in the profile document's path style.
 * @example flattenDocument({ curves: { red: { points: [{ density: 0 }] } } }) // Map { 'curves.red.points[0].density' => 0 }
 */
export function flattenDocument(
  value: unknown,
  prefix = '',
  out = new Map<string, unknown>(),
): Map<string, unknown> {
  if (Array.isArray(value)) {
    if (value.length === 0) out.set(prefix, []);
    value.forEach((item, i) => flattenDocument(item, `${prefix}[${i}]`, out));
  } else if (value !== null && typeof value === 'object') {
    const entries = Object.entries(value);
    if (entries.length === 0) out.set(prefix, {});
    for (const [key, item] of entries) flattenDocument(item, prefix ? `${prefix}.${key}` : key, out);
  } else {
    out.set(prefix, value);
  }
  return out;
}

/**
 * Lists the parameters that differ between two documents, in the order of the first, then paths only the second has.
 * A path missing on one side has null there.
 * @example diffDocuments({ saturation: 1 }, { saturation: 1.2 }) // [{ path: 'saturation', before: 1, after: 1.2 }]
 */
export function diffDocuments(before: unknown, after: unknown): ParameterChange[] {
  const a = flattenDocument(before);
  const b = flattenDocument(after);
  const changes: ParameterChange[] = [];
  for (const [path, value] of a) {
    const other = b.has(path) ? b.get(path) : null;
    if (JSON.stringify(value) !== JSON.stringify(other)) changes.push({ path, before: value, after: other });
  }
  for (const [path, value] of b) if (!a.has(path)) changes.push({ path, before: null, after: value });
  return changes;
}
