// Entering a customer's tariff: where it fits is decided by planNewTariff() (./tariffs); the exclusion
// constraint on `tariffs` backs it up. Audited.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { AppError } from '@/lib/api-errors';
import { recordAudit, type AuditActor } from '@/lib/audit.server';
import { addDays } from '@/lib/calendar';
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
    return { id: row.id, endedPrevious: plan.endPrevious };
  });
}
