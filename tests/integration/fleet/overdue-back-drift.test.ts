// "Overdue back from a customer" is one rule (overdueBack() in src/lib/fleet/overdue-return.ts: more calendar days
// since the delivery — or the dispatch when the delivery was never scanned — than the customer's free days). Three
// places count it in SQL: the fleet grid's "Over free days" flag, the planners' digest and overdueBackSql() itself.
// All are computed here on the same rows and compared with the pure rule. Today is 1 Dec 2026 in Amsterdam
// (UTC+1); day counts at the boundaries are worked by hand in the comments. A third customer's trips are held to
// the tariff version in force on their dispatch day, as billing charges them: the pure side finds that version
// itself (tariffInForce) from the tariff rows.
import { describe, test, expect } from 'vitest';
import { usePoolWorld } from '../support/fixtures';
import { rawBin, sqlRows } from '../support/hand-made';
import { Organisation, Tariff } from '@/models';
import { tariffInForce } from '@/lib/planning/tariffs';
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
    // Charlie: until 19 Nov 12 free days, hire from the dispatch, the first day counts; from 20 Nov 30 free days
    // by the default terms (the delivery starts it, the first day does not count). Its own column says 30 (today's).
    const c = await Organisation.create({ name: 'Charlie Chemicals', kind: 'customer', contactEmail: null, freeDays: 30 });
    const terms = { dailyRate: '1.00', perTripFee: '0', lostBinFee: '0', currency: 'EUR', customerId: c.id };
    await Tariff.create({ ...terms, freeDays: 12, validFrom: '2026-01-01', validTo: '2026-11-19', firstDayCounts: true, hireStartsAt: 'dispatch' });
    await Tariff.create({ ...terms, freeDays: 30, validFrom: '2026-11-20', validTo: null });
    // dispatched 19 Nov (the first version): 19 Nov is day 1, 1 Dec day 13, one over 12 (by the customer's column
    // and the delivery on 20 Nov it would be 11 of 30)
    expected[await on(c.id, 'on_hire', '2026-11-20T09:00:00Z', '2026-11-19T10:00:00Z')] = true;
    // dispatched 00:30 local on 20 Nov (23:30 UTC on the 19th): the second version; delivered 21 Nov → 10 days of 30
    expected[await on(c.id, 'on_hire', '2026-11-21T09:00:00Z', '2026-11-19T23:30:00Z')] = false;
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
      customer_id: number | null;
    }>(
      `SELECT a.id, a.status, a.customer_id, o.free_days, o.name AS customer, t.delivered_at, t.dispatched_at, (${overdueBackSql('$1::date', '$2::text')}) IS TRUE AS sql_overdue
         FROM assets a LEFT JOIN trips t ON t.id = a.current_trip_id LEFT JOIN organisations o ON o.id = a.customer_id ORDER BY a.id`,
      [CTX.today, TZ],
    );
    const day = (d: Date | null) => (d ? localDate(d, TZ) : null);
    const tariffs = await Tariff.findAll({ order: [['validFrom', 'ASC']] });
    const termsOf = (r: (typeof rows)[number]) => {
      const v =
        r.customer_id && r.dispatched_at
          ? tariffInForce(
              tariffs.filter((t) => t.customerId === r.customer_id),
              day(r.dispatched_at)!,
            )
          : null;
      return v
        ? { freeDays: v.freeDays, dayCount: { firstDayCounts: v.firstDayCounts, lastDayCounts: v.lastDayCounts }, hireStartsAt: v.hireStartsAt }
        : { freeDays: r.free_days ?? 0 };
    };
    const pure = new Map(
      rows.map((r) => [r.id, overdueBack({ status: r.status, deliveredOn: day(r.delivered_at), dispatchedOn: day(r.dispatched_at), today: CTX.today, ...termsOf(r) }).overdue]),
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
    expect(perCustomer(rows.filter((r) => pure.get(r.id)).map((r) => r.customer))).toEqual({ 'Test Customer': 4, 'Bravo Blending': 1, 'Charlie Chemicals': 1 });

    const overview = await loadPoolOverview({ staleDays: 30, now: NOW });
    expect(overview.overdueTotal).toBe(6);
    // the overview's list of overdue bins holds the same bins
    expect(overview.overdueBins.map((o) => o.assetId).sort((x, y) => x - y)).toEqual([...pure].filter(([, v]) => v).map(([id]) => id));
  });
});
