// Day- or series-numbered references (loads LD-261203-RTM-003, runs RUN-261224-T1-02, repositioning orders
// RP-00012): the next number after the highest one with the same prefix, taken under a transaction-scoped advisory
// lock on the prefix, so two people creating at the same moment never get the same number (a count + 1 did).
// Gap-free legal numbering (invoices) is billing's counter row, not this.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/db/sequelize';

const NUMBERED_TABLES = ['loads', 'truck_runs', 'repositioning_orders'] as const;
export type NumberedTable = (typeof NUMBERED_TABLES)[number];

/** `prefix` + the next number, zero-padded to `digits`; call inside the transaction that inserts the row. */
export async function nextReference(table: NumberedTable, prefix: string, digits: number, t: Transaction): Promise<string> {
  if (!NUMBERED_TABLES.includes(table)) throw new Error(`no numbered references in ${table}`);
  await sequelize.query('SELECT pg_advisory_xact_lock(hashtext($1))', { bind: [`${table}:${prefix}`], transaction: t });
  const [row] = await sequelize.query<{ n: number }>(`SELECT coalesce(max(substring(reference FROM '[0-9]+$')::int), 0) + 1 AS n FROM ${table} WHERE reference LIKE $1`, {
    bind: [`${prefix}%`],
    type: QueryTypes.SELECT,
    transaction: t,
  });
  return `${prefix}${String(row!.n).padStart(digits, '0')}`;
}
