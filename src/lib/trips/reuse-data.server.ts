// The rows behind the reuse report: every bin with its commissioning and leaving dates and its completed
// rotations (overall, per calendar year, in the period), optionally only one customer's. Grouped in SQL;
// the figures are worked out by src/lib/trips/reuse-report.ts.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { getSettings } from '@/lib/settings/settings.server';
import { BIN_LIFE_SQL, startOfLocalDay } from './bin-life.server';
import { addDays, localDate } from '@/lib/calendar';
import type { LocalDate } from '@/lib/calendar';
import type { ReuseBin, ReuseScope } from './reuse-report';
import type { ReportPeriod } from './report-period';

export interface ReuseData {
  bins: ReuseBin[];
  scope: ReuseScope;
  today: LocalDate;
  timeZone: string;
}

async function select<T extends object>(sql: string, bind: unknown[]): Promise<T[]> {
  return sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT });
}

/** Null customer: the whole pool. A customer id that names no customer: null (the caller answers 404). */
export async function reuseData(period: ReportPeriod, customerId: number | null, now = new Date()): Promise<ReuseData | null> {
  const { timeZone } = await getSettings();
  const today = localDate(now, timeZone);
  let scope: ReuseScope = { kind: 'pool' };
  if (customerId !== null) {
    const [customer] = await select<{ name: string }>(`SELECT name FROM organisations WHERE id = $1 AND kind = 'customer'`, [customerId]);
    if (!customer) return null;
    scope = { kind: 'customer', name: customer.name };
  }
  const forCustomer = customerId === null ? '' : 'AND t.customer_id = $2';
  const customerBind = customerId === null ? [] : [customerId];

  const bins = await select<{ id: number; grai: string; serial: string; bin_type: string; commissioned_on: string; left_on: string | null }>(
    `WITH life AS (${BIN_LIFE_SQL})
     SELECT a.id, a.grai, a.serial, bt.code AS bin_type,
            (life.commissioned_at AT TIME ZONE $1)::date AS commissioned_on,
            (life.left_at AT TIME ZONE $1)::date AS left_on
       FROM assets a JOIN life ON life.id = a.id JOIN bin_types bt ON bt.id = a.bin_type_id
      ORDER BY a.id`,
    [timeZone],
  );
  const byYear = await select<{ asset_id: number; year: string; n: number }>(
    `SELECT t.asset_id, to_char(t.returned_at AT TIME ZONE $1, 'YYYY') AS year, count(*)::int AS n
       FROM trips t WHERE t.returned_at IS NOT NULL ${forCustomer}
      GROUP BY 1, 2`,
    [timeZone, ...customerBind],
  );
  const periodBind = [timeZone, ...customerBind, period.from, addDays(period.to, 1)];
  const p = customerId === null ? 2 : 3;
  const inPeriod = await select<{ asset_id: number; n: number }>(
    `SELECT t.asset_id, count(*)::int AS n
       FROM trips t
      WHERE t.returned_at >= ${startOfLocalDay(`$${p}`, '$1')} AND t.returned_at < ${startOfLocalDay(`$${p + 1}`, '$1')} ${forCustomer}
      GROUP BY 1`,
    periodBind,
  );

  const years = new Map<number, Record<string, number>>();
  const totals = new Map<number, number>();
  for (const r of byYear) {
    const perYear = years.get(r.asset_id) ?? years.set(r.asset_id, {}).get(r.asset_id)!;
    perYear[r.year] = r.n;
    totals.set(r.asset_id, (totals.get(r.asset_id) ?? 0) + r.n);
  }
  const periodCounts = new Map(inPeriod.map((r) => [r.asset_id, r.n]));
  return {
    scope,
    today,
    timeZone,
    bins: bins.map((b) => ({
      assetId: b.id,
      grai: b.grai,
      serial: b.serial,
      binType: b.bin_type,
      commissionedOn: b.commissioned_on,
      leftOn: b.left_on,
      rotationsTotal: totals.get(b.id) ?? 0,
      rotationsByYear: years.get(b.id) ?? {},
      rotationsInPeriod: periodCounts.get(b.id) ?? 0,
    })),
  };
}
