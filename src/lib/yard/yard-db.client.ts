// The phone's own store for yard work (IndexedDB through `idb`): scans waiting
// to be sent, scans the server refused (kept until the user dismisses them),
// and the depot snapshot the offline screens read.
import { openDB, type DBSchema, type IDBPDatabase } from 'idb';
import type { QueuedScan, RefusedScan } from './scan-queue-state';
import type { DepotSnapshot } from './yard-offline';

export interface StoredSnapshot {
  userId: number;
  snapshot: DepotSnapshot;
  storedAt: string;
}

interface YardSchema extends DBSchema {
  queue: { key: string; value: QueuedScan; indexes: { bySeq: number } };
  refused: { key: string; value: RefusedScan };
  snapshot: { key: number; value: StoredSnapshot };
}

export type YardDb = IDBPDatabase<YardSchema>;

let dbPromise: Promise<YardDb> | null = null;

export function yardDb(): Promise<YardDb> {
  dbPromise ??= openDB<YardSchema>('loopfold-yard', 1, {
    upgrade(db) {
      const queue = db.createObjectStore('queue', { keyPath: 'clientEventId' });
      queue.createIndex('bySeq', 'seq');
      db.createObjectStore('refused', { keyPath: 'clientEventId' });
      db.createObjectStore('snapshot', { keyPath: 'userId' });
    },
  });
  return dbPromise;
}

/** The signed-in user, as the yard shell states it in a meta tag (null on other pages). */
export function currentUserId(): number | null {
  const v = document.querySelector<HTMLMetaElement>('meta[name="loopfold-user"]')?.content;
  const n = Number(v);
  return Number.isInteger(n) && n > 0 ? n : null;
}
