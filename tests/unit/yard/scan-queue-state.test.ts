import { describe, test, expect } from 'vitest';
import {
  applyResults,
  asQueuedBody,
  batchFailure,
  batchesFor,
  markAttempted,
  retryDelayMs,
  verdictFor,
  type EventResult,
  type QueuedScan,
  type QueueState,
} from '@/lib/yard/scan-queue-state';
import { ERROR_STATUS } from '@/lib/api-errors';

let n = 0;
function item(extra: Partial<QueuedScan> = {}): QueuedScan {
  n += 1;
  const id = `00000000-0000-4000-8000-${String(n).padStart(12, '0')}`;
  return {
    clientEventId: id,
    userId: 7,
    body: { clientEventId: id, assetId: n, action: 'prep_check', prepResult: 'pass' },
    label: { grai: null, serial: `S${n}`, action: 'prep_check' },
    seq: n,
    queuedAt: '2026-12-01T08:00:00.000Z',
    attempts: 0,
    lastError: null,
    ...extra,
  };
}
const ok = (q: QueuedScan, replayed = false): EventResult => ({
  clientEventId: q.clientEventId,
  ok: true,
  outcome: { clientEventId: q.clientEventId, replayed, assetId: 1, grai: 'g', action: 'prep_check', statusTo: 'available', inferred: [] },
});
const fail = (q: QueuedScan, code: keyof typeof ERROR_STATUS, details?: unknown): EventResult => ({
  clientEventId: q.clientEventId,
  ok: false,
  status: ERROR_STATUS[code],
  error: { code, message: `${code} message`, ...(details ? { details } : {}) },
});

describe('what an answer means for a queued scan', () => {
  // HTTP semantics (RFC 9110 §15): 5xx = the server failed, the request may be repeated; 429 (RFC 6585) = later.
  // 401/403: the session, not the scan, is the problem. Other 4xx: the server judged the scan itself.
  test.each([
    ['transition_refused', 'refused'],
    ['changed_meanwhile', 'refused'],
    ['not_found', 'refused'],
    ['validation_failed', 'refused'],
    ['duplicate', 'refused'],
    ['unprocessable', 'refused'],
    ['internal', 'retry'],
    ['unavailable', 'retry'],
    ['rate_limited', 'retry'],
    ['unauthenticated', 'retry'],
    ['forbidden', 'retry'],
  ] as const)('%s → %s', (code, verdict) => {
    expect(verdictFor(fail(item(), code))).toBe(verdict);
  });
  test('recorded, and a replay of one already recorded counts as recorded', () => {
    const q = item();
    expect(verdictFor(ok(q))).toBe('recorded');
    expect(verdictFor(ok(q, true))).toBe('recorded');
  });
  test('no answer at all (status 0) → retry', () => {
    expect(verdictFor({ clientEventId: 'x', ok: false, status: 0, error: { code: 'network', message: '' } })).toBe('retry');
  });
});

describe('folding a sync into the queue', () => {
  test('recorded leave, refused move to the refused list with the rule’s reason, the rest wait one attempt more', () => {
    const [a, b, c, d] = [item(), item(), item(), item()];
    const state: QueueState = { pending: [a!, b!, c!, d!], refused: [] };
    const r = applyResults(state, [ok(a!), fail(b!, 'transition_refused', { reason: 'inspection_lapsed', action: 'fit_liner' }), fail(c!, 'internal')], '2026-12-01T09:00:00.000Z');
    expect(r.recorded.map((o) => o.clientEventId)).toEqual([a!.clientEventId]);
    expect(r.state.pending.map((p) => p.clientEventId)).toEqual([c!.clientEventId, d!.clientEventId]);
    expect(r.state.pending[0]).toMatchObject({ attempts: 1, lastError: 'internal message' });
    expect(r.state.pending[1]).toEqual(d); // not in this sync: untouched
    expect(r.newlyRefused).toHaveLength(1);
    expect(r.state.refused[0]).toMatchObject({
      clientEventId: b!.clientEventId,
      code: 'transition_refused',
      reason: 'inspection_lapsed',
      message: 'transition_refused message',
      refusedAt: '2026-12-01T09:00:00.000Z',
    });
  });

  test('earlier refusals stay listed until dismissed', () => {
    const [a, b] = [item(), item()];
    const first = applyResults({ pending: [a!, b!], refused: [] }, [fail(a!, 'not_found')], 't1');
    const second = applyResults(first.state, [ok(b!)], 't2');
    expect(second.state.refused.map((r) => r.clientEventId)).toEqual([a!.clientEventId]);
    expect(second.state.pending).toEqual([]);
  });

  test('a refusal the user is watching on screen is shown there, not listed again', () => {
    const a = item();
    const r = applyResults({ pending: [a], refused: [] }, [fail(a, 'changed_meanwhile')], 't', new Set([a.clientEventId]));
    expect(r.state).toEqual({ pending: [], refused: [] });
    expect(r.newlyRefused).toEqual([]);
  });

  test('a refusal without a rule code keeps reason null', () => {
    const a = item();
    expect(applyResults({ pending: [a], refused: [] }, [fail(a, 'validation_failed', [{ path: 'x', message: 'y' }])], 't').state.refused[0]!.reason).toBeNull();
  });

  test('an attempt that reached nobody keeps every scan, one attempt more', () => {
    const [a, b] = [item(), item()];
    const s = markAttempted({ pending: [a!, b!], refused: [] }, new Set([a!.clientEventId]), 'No connection');
    expect(s.pending[0]).toMatchObject({ attempts: 1, lastError: 'No connection' });
    expect(s.pending[1]).toEqual(b);
  });
});

describe('sending', () => {
  test('only this user’s scans, oldest first, in batches the endpoint accepts (max 200)', () => {
    const mine = [item({ seq: 30 }), item({ seq: 10 }), item({ seq: 20 })];
    const theirs = item({ userId: 8, seq: 5 });
    const batches = batchesFor([...mine, theirs], 7, 2);
    expect(batches.map((b) => b.map((q) => q.seq))).toEqual([[10, 20], [30]]);
    expect(batchesFor([theirs], 7)).toEqual([]);
    expect(
      batchesFor(
        Array.from({ length: 120 }, () => item()),
        7,
      ).map((b) => b.length),
    ).toEqual([50, 50, 20]);
  });

  test.each([
    [0, 'offline'],
    [401, 'signed_out'],
    [403, 'signed_out'],
    [400, 'split'],
    [413, 'split'],
    [500, 'retry'],
    [503, 'retry'],
    [429, 'retry'],
  ] as const)('a whole batch failing with %s → %s', (status, kind) => {
    expect(batchFailure(status)).toBe(kind);
  });

  test('retry delays back off from 5 s to a minute', () => {
    expect([0, 1, 2, 3, 4, 5, 9].map(retryDelayMs)).toEqual([5_000, 5_000, 10_000, 20_000, 40_000, 60_000, 60_000]);
  });

  test('a queued scan no longer claims the version its screen showed; everything else is kept', () => {
    const body = { clientEventId: 'x', assetId: 4, action: 'quarantine' as const, expectedVersion: 12, siteId: 3, note: 'cracked floor' };
    expect(asQueuedBody(body)).toEqual({ clientEventId: 'x', assetId: 4, action: 'quarantine', siteId: 3, note: 'cracked floor' });
  });
});
