// "Silent for N days" is restated in SQL in three places: the pool overview's "not scanned for N days"
// (notScannedForSql, rule isNotScannedFor in scan-age.ts), the fleet grid's "days since last scan" filter (the
// saved view "Silent for 30+ days") and the missing-bin job (SILENT_BINS_SQL, rule isSilentTooLong in
// missing-rule.ts). Each is computed here on the same rows as its pure rule. Today is 1 Dec 2026 in Amsterdam.
import { describe, test, expect } from 'vitest';
import { usePoolWorld } from '../support/fixtures';
import { rawBin, sqlRows } from '../support/hand-made';
import { localDate } from '@/lib/calendar';
import { firstRecentDay, isNotScannedFor, notScannedForSql } from '@/lib/fleet/scan-age';
import { isSilentTooLong, MISSING_AFTER_DAYS, SILENT_BINS_SQL } from '@/lib/fleet/missing-rule';
import { countBins } from '@/lib/fleet/fleet-grid.server';
import { parseFilterModel, type QueryContext } from '@/lib/fleet/grid-query';
import { loadPoolOverview } from '@/lib/fleet/pool-overview.server';
import type { Status } from '@/lib/scans/lifecycle';

const w = usePoolWorld();
const TZ = 'Europe/Amsterdam';
const CTX: QueryContext = { timeZone: TZ, today: '2026-12-01' };
const NOW = new Date('2026-12-01T11:00:00Z');
const DAY = 86_400_000;

describe('silent for N days: SQL and the pure rules agree', () => {
  test('not scanned for 30 days (pool overview, fleet grid) and silent too long (missing-bin job)', async () => {
    const scans: Array<[Status, string | null]> = [
      ['available', '2026-10-31T23:30:00Z'], // 00:30 local on 1 Nov → 30 days ago: counts
      ['available', '2026-11-01T22:59:00Z'], // 23:59 local on 1 Nov → 30 days ago: counts
      ['available', '2026-11-01T23:01:00Z'], // 00:01 local on 2 Nov → 29 days ago: does not
      ['on_hire', '2026-11-30T10:00:00Z'],
      ['on_hire', null], // never scanned: counts for the overview, not for the missing-bin job (it has nothing to count from)
      ['retired', '2020-01-01T10:00:00Z'], // out of service: not counted by the overview
      ['missing', '2020-01-01T10:00:00Z'],
      // around 120 × 24 hours before NOW for the missing-bin job
      ['on_hire', new Date(NOW.getTime() - MISSING_AFTER_DAYS * DAY - 60_000).toISOString()],
      ['on_hire', new Date(NOW.getTime() - MISSING_AFTER_DAYS * DAY + 60_000).toISOString()],
      ['in_transit', new Date(NOW.getTime() - MISSING_AFTER_DAYS * DAY - 60_000).toISOString()],
      ['awaiting_collection', '2026-01-01T10:00:00Z'],
      ['available', '2026-01-01T10:00:00Z'], // in a depot: never "missing" by the job
    ];
    for (const [status, lastScanAt] of scans) {
      const atCustomer = ['on_hire', 'awaiting_collection'].includes(status);
      await rawBin({
        binTypeId: w.binType.id,
        status,
        lastScanAt,
        leg: status === 'in_transit' ? 'return' : null,
        siteId: status === 'in_transit' || status === 'missing' ? null : atCustomer ? w.customerSite.id : w.depot.id,
        customerId: atCustomer ? w.customer.id : null,
      });
    }
    const N = 30;
    const recent = firstRecentDay(CTX.today, N);
    const rows = await sqlRows<{ id: number; status: Status; last_scan_at: Date | null; stale_sql: boolean; silent_sql: boolean }>(
      `SELECT a.id, a.status, a.last_scan_at, (${notScannedForSql('$1', '$2')}) IS TRUE AS stale_sql,
              (${SILENT_BINS_SQL.replace(/\$1/g, '$3').replace(/\$2/g, '$4')}) IS TRUE AS silent_sql
         FROM assets a ORDER BY a.id`,
      [recent, TZ, NOW, MISSING_AFTER_DAYS],
    );
    const inService = (s: Status) => s !== 'retired' && s !== 'missing';
    const stalePure = rows.map((r) => inService(r.status) && isNotScannedFor(r.last_scan_at ? localDate(r.last_scan_at, TZ) : null, CTX.today, N));
    expect(rows.map((r) => r.stale_sql)).toEqual(stalePure);
    expect(stalePure.slice(0, 7)).toEqual([true, true, false, false, true, false, false]); // worked by hand (comments above)

    const silentPure = rows.map((r) => isSilentTooLong({ status: r.status, lastScanAt: r.last_scan_at }, NOW));
    expect(rows.map((r) => r.silent_sql)).toEqual(silentPure);
    expect(silentPure.slice(7)).toEqual([true, false, true, true, false]);

    const overview = await loadPoolOverview({ staleDays: N, now: NOW });
    expect(overview.stale.count).toBe(stalePure.filter(Boolean).length);

    // The grid's "days since last scan ≥ 30" (the saved view "Silent for 30+ days") on scanned bins in service.
    const gridCount = await countBins(
      parseFilterModel({
        daysSilent: { filterType: 'number', type: 'greaterThanOrEqual', filter: N },
        status: { filterType: 'set', values: ['available', 'prepared', 'in_transit', 'on_hire', 'awaiting_collection', 'quarantine', 'in_repair'] },
      }),
      CTX,
    );
    expect(gridCount).toBe(rows.filter((r, i) => stalePure[i] && r.last_scan_at !== null).length);
  });
});
