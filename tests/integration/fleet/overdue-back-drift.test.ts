// "Overdue back from a customer" is one rule (overdueBack() in src/lib/fleet/overdue-return.ts: more calendar days
// since the delivery — or the dispatch when the delivery was never scanned — than the customer's free days). Three
// places count it in SQL: the fleet grid's "Over free days" flag, the planners' digest and overdueBackSql() itself.
// All are computed here on the same rows and compared with the pure rule. Today is 1 Dec 2026 in Amsterdam
// (UTC+1); day counts at the boundaries are worked by hand in the comments.
import { describe, test, expect } from 'vitest';
import { usePoolWorld } from '../support/fixtures';
import { rawBin, sqlRows } from '../support/hand-made';
import { Organisation } from '@/models';
import { localDate } from '@/lib/calendar';
import { overdueBack, overdueBackSql } from '@/lib/fleet/overdue-return';
import { fetchBinsPage } from '@/lib/fleet/fleet-grid.server';
import { parseGridRequest, type QueryContext } from '@/lib/fleet/grid-query';
import { digestFigures } from '@/lib/jobs/planner-digest.server';
import { loadPoolOverview } from '@/lib/fleet/pool-overview.server';
import type { Status } from '@/lib/scans/lifecycle';

const w = usePoolWorld();
const TZ = 'Europe/Amsterdam';
const CTX: QueryContext = { timeZone: TZ, today: '2026-12-01' };
const NOW = new Date('2026-12-01T11:00:00Z');

describe('overdue back: SQL and overdueBack() agree', () => {
  test('on bins at the day boundaries, moved between sites, never delivered, in other statuses', async () => {
    const b = await Organisation.create({ name: 'Bravo Blending', kind: 'customer', contactEmail: null, freeDays: 21 });
    const A = w.customer.id; // 14 free days
    const on = (customerId: number, status: Status, deliveredAt: string | null, dispatchedAt: string, extra: { siteSince?: string; leg?: string } = {}) =>
      rawBin({
        binTypeId: w.binType.id,
        status,
        customerId,
        siteId: status === 'in_transit' ? null : w.customerSite.id,
        siteSince: extra.siteSince ?? deliveredAt,
        leg: extra.leg ?? null,
        trip: { customerId, depotSiteId: w.depot.id, dispatchedAt, deliveredAt },
      });
    const expected: Record<number, boolean> = {
      // delivered 23:59 local on 16 Nov → 15 days on 1 Dec, one over 14
      [await on(A, 'on_hire', '2026-11-16T22:59:00Z', '2026-11-15T08:00:00Z')]: true,
      // delivered 00:01 local on 17 Nov (23:01 UTC on the 16th) → 14 days, still free
      [await on(A, 'on_hire', '2026-11-16T23:01:00Z', '2026-11-15T08:00:00Z')]: false,
      // delivered 5 Nov, moved to another site of the customer on 25 Nov: 26 days since delivery (site_since said 6)
      [await on(A, 'on_hire', '2026-11-05T10:00:00Z', '2026-11-04T08:00:00Z', { siteSince: '2026-11-25T10:00:00Z' })]: true,
      // delivery never scanned: counted from the dispatch on 10 Nov → 21 days
      [await on(A, 'on_hire', null, '2026-11-10T08:00:00Z')]: true,
      // folded, waiting for collection; delivered 1 Nov → 30 days
      [await on(A, 'awaiting_collection', '2026-11-01T10:00:00Z', '2026-10-31T08:00:00Z')]: true,
      // on the road back: the rule does not apply, however long ago the delivery was
      [await on(A, 'in_transit', '2026-09-01T10:00:00Z', '2026-08-31T08:00:00Z', { leg: 'return' })]: false,
      // delivered "tomorrow" (a phone's clock): zero days, not negative
      [await on(A, 'on_hire', '2026-12-02T10:00:00Z', '2026-12-01T08:00:00Z')]: false,
      // 21 free days: 9 Nov → 22 days (over), 10 Nov → 21 days (not)
      [await on(b.id, 'on_hire', '2026-11-09T12:00:00Z', '2026-11-08T08:00:00Z')]: true,
      [await on(b.id, 'on_hire', '2026-11-10T12:00:00Z', '2026-11-09T08:00:00Z')]: false,
    };
    // at a depot, no trip
    expected[await rawBin({ binTypeId: w.binType.id, status: 'available', siteId: w.depot.id, siteSince: '2026-01-01T10:00:00Z' })] = false;

    const rows = await sqlRows<{
      id: number;
      status: Status;
      free_days: number | null;
      delivered_at: Date | null;
      dispatched_at: Date | null;
      sql_overdue: boolean;
      customer: string | null;
    }>(
      `SELECT a.id, a.status, o.free_days, o.name AS customer, t.delivered_at, t.dispatched_at, (${overdueBackSql('$1::date', '$2::text')}) IS TRUE AS sql_overdue
         FROM assets a LEFT JOIN trips t ON t.id = a.current_trip_id LEFT JOIN organisations o ON o.id = a.customer_id ORDER BY a.id`,
      [CTX.today, TZ],
    );
    const day = (d: Date | null) => (d ? localDate(d, TZ) : null);
    const pure = new Map(
      rows.map((r) => [
        r.id,
        overdueBack({ status: r.status, deliveredOn: day(r.delivered_at), dispatchedOn: day(r.dispatched_at), freeDays: r.free_days ?? 0, today: CTX.today }).overdue,
      ]),
    );
    // the pure rule gives the hand-worked answers …
    expect(Object.fromEntries(pure)).toEqual(Object.fromEntries(Object.entries(expected).map(([k, v]) => [Number(k), v])));
    // … and every SQL form gives the pure rule's
    expect(Object.fromEntries(rows.map((r) => [r.id, r.sql_overdue]))).toEqual(Object.fromEntries(pure));

    const grid = await fetchBinsPage(parseGridRequest({ startRow: 0, endRow: 100 }), CTX);
    expect(Object.fromEntries(grid.rows.map((r) => [r.id, r.overFreeDays]))).toEqual(Object.fromEntries(pure));
    const filtered = await fetchBinsPage(parseGridRequest({ startRow: 0, endRow: 100, filterModel: { overFreeDays: { filterType: 'boolean', value: true } } }), CTX);
    expect(filtered.rows.map((r) => r.id).sort((x, y) => x - y)).toEqual([...pure].filter(([, v]) => v).map(([id]) => id));

    const perCustomer = (names: Array<string | null>) => names.reduce<Record<string, number>>((acc, n) => ({ ...acc, [n!]: (acc[n!] ?? 0) + 1 }), {});
    const digest = await digestFigures(NOW);
    expect(Object.fromEntries(digest.overdueByCustomer.map((c) => [c.customer, c.bins]))).toEqual(perCustomer(rows.filter((r) => pure.get(r.id)).map((r) => r.customer)));
    expect(perCustomer(rows.filter((r) => pure.get(r.id)).map((r) => r.customer))).toEqual({ 'Test Customer': 4, 'Bravo Blending': 1 });

    const overview = await loadPoolOverview({ staleDays: 30, now: NOW });
    expect(overview.overdueTotal).toBe(5);
  });
});
