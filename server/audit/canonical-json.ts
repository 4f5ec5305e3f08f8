/**
 * JSON with object keys sorted at every level and no whitespace, so the same value always gives
 * the same text (and the same hash). Undefined members are dropped, as JSON.stringify does;
 * non-finite numbers, functions and symbols are refused rather than silently changed.
 */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(normalise(value, '$'));
}

function normalise(value: unknown, path: string): unknown {
  if (value === null || typeof value === 'string' || typeof value === 'boolean') return value;
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) throw new Error(`canonicalJson: ${path} is not a finite number`);
    return value;
  }
  if (value instanceof Date) return value.toISOString();
  if (Array.isArray(value)) return value.map((item, index) => (item === undefined ? null : normalise(item, `${path}[${index}]`)));
  if (typeof value === 'object') {
    const out: Record<string, unknown> = {};
    for (const key of Object.keys(value).sort()) {
      const member = (value as Record<string, unknown>)[key];
      if (member !== undefined) out[key] = normalise(member, `${path}.${key}`);
    }
    return out;
  }
  throw new Error(`canonicalJson: ${path} has type ${typeof value}, which JSON cannot hold`);
}
