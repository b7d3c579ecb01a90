// One customer's month with one bin on hire for the billing tests: the tariff replaced by a plain one (no free days,
// 2.00 a day, no fees), the bin delivered on the month's first day and collected on its last, the statement issued.
// Worked by hand: a 31-day month is 30 counted days (the delivery day is free by the default count) = 60.00 net,
// VAT 21 % 12.60, total 72.60; a 30-day month 29 days = 58.00, VAT 12.18, total 70.18.
import { sequelize } from './db';
import { newBin, type PoolWorld } from './fixtures';
import { handTrip } from './hand-made';
import { issueStatement } from '@/lib/billing/statements.server';
import { billingMonth } from '@/lib/billing/statement-input';

export async function oneBinMonth(w: PoolWorld, month: string): Promise<{ statementId: number }> {
  const period = billingMonth(month)!;
  await sequelize.query(`DELETE FROM tariffs WHERE customer_id = $1`, { bind: [w.customer.id] });
  await sequelize.query(
    `INSERT INTO tariffs (customer_id, free_days, daily_rate, per_trip_fee, lost_bin_fee, currency, valid_from) VALUES ($1, 0, 2.00, 0, 0, 'EUR', '2000-01-01')`,
    { bind: [w.customer.id] },
  );
  const bin = await newBin(w);
  await handTrip({
    assetId: bin.id,
    customerId: w.customer.id,
    depotSiteId: w.depot.id,
    dispatchedAt: `${period.from}T06:00:00Z`,
    deliveredAt: `${period.from}T09:00:00Z`,
    collectedAt: `${period.to}T10:00:00Z`,
  });
  return { statementId: (await issueStatement(w.customer.id, month, { userId: null, ip: null })).id };
}
