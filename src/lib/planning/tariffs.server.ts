// Entering a customer's tariff: where it fits is decided by planNewTariff() (./tariffs); the exclusion
// constraint on `tariffs` backs it up. Audited.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { AppError } from '@/lib/api-errors';
import { recordAudit, type AuditActor } from '@/lib/audit.server';
import { addDays, localDate } from '@/lib/calendar';
import { getSettings } from '@/lib/settings/settings.server';
import { Tariff } from '@/models';
import { planNewTariff, type Tariff as TariffRow, type TariffInput } from './tariffs';
import { tariffsOf } from './orders.server';

export { tariffsOf };

/** `outer`: run inside the caller's transaction (a new customer and its first tariff commit together). */
export async function addTariff(input: TariffInput, actor: AuditActor, outer?: Transaction): Promise<{ id: number; endedPrevious: { id: number; validTo: string } | null }> {
  return sequelize.transaction({ transaction: outer }, async (t) => {
    const [customer] = await sequelize.query<{ kind: string }>('SELECT kind FROM organisations WHERE id = $1 FOR UPDATE', {
      bind: [input.customerId],
      type: QueryTypes.SELECT,
      transaction: t,
    });
    if (!customer || customer.kind !== 'customer') throw new AppError('validation_failed', 'Some fields are not valid.', [{ path: 'customerId', message: 'no such customer' }]);
    const existing = await sequelize.query<Pick<TariffRow, 'id' | 'validFrom' | 'validTo'>>(
      `SELECT id, valid_from AS "validFrom", valid_to AS "validTo" FROM tariffs WHERE customer_id = $1 ORDER BY valid_from`,
      { bind: [input.customerId], type: QueryTypes.SELECT, transaction: t },
    );
    const plan = planNewTariff(existing, input, (d) => addDays(d, -1));
    if (!plan.ok) throw new AppError('unprocessable', plan.message, [{ path: 'validFrom', message: plan.message }]);
    if (plan.endPrevious) {
      await sequelize.query('UPDATE tariffs SET valid_to = $2, version = version + 1, updated_at = now() WHERE id = $1', {
        bind: [plan.endPrevious.id, plan.endPrevious.validTo],
        transaction: t,
      });
      await recordAudit(
        { actor, action: 'tariff.end', entityType: 'tariff', entityId: plan.endPrevious.id, before: { validTo: null }, after: { validTo: plan.endPrevious.validTo } },
        { transaction: t },
      );
    }
    const row = await Tariff.create({ ...input }, { transaction: t });
    await recordAudit({ actor, action: 'tariff.create', entityType: 'tariff', entityId: row.id, after: { ...input } }, { transaction: t });
    await syncTermsInForce(await operatorToday(), t, input.customerId);
    return { id: row.id, endedPrevious: plan.endPrevious };
  });
}

async function operatorToday(): Promise<string> {
  return localDate(new Date(), (await getSettings()).timeZone);
}

/**
 * The customer's term columns (`organisations.free_days`, daily rate, fees, currency) that the overdue rule and the
 * pages read are kept equal to the tariff in force on `today`: at once when a tariff is entered, and daily by the
 * `tariff-terms` job for tariffs that take effect later. Billing reads the tariffs themselves. Answers how many
 * customers changed.
 */
export async function syncTermsInForce(today: string, transaction?: Transaction, customerId?: number): Promise<number> {
  const [, changed] = await sequelize.query(
    `UPDATE organisations o SET free_days = t.free_days, daily_rate = t.daily_rate, trip_fee = t.per_trip_fee, lost_bin_fee = t.lost_bin_fee,
            currency = t.currency, updated_at = now()
       FROM tariffs t
      WHERE t.customer_id = o.id AND o.kind = 'customer' AND t.valid_from <= $1::date AND (t.valid_to IS NULL OR t.valid_to >= $1::date)
        AND ($2::int IS NULL OR o.id = $2)
        AND (o.free_days, o.daily_rate, o.trip_fee, o.lost_bin_fee, o.currency) IS DISTINCT FROM (t.free_days, t.daily_rate, t.per_trip_fee, t.lost_bin_fee, t.currency)`,
    { bind: [today, customerId ?? null], transaction },
  );
  return typeof changed === 'number' ? changed : ((changed as { rowCount?: number })?.rowCount ?? 0);
}

/** The daily job: terms that took effect today reach the customers' columns. */
export async function runTariffTermsSync({ now }: { now: Date }) {
  return { changed: await syncTermsInForce(localDate(now, (await getSettings()).timeZone)) };
}
