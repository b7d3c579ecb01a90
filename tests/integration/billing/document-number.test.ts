// Gap-free numbering against the real database: the counter row is locked FOR UPDATE in the issuing
// transaction, so concurrent issues queue and a rolled-back issue gives its number back.
import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { resetDatabase, sequelize } from '../support/db';
import { takeDocumentNumber } from '@/lib/billing/document-number.server';
import { firstGap } from '@/lib/billing/document-number';

beforeAll(async () => {
  await resetDatabase();
});
afterAll(async () => {
  await sequelize.close();
});

/** One issuing transaction: take a number, hold the lock a moment (as issuing an invoice would), commit. */
async function issue(series: 'invoice' | 'credit_note', year: number) {
  return sequelize.transaction(async (transaction) => {
    const taken = await takeDocumentNumber(transaction, series, year);
    await sequelize.query('SELECT pg_sleep(0.01)', { transaction });
    return taken;
  });
}

describe('document numbers under concurrency', () => {
  test('20 concurrent invoice issues get 20 consecutive numbers, none twice', async () => {
    const taken = await Promise.all(Array.from({ length: 20 }, () => issue('invoice', 2027)));
    const sequences = taken.map((t) => t.sequence).sort((a, b) => a - b);
    expect(sequences).toEqual(Array.from({ length: 20 }, (_, i) => i + 1));
    expect(firstGap(sequences)).toBeNull();
    expect(taken.map((t) => t.number).sort()).toContain('INV-2027-00020');
  });

  test('a rolled-back issue gives its number back: the next issue takes it', async () => {
    await expect(
      sequelize.transaction(async (transaction) => {
        const taken = await takeDocumentNumber(transaction, 'invoice', 2027);
        expect(taken.number).toBe('INV-2027-00021');
        throw new Error('invoice could not be stored');
      }),
    ).rejects.toThrow('invoice could not be stored');
    expect((await issue('invoice', 2027)).number).toBe('INV-2027-00021');
  });

  test('credit notes and a new year count in series of their own', async () => {
    expect((await issue('credit_note', 2027)).number).toBe('CRN-2027-00001');
    expect((await issue('invoice', 2028)).number).toBe('INV-2028-00001');
    expect((await issue('invoice', 2027)).number).toBe('INV-2027-00022');
  });

  test('an unknown series is refused before any SQL, and the database refuses one too', async () => {
    await expect(sequelize.transaction((t) => takeDocumentNumber(t, 'receipt' as 'invoice', 2027))).rejects.toThrow('Unknown document series');
    await expect(sequelize.query(`INSERT INTO document_number_counters (series, year) VALUES ('receipt', 2027)`)).rejects.toThrow();
  });
});
