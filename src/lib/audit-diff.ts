// An audit entry keeps what changed, not whole records: given two snapshots of
// the same record, keep only the fields whose values differ, on both sides.

export type Snapshot = Record<string, unknown>;

function same(a: unknown, b: unknown): boolean {
  if (a instanceof Date || b instanceof Date) {
    return a instanceof Date && b instanceof Date && a.getTime() === b.getTime();
  }
  if (a !== null && b !== null && typeof a === 'object' && typeof b === 'object') {
    return JSON.stringify(a) === JSON.stringify(b);
  }
  return Object.is(a, b);
}

/** The changed fields of `before` → `after` (a field missing on one side counts as null). */
export function changedFields(before: Snapshot, after: Snapshot): { before: Snapshot; after: Snapshot } | null {
  const keys = new Set([...Object.keys(before), ...Object.keys(after)]);
  const b: Snapshot = {};
  const a: Snapshot = {};
  for (const k of keys) {
    const was = before[k] ?? null;
    const now = after[k] ?? null;
    if (!same(was, now)) {
      b[k] = was;
      a[k] = now;
    }
  }
  return Object.keys(a).length ? { before: b, after: a } : null;
}
