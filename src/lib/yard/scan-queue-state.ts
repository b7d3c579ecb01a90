// The offline scan queue's bookkeeping, kept pure so it can be tested without
// a browser: which answers from POST /api/scan-events mean "recorded", which
// mean "refused for good" (the user must see the reason), and which only mean
// "try again later" (no signal, server busy, signed out). Nothing a yard hand
// recorded leaves the queue except as recorded or as a refusal they can read.
import type { Action } from '@/lib/scans/lifecycle';
import type { ScanEventBody } from '@/lib/scans/scan-schema';

export interface QueuedScan {
  clientEventId: string;
  /** Whose scan it is: only that user's session may send it. */
  userId: number;
  body: ScanEventBody;
  /** What the phone showed, for the waiting and refused lists. */
  label: { grai: string | null; serial: string | null; action: Action };
  /** Queue order (monotonic on the device). */
  seq: number;
  queuedAt: string;
  attempts: number;
  lastError: string | null;
}

export interface RefusedScan extends QueuedScan {
  refusedAt: string;
  /** Error code from the API catalogue (transition_refused, changed_meanwhile, not_found …). */
  code: string;
  /** The rule table's refusal code when there is one (inspection_lapsed, prep_check_needed …). */
  reason: string | null;
  message: string;
}

export interface RecordedOutcome {
  clientEventId: string;
  replayed: boolean;
  assetId: number;
  grai: string;
  action: Action;
  statusTo: string;
  inferred: Action[];
  /** The server's id of the recorded scan (undo names it). */
  eventId?: number;
}

export type EventResult =
  | { clientEventId: string; ok: true; outcome: RecordedOutcome }
  | { clientEventId: string; ok: false; status: number; error: { code: string; message: string; details?: unknown } };

export type Verdict = 'recorded' | 'refused' | 'retry';

/**
 * recorded: the server has it (a replay of one it already had counts too).
 * retry: nothing was decided (no signal, 5xx, rate limit, signed out or role
 * not allowed right now): the scan stays queued.
 * refused: the server looked at the scan and said no; sending it again cannot help.
 */
export function verdictFor(r: EventResult): Verdict {
  if (r.ok) return 'recorded';
  if (r.status === 0 || r.status >= 500 || r.status === 429 || r.status === 401 || r.status === 403) return 'retry';
  return 'refused';
}

export type BatchFailure = 'offline' | 'signed_out' | 'split' | 'retry';

/** What to do when the batch request as a whole failed (no per-event answers came back). */
export function batchFailure(status: number): BatchFailure {
  if (status === 0) return 'offline';
  if (status === 401 || status === 403) return 'signed_out';
  // The batch schema refuses the whole batch when one event is malformed: send them one by one,
  // so only the malformed one is refused.
  if (status === 400 || status === 413) return 'split';
  return 'retry';
}

export interface QueueState {
  pending: QueuedScan[];
  refused: RefusedScan[];
}

export interface Applied {
  state: QueueState;
  recorded: RecordedOutcome[];
  /** Refusals the user has not seen yet (they stay listed until dismissed). */
  newlyRefused: RefusedScan[];
}

/**
 * Folds a sync's answers into the queue. `direct` names scans whose answer the
 * user is waiting for on screen: a refusal of one of those is shown there and
 * then, so it does not also go to the refused list.
 */
export function applyResults(state: QueueState, results: readonly EventResult[], now: string, direct: ReadonlySet<string> = new Set()): Applied {
  const byId = new Map(results.map((r) => [r.clientEventId, r]));
  const pending: QueuedScan[] = [];
  const recorded: RecordedOutcome[] = [];
  const newlyRefused: RefusedScan[] = [];
  for (const item of state.pending) {
    const r = byId.get(item.clientEventId);
    if (!r) {
      pending.push(item);
      continue;
    }
    const verdict = verdictFor(r);
    if (verdict === 'recorded' && r.ok) {
      recorded.push(r.outcome);
    } else if (verdict === 'refused' && !r.ok) {
      if (!direct.has(item.clientEventId)) newlyRefused.push(refusalOf(item, r, now));
    } else {
      pending.push({ ...item, attempts: item.attempts + 1, lastError: r.ok ? null : r.error.message });
    }
  }
  return { state: { pending, refused: [...state.refused, ...newlyRefused] }, recorded, newlyRefused };
}

function refusalOf(item: QueuedScan, r: Extract<EventResult, { ok: false }>, now: string): RefusedScan {
  const details = r.error.details as { reason?: unknown } | undefined;
  return {
    ...item,
    attempts: item.attempts + 1,
    lastError: r.error.message,
    refusedAt: now,
    code: r.error.code,
    reason: typeof details?.reason === 'string' ? details.reason : null,
    message: r.error.message,
  };
}

/** A whole attempt failed (no signal, server down): every scan in it stays queued, one attempt more. */
export function markAttempted(state: QueueState, ids: ReadonlySet<string>, message: string): QueueState {
  return { ...state, pending: state.pending.map((p) => (ids.has(p.clientEventId) ? { ...p, attempts: p.attempts + 1, lastError: message } : p)) };
}

/** The scans this user may send now, oldest first, in batches the endpoint accepts. */
export function batchesFor(pending: readonly QueuedScan[], userId: number, size = 50): QueuedScan[][] {
  const mine = pending.filter((p) => p.userId === userId).sort((a, b) => a.seq - b.seq);
  const out: QueuedScan[][] = [];
  for (let i = 0; i < mine.length; i += size) out.push(mine.slice(i, i + size));
  return out;
}

/** When to try again after `failures` attempts in a row that reached nobody: 5 s, 10 s, 20 s … at most a minute. */
export function retryDelayMs(failures: number): number {
  if (failures <= 0) return 5_000;
  return Math.min(60_000, 5_000 * 2 ** (failures - 1));
}

/** A scan stored while offline no longer claims the version the user saw: see src/lib/yard/README.md, "Scanning and offline". */
export function asQueuedBody(body: ScanEventBody): ScanEventBody {
  const { expectedVersion: _seen, ...rest } = body;
  return rest as ScanEventBody;
}
