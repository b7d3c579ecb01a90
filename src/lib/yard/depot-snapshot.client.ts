// The depot snapshot a yard phone keeps for offline work: fetched from
// GET /api/yard/depot-snapshot when there is signal, stored per user in
// IndexedDB, read by the offline bin card.
import { currentUserId, yardDb, type StoredSnapshot } from './yard-db.client';
import { getJson } from './scan-queue.client';
import type { DepotSnapshot } from './yard-offline';

export async function loadSnapshot(): Promise<StoredSnapshot | null> {
  const userId = currentUserId();
  if (userId === null) return null;
  const db = await yardDb();
  return (await db.get('snapshot', userId)) ?? null;
}

/** Fetches a fresh snapshot and stores it; keeps the old one when there is no signal. */
export async function refreshSnapshot(): Promise<StoredSnapshot | null> {
  const userId = currentUserId();
  if (userId === null) return null;
  const a = await getJson('/api/yard/depot-snapshot');
  if (!a.ok) return loadSnapshot();
  const stored: StoredSnapshot = { userId, snapshot: a.data as DepotSnapshot, storedAt: new Date().toISOString() };
  const db = await yardDb();
  await db.put('snapshot', stored);
  for (const l of listeners) l(stored);
  return stored;
}

const listeners = new Set<(s: StoredSnapshot) => void>();

/** Called with each freshly stored snapshot. */
export function onSnapshot(fn: (s: StoredSnapshot) => void): () => void {
  listeners.add(fn);
  return () => {
    listeners.delete(fn);
  };
}
