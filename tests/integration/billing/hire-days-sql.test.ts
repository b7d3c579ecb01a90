// The SQL form of the running day count must give what the function gives (the planners' digest filters on it).
import { describe, test, expect, afterAll } from 'vitest';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../support/db';
import { hireDaysThrough, hireDaysThroughSql } from '@/lib/billing/hire-days';
import { addDays } from '@/lib/calendar';

afterAll(async () => {
  await sequelize.close();
});

describe('hire days in SQL', () => {
  test('PostgreSQL and hireDaysThrough agree across month ends, a leap day and a start after the day looked at', async () => {
    const cases: [string, string][] = [];
    for (let i = -3; i < 40; i += 1) cases.push(['2028-02-20', addDays('2028-02-20', i)]);
    cases.push(['2026-12-31', '2027-01-01'], ['2027-10-31', '2027-10-31']);
    for (const firstDayCounts of [false, true]) {
      const terms = { firstDayCounts, lastDayCounts: true };
      const sql = `SELECT ${hireDaysThroughSql('c.start', 'c.as_of', terms)}::int AS days
                     FROM unnest($1::date[], $2::date[]) WITH ORDINALITY AS c(start, as_of, n) ORDER BY c.n`;
      const rows = await sequelize.query<{ days: number }>(sql, { bind: [cases.map((c) => c[0]), cases.map((c) => c[1])], type: QueryTypes.SELECT });
      expect(rows.map((r) => r.days)).toEqual(cases.map(([start, asOf]) => hireDaysThrough(start, asOf, terms)));
    }
  });
});
