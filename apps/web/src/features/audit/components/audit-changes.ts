// What an audit event changed, field by field, in words a QA manager can read at a glance.
export interface FieldChange {
  field: string;
  from: string;
  to: string;
}

const hidden = new Set(['id', 'organizationId', 'updatedAt', 'createdAt', 'version', 'passwordHash']);

function show(value: unknown, names: ReadonlyMap<string, string>): string {
  if (value === undefined || value === null || value === '') return '—';
  if (typeof value === 'string') return names.get(value) ?? value;
  if (typeof value === 'number' || typeof value === 'boolean') return String(value);
  if (Array.isArray(value)) return value.map((v) => show(v, names)).join(', ') || '—';
  if (typeof value === 'object') {
    const record = value as Record<string, unknown>;
    if (typeof record.name === 'string') return typeof record.code === 'string' ? `${record.code} · ${record.name}` : record.name;
    return JSON.stringify(value);
  }
  return JSON.stringify(value);
}

function asRecord(value: unknown): Record<string, unknown> {
  return value && typeof value === 'object' && !Array.isArray(value) ? (value as Record<string, unknown>) : {};
}

/** `names` turns ids (of shops, say) into the words people know them by. */
export function describeChanges(before: unknown, after: unknown, names: ReadonlyMap<string, string> = new Map()): FieldChange[] {
  const a = asRecord(before);
  const b = asRecord(after);
  const fields = [...new Set([...Object.keys(a), ...Object.keys(b)])].filter((f) => !hidden.has(f));
  return fields
    .filter((f) => JSON.stringify(a[f]) !== JSON.stringify(b[f]))
    .map((field) => ({ field, from: show(a[field], names), to: show(b[field], names) }));
}

/** "welder.moved" → "Welder moved"; "shop.created" → "Shop created". */
export function actionLabel(action: string): string {
  const words = action.replace(/[._-]+/g, ' ').trim();
  return words.charAt(0).toUpperCase() + words.slice(1);
}
