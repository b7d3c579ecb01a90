// Everything the pool overview (/fleet) shows, read live from the database in a handful of grouped queries.
// Counting happens in SQL (GROUP BY on indexed columns, so 100,000 bins stay cheap); the rules — overdue
// back, not scanned for N days, shrinkage — come from the pure modules, fed with grouped rows.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { getSettings } from '@/lib/settings/settings.server';
import { BIN_LIFE_SQL, startOfLocalDay } from '@/lib/trips/bin-life.server';
import { addDays, addMonthsToMonth, daysBetween, endOfMonth, localDate, monthOf } from '@/lib/calendar';
import type { LocalDate } from '@/lib/calendar';
import { STATUSES, type SiteKind, type Status } from '@/lib/scans/lifecycle';
import { overdueBack, overdueBackSql, tripTermsOf, tripTermsSelectSql, WITH_CUSTOMER_STATUSES, type TripTermsRow } from './overdue-return';
import { firstRecentDay, notScannedForSql } from './scan-age';
import { shrinkage, shrinkageWindow, type Shrinkage, type Window } from './shrinkage';
import { countLossFigures, type CountLossFigures } from '@/lib/portal/count-disputes.server';
import { fillMonths, type MonthPoint } from './month-series';
import { countBins, queryContext } from './fleet-grid.server';
import { OVERVIEW_CARD_IDS, OVERVIEW_CARDS, type OverviewCardId } from './overview-cards';

export type StatusCounts = Record<Status, number>;

export interface SiteCounts {
  id: number;
  code: string;
  name: string;
  kind: SiteKind;
  organisationName: string;
  lat: number | null;
  lon: number | null;
  byStatus: StatusCounts;
  /** Bins there now; retired and missing ones are left out. */
  total: number;
}

export interface CustomerHire {
  customerId: number;
  name: string;
  freeDays: number;
  onHire: number;
  awaitingCollection: number;
  overdue: number;
  /** Of the overdue ones, how many count from the dispatch because the delivery was never scanned. */
  overdueEstimated: number;
  worstDaysOver: number;
}

export interface EmptiesAtSite {
  siteId: number;
  code: string;
  name: string;
  customerName: string;
  count: number;
  /** The earliest discharge among them (emptied on), or their arrival at the site when no discharge was scanned. */
  oldestSince: LocalDate | null;
  longestWaitDays: number | null;
  openRequests: number;
}

export interface OverdueBin {
  assetId: number;
  grai: string;
  serial: string;
  status: Status;
  customerName: string;
  siteName: string | null;
  freeUntil: LocalDate;
  daysOver: number;
  estimated: boolean;
}

export interface StaleBin {
  assetId: number;
  grai: string;
  serial: string;
  status: Status;
  siteName: string | null;
  lastScanOn: LocalDate | null;
}

export interface PoolOverview {
  /** Each figure card's number: the fleet grid's count of the card's own filter (overview-cards.ts), so it is the length of the list the card opens. */
  cards: Record<OverviewCardId, number | null>;
  today: LocalDate;
  timeZone: string;
  byStatus: StatusCounts;
  /** Registered and neither retired nor missing. */
  inService: number;
  sites: SiteCounts[];
  /** Bins with no site now (on the road), by status. */
  noSite: StatusCounts;
  customers: CustomerHire[];
  overdueTotal: number;
  overdueBins: OverdueBin[];
  empties: EmptiesAtSite[];
  stale: { days: number; firstRecentDay: LocalDate; count: number; bins: StaleBin[] };
  shrinkage: { window: Window; declaredMissing: number; foundAgain: number; poolAtStart: number; poolAtEnd: number; result: Shrinkage; fromCounts: CountLossFigures };
  tripsPerMonth: MonthPoint<'dispatched' | 'returned'>[];
  testsDue: { overdue: number; months: MonthPoint<'intermediate' | 'full'>[] };
}

const LIST_LENGTH = 10;
const TRIP_MONTHS = 18;
const TEST_MONTHS = 12;

function zeroCounts(): StatusCounts {
  return Object.fromEntries(STATUSES.map((s) => [s, 0])) as StatusCounts;
}

async function select<T extends object>(sql: string, bind: unknown[] = []): Promise<T[]> {
  return sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT });
}

function dateOf(value: unknown, timeZone: string): LocalDate | null {
  if (value === null || value === undefined) return null;
  return localDate(value instanceof Date ? value : new Date(String(value)), timeZone);
}

async function siteCounts(): Promise<{ byStatus: StatusCounts; sites: SiteCounts[]; noSite: StatusCounts }> {
  const counts = await select<{ site_id: number | null; status: Status; n: number }>(`SELECT site_id, status, count(*)::int AS n FROM assets GROUP BY site_id, status`);
  const sites = await select<{
    id: number;
    code: string;
    name: string;
    kind: SiteKind;
    organisation_name: string;
    latitude: string | null;
    longitude: string | null;
    active: boolean;
  }>(
    `SELECT s.id, s.code, s.name, s.kind, o.name AS organisation_name, s.latitude, s.longitude, s.active
       FROM sites s JOIN organisations o ON o.id = s.organisation_id
      ORDER BY CASE s.kind WHEN 'depot' THEN 0 WHEN 'customer' THEN 1 ELSE 2 END, s.name`,
  );
  const byStatus = zeroCounts();
  const noSite = zeroCounts();
  const bySite = new Map<number, StatusCounts>();
  for (const row of counts) {
    byStatus[row.status] += row.n;
    // Retired bins are out of the pool; a missing bin's last known site is not where it is.
    if (row.status === 'retired' || row.status === 'missing') continue;
    const target = row.site_id === null ? noSite : (bySite.get(row.site_id) ?? bySite.set(row.site_id, zeroCounts()).get(row.site_id)!);
    target[row.status] += row.n;
  }
  const list = sites
    .map((s) => {
      const siteStatus = bySite.get(s.id) ?? zeroCounts();
      return {
        id: s.id,
        code: s.code,
        name: s.name,
        kind: s.kind,
        organisationName: s.organisation_name,
        lat: s.latitude === null ? null : Number(s.latitude),
        lon: s.longitude === null ? null : Number(s.longitude),
        byStatus: siteStatus,
        total: Object.values(siteStatus).reduce((a, b) => a + b, 0),
        active: s.active,
      };
    })
    // Inactive sites only while bins are still there.
    .filter((s) => s.active || s.total > 0)
    .map(({ active: _active, ...s }) => s);
  return { byStatus, sites: list, noSite };
}

async function withCustomers(today: LocalDate, timeZone: string): Promise<{ customers: CustomerHire[]; overdueTotal: number; overdueBins: OverdueBin[] }> {
  // Each trip by the terms billing charges it by (the tariff in force on its dispatch day): overdue-return.ts.
  const groups = await select<
    { customer_id: number; name: string; free_days: number; status: Status; delivered_on: string | null; dispatched_on: string | null; n: number } & TripTermsRow
  >(
    `SELECT a.customer_id, o.name, o.free_days, a.status,
            (t.delivered_at AT TIME ZONE $1)::date AS delivered_on,
            (t.dispatched_at AT TIME ZONE $1)::date AS dispatched_on,
            ${tripTermsSelectSql('$1')},
            count(*)::int AS n
       FROM assets a
       JOIN organisations o ON o.id = a.customer_id
       LEFT JOIN trips t ON t.id = a.current_trip_id
      WHERE a.status = ANY($2::text[])
      GROUP BY 1, 2, 3, 4, 5, 6, 7, 8, 9, 10`,
    [timeZone, WITH_CUSTOMER_STATUSES],
  );
  const byCustomer = new Map<number, CustomerHire>();
  let overdueTotal = 0;
  for (const g of groups) {
    const c = byCustomer.get(g.customer_id) ?? {
      customerId: g.customer_id,
      name: g.name,
      freeDays: g.free_days,
      onHire: 0,
      awaitingCollection: 0,
      overdue: 0,
      overdueEstimated: 0,
      worstDaysOver: 0,
    };
    byCustomer.set(g.customer_id, c);
    if (g.status === 'on_hire') c.onHire += g.n;
    else c.awaitingCollection += g.n;
    const check = overdueBack({ status: g.status, deliveredOn: g.delivered_on, dispatchedOn: g.dispatched_on, today, ...tripTermsOf(g) });
    if (check.overdue) {
      c.overdue += g.n;
      if (check.estimated) c.overdueEstimated += g.n;
      c.worstDaysOver = Math.max(c.worstDaysOver, check.daysOver);
      overdueTotal += g.n;
    }
  }
  const customers = [...byCustomer.values()].sort((a, b) => b.onHire + b.awaitingCollection - (a.onHire + a.awaitingCollection) || a.name.localeCompare(b.name));

  // The overdue bins, longest over first: those the rule's SQL form picks, ordered by the end of their free days
  // as the rule itself works it out.
  const rows = await select<
    {
      id: number;
      grai: string;
      serial: string;
      status: Status;
      customer: string;
      site: string | null;
      delivered_on: string | null;
      dispatched_on: string | null;
    } & TripTermsRow
  >(
    `SELECT a.id, a.grai, a.serial, a.status, o.name AS customer, s.name AS site,
            (t.delivered_at AT TIME ZONE $1)::date AS delivered_on,
            (t.dispatched_at AT TIME ZONE $1)::date AS dispatched_on,
            ${tripTermsSelectSql('$1')}
       FROM assets a
       JOIN organisations o ON o.id = a.customer_id
       JOIN trips t ON t.id = a.current_trip_id
       LEFT JOIN sites s ON s.id = a.site_id
      WHERE ${overdueBackSql('$2::date', '$1')}`,
    [timeZone, today],
  );
  const overdueBins: OverdueBin[] = rows
    .map((r) => ({ r, check: overdueBack({ status: r.status, deliveredOn: r.delivered_on, dispatchedOn: r.dispatched_on, today, ...tripTermsOf(r) }) }))
    .filter(({ check }) => check.overdue)
    .sort((x, y) => x.check.freeUntil!.localeCompare(y.check.freeUntil!) || x.r.id - y.r.id)
    .slice(0, LIST_LENGTH)
    .map(({ r, check }) => ({
      assetId: r.id,
      grai: r.grai,
      serial: r.serial,
      status: r.status,
      customerName: r.customer,
      siteName: r.site,
      freeUntil: check.freeUntil!,
      daysOver: check.daysOver,
      estimated: check.estimated,
    }));
  return { customers, overdueTotal, overdueBins };
}

async function empties(today: LocalDate, timeZone: string): Promise<EmptiesAtSite[]> {
  const rows = await select<{ site_id: number; code: string; name: string; customer: string; n: number; since: Date | null; requests: number }>(
    `SELECT a.site_id, s.code, s.name, o.name AS customer, count(*)::int AS n, min(coalesce(t.discharged_at, a.site_since)) AS since,
            (SELECT count(*) FROM collection_requests c WHERE c.site_id = a.site_id AND c.status IN ('open', 'scheduled'))::int AS requests
       FROM assets a
       JOIN sites s ON s.id = a.site_id
       JOIN organisations o ON o.id = s.organisation_id
       LEFT JOIN trips t ON t.id = a.current_trip_id
      WHERE a.status = 'awaiting_collection'
      GROUP BY a.site_id, s.code, s.name, o.name
      ORDER BY n DESC, since`,
  );
  return rows.map((r) => {
    const oldestSince = dateOf(r.since, timeZone);
    return {
      siteId: r.site_id,
      code: r.code,
      name: r.name,
      customerName: r.customer,
      count: r.n,
      oldestSince,
      longestWaitDays: oldestSince === null ? null : Math.max(0, daysBetween(oldestSince, today)),
      openRequests: r.requests,
    };
  });
}

async function notScanned(today: LocalDate, timeZone: string, days: number): Promise<PoolOverview['stale']> {
  const recentFrom = firstRecentDay(today, days);
  const where = notScannedForSql('$2', '$1');
  const [counted] = await select<{ n: number }>(`SELECT count(*)::int AS n FROM assets a WHERE ${where}`, [timeZone, recentFrom]);
  const rows = await select<{ id: number; grai: string; serial: string; status: Status; site: string | null; last_scan_at: Date | null }>(
    `SELECT a.id, a.grai, a.serial, a.status, s.name AS site, a.last_scan_at
       FROM assets a LEFT JOIN sites s ON s.id = a.site_id
      WHERE ${where}
      ORDER BY a.last_scan_at NULLS FIRST, a.id
      LIMIT $3`,
    [timeZone, recentFrom, LIST_LENGTH],
  );
  return {
    days,
    firstRecentDay: recentFrom,
    count: counted?.n ?? 0,
    bins: rows.map((r) => ({ assetId: r.id, grai: r.grai, serial: r.serial, status: r.status, siteName: r.site, lastScanOn: dateOf(r.last_scan_at, timeZone) })),
  };
}

async function shrinkageFigures(today: LocalDate, timeZone: string): Promise<PoolOverview['shrinkage']> {
  const window = shrinkageWindow(today);
  const [declared] = await select<{ declared: number; found: number }>(
    `WITH last_declared AS (
       SELECT DISTINCT ON (m.asset_id) m.asset_id, m.occurred_at
         FROM scan_events m
        WHERE m.action = 'mark_missing' AND m.voided_at IS NULL
          AND m.occurred_at >= ${startOfLocalDay('$2', '$1')} AND m.occurred_at < ${startOfLocalDay('$3', '$1')}
        ORDER BY m.asset_id, m.occurred_at DESC)
     SELECT count(*)::int AS declared,
            count(*) FILTER (WHERE EXISTS (
              SELECT 1 FROM scan_events f
               WHERE f.asset_id = d.asset_id AND f.action = 'mark_found' AND f.voided_at IS NULL AND f.occurred_at > d.occurred_at))::int AS found
       FROM last_declared d`,
    [timeZone, window.from, addDays(window.to, 1)],
  );
  const [pool] = await select<{ at_start: number; at_end: number }>(
    `WITH life AS (${BIN_LIFE_SQL})
     SELECT count(*) FILTER (WHERE commissioned_at < ${startOfLocalDay('$2', '$1')}
                               AND (left_at IS NULL OR left_at >= ${startOfLocalDay('$2', '$1')}))::int AS at_start,
            count(*) FILTER (WHERE status NOT IN ('retired', 'missing'))::int AS at_end
       FROM life`,
    [timeZone, window.from],
  );
  const input = { window, declaredMissing: declared?.declared ?? 0, foundAgain: declared?.found ?? 0, poolAtStart: pool?.at_start ?? 0, poolAtEnd: pool?.at_end ?? 0 };
  // The monthly counts' share: bins settled as lost there are among the declarations above (marked missing through the scan service).
  return { ...input, result: shrinkage(input), fromCounts: await countLossFigures(window, timeZone) };
}

async function tripsPerMonth(today: LocalDate, timeZone: string): Promise<PoolOverview['tripsPerMonth']> {
  const last = monthOf(today);
  const first = addMonthsToMonth(last, -(TRIP_MONTHS - 1));
  const rows = await select<{ month: string; dispatched: number; returned: number }>(
    `SELECT month, sum(dispatched)::int AS dispatched, sum(returned)::int AS returned FROM (
       SELECT to_char(dispatched_at AT TIME ZONE $1, 'YYYY-MM') AS month, 1 AS dispatched, 0 AS returned
         FROM trips WHERE dispatched_at >= ${startOfLocalDay('$2', '$1')}
       UNION ALL
       SELECT to_char(returned_at AT TIME ZONE $1, 'YYYY-MM'), 0, 1
         FROM trips WHERE returned_at >= ${startOfLocalDay('$2', '$1')}
     ) m GROUP BY month`,
    [timeZone, `${first}-01`],
  );
  return fillMonths(first, last, rows, ['dispatched', 'returned']);
}

async function testsDue(today: LocalDate): Promise<PoolOverview['testsDue']> {
  const first = monthOf(today);
  const last = addMonthsToMonth(first, TEST_MONTHS - 1);
  const inService = `status NOT IN ('retired', 'missing') AND next_due IS NOT NULL`;
  const rows = await select<{ month: string; intermediate: number; full: number }>(
    `SELECT to_char(next_due, 'YYYY-MM') AS month,
            count(*) FILTER (WHERE next_full_due IS NULL OR next_due < next_full_due)::int AS intermediate,
            count(*) FILTER (WHERE next_due = next_full_due)::int AS full
       FROM assets
      WHERE ${inService} AND next_due >= $1 AND next_due <= $2
      GROUP BY 1`,
    [today, endOfMonth(last)],
  );
  const [overdue] = await select<{ n: number }>(`SELECT count(*)::int AS n FROM assets WHERE ${inService} AND next_due < $1`, [today]);
  return { overdue: overdue?.n ?? 0, months: fillMonths(first, last, rows, ['intermediate', 'full']) };
}

export async function loadPoolOverview(opts: { staleDays: number; now?: Date }): Promise<PoolOverview> {
  const { timeZone } = await getSettings();
  const today = localDate(opts.now ?? new Date(), timeZone);
  const sites = await siteCounts();
  const hire = await withCustomers(today, timeZone);
  const emptiesList = await empties(today, timeZone);
  const stale = await notScanned(today, timeZone, opts.staleDays);
  const shrink = await shrinkageFigures(today, timeZone);
  const trips = await tripsPerMonth(today, timeZone);
  const tests = await testsDue(today);
  const inService = STATUSES.filter((s) => s !== 'retired' && s !== 'missing').reduce((n, s) => n + sites.byStatus[s], 0);
  const ctx = await queryContext(opts.now);
  const cards = Object.fromEntries(
    await Promise.all(OVERVIEW_CARD_IDS.map(async (id) => [id, await countBins(OVERVIEW_CARDS[id].filter(opts.staleDays), ctx)] as const)),
  ) as Record<OverviewCardId, number | null>;
  return {
    cards,
    today,
    timeZone,
    byStatus: sites.byStatus,
    inService,
    sites: sites.sites,
    noSite: sites.noSite,
    ...hire,
    empties: emptiesList,
    stale,
    shrinkage: shrink,
    tripsPerMonth: trips,
    testsDue: tests,
  };
}
