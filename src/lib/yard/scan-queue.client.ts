// Every yard scan goes through this queue. A scan is stored on the phone first
// (IndexedDB), then everything waiting is sent in order through
// POST /api/scan-events { events } with its client event id, so a resend after
// a lost answer is recorded once (the server replays the first answer).
// Without signal the scan simply waits; it syncs on the `online` event, on page
// load and periodically (src/lib/yard/yard-sync.client.ts). A scan the server
// refuses stays listed with its reason until the user dismisses it, so nothing
// is lost silently. The bookkeeping rules are pure: src/lib/yard/scan-queue-state.ts.
import { currentUserId, yardDb } from './yard-db.client';
import {
  applyResults,
  asQueuedBody,
  batchFailure,
  batchesFor,
  markAttempted,
  verdictFor,
  type EventResult,
  type QueuedScan,
  type RecordedOutcome,
  type RefusedScan,
} from './scan-queue-state';
import type { ScanEventBody } from '@/lib/scans/scan-schema';

export type SubmitResult =
  | { kind: 'recorded'; outcome: RecordedOutcome }
  | { kind: 'queued'; waiting: number }
  | { kind: 'refused'; code: string; message: string; reason: string | null };

export interface QueueStatus {
  /** The last attempt to reach Loopfold got an answer (and the browser thinks it has a network). */
  online: boolean;
  syncing: boolean;
  /** This user's waiting scans, oldest first. */
  pending: QueuedScan[];
  /** This user's refused scans, until dismissed. */
  refused: RefusedScan[];
  /** The session ran out: waiting scans go once the user signs in again. */
  needsSignIn: boolean;
  lastContactAt: string | null;
  /** Attempts in a row that reached nobody (drives the retry delay). */
  failures: number;
  /** Bumps whenever a sync recorded something (the depot snapshot is then stale). */
  recordedCount: number;
}

const DIRECT_TIMEOUT_MS = 8_000;
const SYNC_TIMEOUT_MS = 15_000;

let status: QueueStatus = {
  online: typeof navigator === 'undefined' ? true : navigator.onLine,
  syncing: false,
  pending: [],
  refused: [],
  needsSignIn: false,
  lastContactAt: null,
  failures: 0,
  recordedCount: 0,
};
const listeners = new Set<(s: QueueStatus) => void>();

function emit(patch: Partial<QueueStatus>) {
  status = { ...status, ...patch };
  for (const l of listeners) l(status);
}

export function queueStatus(): QueueStatus {
  return status;
}

async function reload(): Promise<void> {
  const userId = currentUserId();
  const db = await yardDb();
  const [pending, refusedAll] = await Promise.all([db.getAllFromIndex('queue', 'bySeq'), db.getAll('refused')]);
  emit({
    pending: pending.filter((p) => p.userId === userId),
    refused: refusedAll.filter((r) => r.userId === userId).sort((a, b) => a.refusedAt.localeCompare(b.refusedAt)),
  });
}

/** Calls `fn` now and on every change (the indicator, the offline card). */
export function subscribe(fn: (s: QueueStatus) => void): () => void {
  listeners.add(fn);
  fn(status);
  void reload();
  return () => {
    listeners.delete(fn);
  };
}

export async function refused(): Promise<RefusedScan[]> {
  await reload();
  return status.refused;
}

export async function dismissRefused(clientEventId: string): Promise<void> {
  const db = await yardDb();
  await db.delete('refused', clientEventId);
  await reload();
}

// -------------------------------------------------------------------------------------------------
// Talking to the server.

type ErrorBody = { code: string; message: string; details?: unknown };
type Answer = { ok: true; data: unknown } | { ok: false; status: number; error: ErrorBody };
type Envelope = { data?: unknown; error?: ErrorBody };

async function request(method: 'GET' | 'POST', path: string, body: unknown, timeoutMs: number): Promise<Answer> {
  const ctl = new AbortController();
  const timer = setTimeout(() => ctl.abort(), timeoutMs);
  try {
    const res = await fetch(path, {
      method,
      credentials: 'same-origin',
      cache: 'no-store',
      headers: body === undefined ? { Accept: 'application/json' } : { 'Content-Type': 'application/json', Accept: 'application/json' },
      body: body === undefined ? undefined : JSON.stringify(body),
      signal: ctl.signal,
    });
    let json: Envelope | null = null;
    try {
      json = (await res.json()) as Envelope;
    } catch {
      /* not JSON: a proxy's error page */
    }
    emit({ online: true, failures: 0, lastContactAt: new Date().toISOString() });
    if (res.ok && json && 'data' in json) return { ok: true, data: json.data };
    return { ok: false, status: res.status, error: json?.error ?? { code: 'internal', message: `Loopfold answered ${res.status}.` } };
  } catch {
    emit({ online: false, failures: status.failures + 1 });
    return { ok: false, status: 0, error: { code: 'network', message: 'No connection to Loopfold.' } };
  } finally {
    clearTimeout(timer);
  }
}

/** GET through the same connection bookkeeping (the depot snapshot uses it). */
export function getJson(path: string, timeoutMs = SYNC_TIMEOUT_MS): Promise<Answer> {
  return request('GET', path, undefined, timeoutMs);
}

/** Is Loopfold reachable right now? A quick look, so a scan on a dead connection goes straight to the offline card. */
export async function serverReachable(timeoutMs = 2_500): Promise<boolean> {
  if (typeof navigator !== 'undefined' && !navigator.onLine) {
    emit({ online: false });
    return false;
  }
  const a = await request('GET', '/api/health', undefined, timeoutMs);
  return a.ok;
}

async function sendBatch(batch: QueuedScan[], timeoutMs: number): Promise<EventResult[] | { failure: ReturnType<typeof batchFailure>; message: string }> {
  const a = await request('POST', '/api/scan-events', { events: batch.map((b) => b.body) }, timeoutMs);
  if (a.ok) return (a.data as { results: EventResult[] }).results;
  const failure = batchFailure(a.status);
  if (failure !== 'split') return { failure, message: a.error.message };
  // One malformed scan fails the whole batch: send them one by one so only that one is refused.
  const out: EventResult[] = [];
  for (const item of batch) {
    const one = await request('POST', '/api/scan-events', item.body, timeoutMs);
    if (one.ok) out.push({ clientEventId: item.clientEventId, ok: true, outcome: one.data as RecordedOutcome });
    else if (one.status === 0)
      break; // the rest stays queued
    else out.push({ clientEventId: item.clientEventId, ok: false, status: one.status, error: one.error });
  }
  return out;
}

// -------------------------------------------------------------------------------------------------
// Syncing: one at a time per page, oldest scans first.

export interface SyncReport {
  results: Map<string, EventResult>;
  reached: boolean;
}

let chain: Promise<unknown> = Promise.resolve();

/** Sends every waiting scan of the signed-in user now. Calls queue up behind each other. */
export function syncNow(direct: ReadonlySet<string> = new Set(), timeoutMs = SYNC_TIMEOUT_MS): Promise<SyncReport> {
  const run = chain.then(() => runSync(direct, timeoutMs));
  chain = run.catch(() => undefined);
  return run;
}

async function runSync(direct: ReadonlySet<string>, timeoutMs: number): Promise<SyncReport> {
  const results = new Map<string, EventResult>();
  const userId = currentUserId();
  if (userId === null) return { results, reached: false };
  const db = await yardDb();
  const batches = batchesFor(await db.getAll('queue'), userId);
  if (batches.length === 0) return { results, reached: status.online };
  emit({ syncing: true });
  let reached = true;
  let recorded = 0;
  try {
    for (const batch of batches) {
      const answers = await sendBatch(batch, timeoutMs);
      if (!Array.isArray(answers)) {
        reached = answers.failure !== 'offline';
        const kept = markAttempted({ pending: batch, refused: [] }, new Set(batch.map((b) => b.clientEventId)), answers.message);
        const tx = db.transaction('queue', 'readwrite');
        await Promise.all([...kept.pending.map((p) => tx.store.put(p)), tx.done]);
        if (answers.failure === 'signed_out') emit({ needsSignIn: true });
        break;
      }
      emit({ needsSignIn: false });
      for (const a of answers) results.set(a.clientEventId, a);
      const applied = applyResults({ pending: batch, refused: [] }, answers, new Date().toISOString(), direct);
      const stillPending = new Set(applied.state.pending.map((p) => p.clientEventId));
      const tx = db.transaction(['queue', 'refused'], 'readwrite');
      const queue = tx.objectStore('queue');
      const refusedStore = tx.objectStore('refused');
      await Promise.all([
        ...batch.filter((b) => !stillPending.has(b.clientEventId)).map((b) => queue.delete(b.clientEventId)),
        ...applied.state.pending.map((p) => queue.put(p)),
        ...applied.newlyRefused.map((r) => refusedStore.put(r)),
        tx.done,
      ]);
      recorded += applied.recorded.length;
    }
  } finally {
    await reload();
    emit({ syncing: false, ...(recorded > 0 ? { recordedCount: status.recordedCount + recorded } : {}) });
  }
  return { results, reached };
}

// -------------------------------------------------------------------------------------------------
// Submitting one scan from a screen.

let lastSeq = 0;
function nextSeq(): number {
  lastSeq = Math.max(Date.now() * 1000, lastSeq + 1);
  return lastSeq;
}

/**
 * Records a scan: stored on the phone, then sent with everything waiting before
 * it. `recorded` when the server took it, `refused` (with the reason) when the
 * server said no, `queued` when there is no signal: it goes later by itself.
 */
export async function submitScan(body: ScanEventBody, label: QueuedScan['label']): Promise<SubmitResult> {
  const userId = currentUserId();
  if (userId === null) return { kind: 'refused', code: 'unauthenticated', message: 'Sign in again to record scans.', reason: null };
  const db = await yardDb();
  const now = new Date().toISOString();
  const item: QueuedScan = {
    clientEventId: body.clientEventId,
    userId,
    body: { occurredAt: now, ...body },
    label,
    seq: nextSeq(),
    queuedAt: now,
    attempts: 0,
    lastError: null,
  };
  await db.put('queue', item);
  await reload();
  const knownOffline = typeof navigator !== 'undefined' && !navigator.onLine;
  const report = knownOffline ? null : await syncNow(new Set([item.clientEventId]), DIRECT_TIMEOUT_MS);
  const r = report?.results.get(item.clientEventId);
  if (r?.ok) return { kind: 'recorded', outcome: r.outcome };
  if (r && !r.ok && verdictFor(r) === 'refused') {
    const details = r.error.details as { reason?: unknown } | undefined;
    return { kind: 'refused', code: r.error.code, message: r.error.message, reason: typeof details?.reason === 'string' ? details.reason : null };
  }
  const stored = await db.get('queue', item.clientEventId);
  if (stored) await db.put('queue', { ...stored, body: asQueuedBody(stored.body) });
  await reload();
  return { kind: 'queued', waiting: status.pending.length };
}

/** The browser says it went offline: show it at once, before any request fails. */
export function noteBrowserOffline(): void {
  emit({ online: false });
}
