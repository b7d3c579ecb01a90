// Takes the next invoice or credit-note number inside the caller's issuing transaction. The counter row of the
// series and year is created if missing, then locked FOR UPDATE: a second issuer waits until the first commits
// or rolls back, so numbers are consecutive and a rolled-back issue gives its number back (no gaps).
import type { Transaction } from 'sequelize';
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { formatDocumentNumber, type DocumentSeries } from './document-number';

export interface TakenNumber {
  series: DocumentSeries;
  year: number;
  sequence: number;
  number: string;
}

export async function takeDocumentNumber(transaction: Transaction, series: DocumentSeries, year: number): Promise<TakenNumber> {
  formatDocumentNumber(series, year, 1); // refuses an unknown series or a year out of range before any SQL
  await sequelize.query(`INSERT INTO document_number_counters (series, year) VALUES ($1, $2) ON CONFLICT (series, year) DO NOTHING`, { bind: [series, year], transaction });
  const [row] = await sequelize.query<{ last_number: number }>(`SELECT last_number FROM document_number_counters WHERE series = $1 AND year = $2 FOR UPDATE`, {
    bind: [series, year],
    transaction,
    type: QueryTypes.SELECT,
  });
  const sequence = row!.last_number + 1;
  await sequelize.query(`UPDATE document_number_counters SET last_number = $3, updated_at = now() WHERE series = $1 AND year = $2`, {
    bind: [series, year, sequence],
    transaction,
  });
  return { series, year, sequence, number: formatDocumentNumber(series, year, sequence) };
}
