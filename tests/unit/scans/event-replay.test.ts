import { describe, test, expect } from 'vitest';
import { replayState, type LoggedEvent } from '@/lib/scans/event-replay';

// Hand-written logs: what the rule table recorded for each scan (patch + trip effect).
const ev = (at: string, patch: LoggedEvent['payload'], extra: Partial<LoggedEvent> = {}): LoggedEvent => ({
  occurredAt: at,
  inferred: false,
  voided: false,
  payload: patch,
  ...extra,
});

describe('re-deriving a bin from its log', () => {
  const rotation: LoggedEvent[] = [
    ev('2026-01-01T08:00:00Z', { patch: { status: 'available', siteId: '1', siteKind: 'depot' }, trip: 'none' }),
    ev('2026-01-02T08:00:00Z', { patch: { status: 'available', prepChecked: true }, trip: 'none' }),
    ev('2026-01-02T08:10:00Z', { patch: { status: 'prepared', linerLotId: '7' }, trip: 'none' }),
    ev('2026-01-03T08:00:00Z', { patch: { status: 'in_transit', leg: 'outbound', siteId: null, siteKind: null, prepChecked: false, tripOpen: true }, trip: 'open' }),
    ev('2026-01-04T08:00:00Z', { patch: { status: 'on_hire', siteId: '9', siteKind: 'customer', leg: null, tripOpen: true }, trip: 'keep' }),
  ];

  test('mid-trip: on hire at the customer site, trip open, liner still recorded', () => {
    const s = replayState(rotation);
    expect(s).toMatchObject({ status: 'on_hire', siteId: 9, leg: null, linerLotId: 7, tripOpen: true, tripCount: 0, prepChecked: false });
    expect(s.siteSince?.toISOString()).toBe('2026-01-04T08:00:00.000Z');
  });

  test('inferred entries and voided scans do not count', () => {
    const log = [
      ...rotation,
      ev('2026-01-20T07:59:59.998Z', null, { inferred: true }),
      ev('2026-01-20T07:59:59.999Z', null, { inferred: true }),
      ev('2026-01-20T08:00:00Z', {
        patch: { status: 'available', siteId: '2', siteKind: 'depot', leg: null, prepChecked: false, linerLotId: null, filled: false, tripOpen: false },
        trip: 'close',
      }),
      ev('2026-01-21T08:00:00Z', { patch: { status: 'quarantine', linerLotId: null, prepChecked: false }, trip: 'none' }, { voided: true }),
    ];
    expect(replayState(log)).toMatchObject({ status: 'available', siteId: 2, tripOpen: false, tripCount: 1, linerLotId: null });
  });

  test('an empty log is an unregistered bin', () => {
    expect(replayState([]).status).toBeNull();
  });
});
