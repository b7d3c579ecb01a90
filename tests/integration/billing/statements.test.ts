// Monthly statements against the real database: a customer's October 2026 worked by hand (a rate change on
// 20 Oct, the DST change on 25 Oct, a liner, a bin declared missing), issued once and never changed; November
// with the lost bin found again and a late correction to October as an adjustment line naming what changed;
// refusals, the CSV, and one customer never reading another's statement.
// Hire terms are common practice in equipment hire (no single published source); the working is in the comments.
import { describe, test, expect, beforeAll } from 'vitest';
import { usePoolWorld, appErrorOf, addSecondCustomer } from '../support/fixtures';
import { handTrip, logEvent, sqlRows } from '../support/hand-made';
import { sequelize } from '../support/db';
import { newBin } from '../support/fixtures';
import { issueStatement, draftStatement } from '@/lib/billing/statements.server';
import { listStatements, statementView, monthOverview } from '@/lib/billing/statement-views.server';
import { statementLinesCsv } from '@/lib/billing/statement-csv';
import { billingMonth } from '@/lib/billing/statement-input';

const w = usePoolWorld();
const admin = () => ({ userId: w.planner.id, ip: '127.0.0.1' });
const OCT = billingMonth('2026-10')!;
const NOV = billingMonth('2026-11')!;
let tripA = 0;
let tripB = 0;
let binA = 0;

beforeAll(async () => {
  await sequelize.query(`DELETE FROM tariffs WHERE customer_id = $1`, { bind: [w.customer.id] });
  // v1: 14 free days, 1.50 a day, 10.00 a trip, 250.00 a lost bin, 4.00 a liner; v2 from 20 Oct: 2.00 a day.
  for (const [from, to, rate] of [
    ['2000-01-01', '2026-10-19', '1.50'],
    ['2026-10-20', null, '2.00'],
  ] as const) {
    await sequelize.query(
      `INSERT INTO tariffs (customer_id, free_days, daily_rate, per_trip_fee, lost_bin_fee, liner_fee, currency, valid_from, valid_to)
       VALUES ($1, 14, $2, 10.00, 250.00, 4.00, 'EUR', $3, $4)`,
      { bind: [w.customer.id, rate, from, to] },
    );
  }
  const a = await newBin(w);
  binA = a.id;
  const b = await newBin(w);
  // Bin A: delivered 1 Oct (15:00 Amsterdam), collected 31 Oct 11:00 (after the DST change, UTC+1).
  tripA = await handTrip({
    assetId: a.id,
    customerId: w.customer.id,
    depotSiteId: w.depot.id,
    linerLotId: w.lot.id,
    dispatchedAt: '2026-10-01T06:00:00Z',
    deliveredAt: '2026-10-01T13:00:00Z',
    collectedAt: '2026-10-31T10:00:00Z',
    returnedAt: '2026-11-02T09:00:00Z',
  });
  // Bin B: delivered 5 Oct, declared missing 25 Oct, found 10 Nov.
  tripB = await handTrip({ assetId: b.id, customerId: w.customer.id, depotSiteId: w.depot.id, dispatchedAt: '2026-10-05T06:00:00Z', deliveredAt: '2026-10-05T12:00:00Z' });
  await logEvent({ assetId: b.id, action: 'mark_missing', occurredAt: '2026-10-25T12:00:00Z', statusTo: 'missing', tripId: tripB });
  await logEvent({ assetId: b.id, action: 'mark_found', occurredAt: '2026-11-10T09:00:00Z', statusTo: 'on_hire', tripId: tripB });
});

const summary = (lines: Array<{ kind: string; tripId: string | null; from: string; to: string; quantity: number; amountMinor: number }>) =>
  lines.map((l) => `${l.kind} ${l.tripId ?? '-'} ${l.from}..${l.to} ×${l.quantity} = ${l.amountMinor}`);

describe('October 2026, by hand', () => {
  test('the draft: free days, the rate split on 20 Oct, the trip fees, the liner and the lost bin', async () => {
    const d = await draftStatement(w.customer.id, OCT);
    // Bin A: hire starts on the delivery date 1 Oct (not counted), stops at collection 31 Oct (counted):
    // 2–31 Oct = 30 days; free days 1–14 = 2–15 Oct; 16–19 Oct at 1.50 = 4 × 150 = 600; 20–31 Oct at 2.00 =
    // 12 × 200 = 2400; trip fee 1000; liner 400.
    // Bin B: 6–25 Oct = 20 days (missing on 25 Oct stops it); free 6–19 Oct; 20–25 Oct = 6 × 200 = 1200;
    // trip fee 1000; lost-bin fee 25000.
    const a = String(tripA);
    const b = String(tripB);
    expect(summary(d.statement.lines).sort()).toEqual(
      [
        `free_days ${a} 2026-10-02..2026-10-15 ×14 = 0`,
        `hire ${a} 2026-10-16..2026-10-19 ×4 = 600`,
        `hire ${a} 2026-10-20..2026-10-31 ×12 = 2400`,
        `trip_fee ${a} 2026-10-01..2026-10-01 ×1 = 1000`,
        `liners ${a} 2026-10-01..2026-10-01 ×1 = 400`,
        `free_days ${b} 2026-10-06..2026-10-19 ×14 = 0`,
        `hire ${b} 2026-10-20..2026-10-25 ×6 = 1200`,
        `trip_fee ${b} 2026-10-05..2026-10-05 ×1 = 1000`,
        `lost_bin ${b} 2026-10-25..2026-10-25 ×1 = 25000`,
      ].sort(),
    );
    // Net 600 + 2400 + 1000 + 400 + 1200 + 1000 + 25000 = 31600; VAT 21 % = 6636; total 38236.
    expect([d.statement.totals.netMinor, d.statement.totals.taxMinor, d.statement.totals.grossMinor]).toEqual([31600, 6636, 38236]);
    expect(d.corrections).toEqual([]);
  });

  test('issued once: the stored lines are the draft, a second issue is refused, a month not over is refused', async () => {
    const { id } = await issueStatement(w.customer.id, '2026-10', admin());
    const s = await statementView(id, { kind: 'operator' });
    expect(s.grossMinor).toBe(38236);
    expect(s.lines).toHaveLength(9);
    expect(s.lines.map((l) => l.position)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9]);
    expect((await appErrorOf(issueStatement(w.customer.id, '2026-10', admin()))).code).toBe('duplicate');
    expect((await appErrorOf(issueStatement(w.customer.id, '2099-01', admin()))).code).toBe('unprocessable');
    expect((await appErrorOf(issueStatement(w.customer.id, '2026-13', admin()))).code).toBe('validation_failed');
    expect((await appErrorOf(issueStatement(999_999, '2026-10', admin()))).code).toBe('not_found');
    const [audit] = await sqlRows<{ n: number }>(`SELECT count(*)::int AS n FROM audit_entries WHERE action = 'statement.issue' AND entity_id = $1`, [String(id)]);
    expect(audit!.n).toBe(1);
    const csv = statementLinesCsv(s);
    expect(csv).toContain(`,hire,`);
    expect(csv).toMatch(/,12,2\.00,24\.00,EUR,false,/);
  });
});

describe('November 2026: found again, and a late correction of October', () => {
  test('the collection of bin A turns out to be 28 Oct: October stays as issued, November corrects it by −6.00', async () => {
    const [oct] = await listStatements({ kind: 'operator' });
    const before = await statementView(oct!.id, { kind: 'operator' });
    await sequelize.query(`UPDATE trips SET collected_at = '2026-10-28T10:00:00Z' WHERE id = $1`, { bind: [tripA] });
    // A dent reported on bin A on 20 Oct, repaired for 35.00 and closed on 5 Nov: charged back in November on its
    // trip. A collection run done on 12 Nov with a stop at the customer's site: 15.00 a stop from the tariff.
    const [dr] = await sqlRows<{ id: number }>(
      `INSERT INTO damage_reports (source, asset_id, site_id, customer_id, description, created_at) VALUES ('portal', $1, $2, $3, 'Dent in the cage', '2026-10-20T09:00:00Z') RETURNING id`,
      [binA, w.customerSite.id, w.customer.id],
    );
    const [repair] = await sqlRows<{ id: number }>(
      `INSERT INTO repair_orders (asset_id, opened_from, damage_report_id, customer_id, fault, status, closed_at)
       SELECT asset_id, 'damage_report', $2, $3, 'Dented cage rail', 'retired', '2026-11-05T10:00:00Z' FROM trips WHERE id = $1 RETURNING id`,
      [tripA, dr!.id, w.customer.id],
    );
    await sqlRows(
      `INSERT INTO repair_work (repair_order_id, performed_on, description, labour_hours, cost) VALUES ($1, '2026-11-04', 'Straightened the rail', 1.5, 35.00) RETURNING id`,
      [repair!.id],
    );
    await sequelize.query(`UPDATE tariffs SET stop_fee = 15.00 WHERE customer_id = $1 AND valid_from = '2026-10-20'`, { bind: [w.customer.id] });
    const [run] = await sqlRows<{ id: number }>(
      `INSERT INTO truck_runs (reference, depot_site_id, carrier, planned_on, status, confirmed_at, finished_at)
       VALUES ('CR-TEST-1', $1, 'Test Haulage', '2026-11-12', 'done', '2026-11-11T08:00:00Z', '2026-11-12T16:00:00Z') RETURNING id`,
      [w.depot.id],
    );
    await sqlRows(`INSERT INTO truck_run_stops (run_id, position, site_id, expected_bins) VALUES ($1, 1, $2, 6) RETURNING id`, [run!.id, w.customerSite.id]);
    const d = await draftStatement(w.customer.id, NOV);
    // October recomputed: bin A 20–28 Oct = 9 × 200 = 1800 instead of 2400 → one adjustment of −600.
    const corrections = d.statement.lines.filter((l) => l.kind === 'adjustment');
    expect(corrections.map((l) => l.amountMinor)).toEqual([-600]);
    expect(corrections[0]!.text).toMatch(/was 12 days .*24\.00 EUR, now 9 days .*18\.00 EUR; difference -6\.00 EUR/);
    // Bin B found on 10 Nov: the lost-bin fee credited; its missing days are not charged.
    expect(summary(d.statement.lines.filter((l) => l.kind !== 'adjustment'))).toEqual([
      `damage ${tripA} 2026-11-05..2026-11-05 ×1 = 3500`,
      `lost_bin_credit ${tripB} 2026-11-10..2026-11-10 ×1 = -25000`,
      `transport - 2026-11-12..2026-11-12 ×1 = 1500`,
    ]);
    expect(d.statement.lines.find((l) => l.kind === 'damage')!.reference).toBe(`R-${repair!.id}`);
    // Net 3500 − 25000 + 1500 − 600 = −20600; VAT 21 % = −4326; total −24926.
    expect([d.statement.totals.netMinor, d.statement.totals.taxMinor, d.statement.totals.grossMinor]).toEqual([-20600, -4326, -24926]);

    const { id } = await issueStatement(w.customer.id, '2026-11', admin());
    const nov = await statementView(id, { kind: 'operator' });
    expect(nov.lines.find((l) => l.kind === 'adjustment')!.adjustsStatementId).toBe(oct!.id);
    expect(await statementView(oct!.id, { kind: 'operator' })).toEqual(before); // issued October is unchanged
    // Corrected once: a further draft (December) finds nothing more to correct in October.
    expect((await draftStatement(w.customer.id, billingMonth('2026-12')!)).corrections).toEqual([]);
  });

  test('the month overview shows issued statements as issued, by the same figures as the statement', async () => {
    const rows = await monthOverview(OCT);
    const mine = rows.find((r) => r.customerId === w.customer.id)!;
    expect(mine.issued!.grossMinor).toBe(38236);
    expect(mine.draft).toBeNull();
  });
});

describe('whose statements', () => {
  test('a customer reads their own; another organisation and a site-limited user read none', async () => {
    const other = await addSecondCustomer(w);
    const [oct] = await listStatements({ kind: 'customer', organisationId: w.customer.id, siteIds: null });
    expect(oct).toBeDefined();
    expect((await statementView(oct!.id, { kind: 'customer', organisationId: w.customer.id, siteIds: null })).customer).toBe('Test Customer');
    const otherScope = { kind: 'customer' as const, organisationId: other.customer.id, siteIds: null };
    expect(await listStatements(otherScope)).toEqual([]);
    expect((await appErrorOf(statementView(oct!.id, otherScope))).code).toBe('not_found');
    const limited = { kind: 'customer' as const, organisationId: w.customer.id, siteIds: [w.customerSite.id] };
    expect(await listStatements(limited)).toEqual([]);
    expect((await appErrorOf(statementView(oct!.id, limited))).code).toBe('not_found');
  });
});
