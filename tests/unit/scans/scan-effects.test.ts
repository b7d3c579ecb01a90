import { describe, test, expect } from 'vitest';
import { decide, type BinState } from '@/lib/scans/lifecycle';
import { assetAfter, binState, logRows, tripChanges, tripOpening, type AssetSnapshot, type Allowed } from '@/lib/scans/scan-effects';
import { replayState } from '@/lib/scans/event-replay';

// Hand-worked cases: what one allowed scan writes. The rule table itself is tested in lifecycle.test.ts.
const at = new Date('2026-05-04T10:00:00Z');
const depotBin: AssetSnapshot = {
  status: 'prepared',
  siteId: 3,
  siteSince: new Date('2026-05-01T08:00:00Z'),
  customerId: null,
  currentTripId: null,
  leg: null,
  prepChecked: true,
  linerLotId: 9,
  filled: false,
  tripCount: 2,
  lastScanAt: new Date('2026-05-02T08:00:00Z'),
};
const allowed = (state: BinState, action: Parameters<typeof decide>[1], ctx: Partial<Parameters<typeof decide>[2]>): Allowed => {
  const d = decide(state, action, { role: 'planner', today: '2026-05-04', siteId: null, siteKind: null, ...ctx });
  if (!d.ok) throw new Error(d.reason);
  return d;
};

describe('scan effects', () => {
  test('a hire dispatch opens a trip from the bin’s depot to the order’s delivery site and puts the bin on the road', () => {
    const d = allowed(binState(depotBin, 'depot', '2027-01-01'), 'dispatch', { siteId: '3', siteKind: 'depot', purpose: 'hire' });
    const o = tripOpening(
      depotBin,
      { action: 'dispatch', hireOrderId: 5 },
      { id: 3, kind: 'depot', organisationId: 1 },
      { id: 5, customerId: 7, depotSiteId: 3, deliverySiteId: 12 },
      at,
    );
    expect(o).toEqual({ customerId: 7, depotSiteId: 3, customerSiteId: 12, linerLotId: 9, dispatchedAt: at, deliveredAt: null, hireOrderId: 5, loadId: null });
    const next = assetAfter(depotBin, d, { tripId: 40, customerId: 7 }, at);
    expect(next).toMatchObject({ status: 'in_transit', siteId: null, siteSince: at, currentTripId: 40, customerId: 7, tripCount: 2, lastScanAt: at });
  });

  test('a discharge whose verified seals differ from those applied flags a seal mismatch', () => {
    const onHire: AssetSnapshot = { ...depotBin, status: 'on_hire', siteId: 12, customerId: 7, currentTripId: 40, filled: true };
    const d = allowed(binState(onHire, 'customer', '2027-01-01'), 'discharge', { siteId: '12', siteKind: 'customer' });
    const same = tripChanges({ action: 'discharge', sealsVerified: ['B', 'A'] }, d, { id: 12, kind: 'customer', organisationId: 7 }, ['A', 'B'], at);
    expect(same.flags).toEqual([]);
    expect(same.set).toEqual({ discharged_at: at, discharge_site_id: 12, seals_verified: ['B', 'A'] });
    const other = tripChanges({ action: 'discharge', sealsVerified: ['A', 'C'] }, d, { id: 12, kind: 'customer', organisationId: 7 }, ['A', 'B'], at);
    expect(other.flags).toEqual(['seal_mismatch']);
    expect(other.set.seal_mismatch).toBe(true);
  });

  test('an offline scan older than the last one keeps the later last-scan time', () => {
    const d = allowed(binState({ ...depotBin, status: 'available', prepChecked: false, linerLotId: null }, 'depot', '2027-01-01'), 'prep_check', {
      siteId: '3',
      siteKind: 'depot',
      prepResult: 'pass',
    });
    const early = new Date('2026-05-01T09:00:00Z');
    expect(assetAfter({ ...depotBin, status: 'available' }, d, null, early).lastScanAt).toEqual(depotBin.lastScanAt);
  });

  test('inferred steps are logged a millisecond apart just before the scan, and the log replays to the new state', () => {
    // Received at a depot while the records still have it waiting at the customer: the collection is inferred.
    const waiting: AssetSnapshot = { ...depotBin, status: 'awaiting_collection', siteId: 12, customerId: 7, currentTripId: 40, prepChecked: false, linerLotId: null };
    const d = allowed(binState(waiting, 'customer', '2027-01-01'), 'receive', { siteId: '3', siteKind: 'depot' });
    expect(d.inferred.length).toBeGreaterThan(0);
    const rows = logRows({ action: 'receive', clientEventId: 'c1' }, at, waiting.status, d, [], {});
    expect(rows.map((r) => r.occurredAt.getTime())).toEqual([...d.inferred.map((_, i) => at.getTime() - d.inferred.length + i), at.getTime()]);
    expect(rows.slice(0, -1).every((r) => r.inferred && r.flagged && r.payload.inferredBy === 'c1')).toBe(true);
    const next = assetAfter(waiting, d, null, at);
    const replayed = replayState([
      { occurredAt: depotBin.siteSince!, inferred: false, voided: false, payload: { patch: { status: 'awaiting_collection', siteId: '12' }, trip: 'open' } },
      ...rows.map((r) => ({ occurredAt: r.occurredAt, inferred: r.inferred, voided: false, payload: r.payload as never })),
    ]);
    expect({ status: replayed.status, siteId: replayed.siteId, tripOpen: replayed.tripOpen }).toEqual({
      status: next.status,
      siteId: next.siteId,
      tripOpen: next.currentTripId !== null,
    });
  });
});
