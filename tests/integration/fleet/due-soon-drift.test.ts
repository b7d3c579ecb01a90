// "Due soon" and "lapsed" for the periodic test are one rule (testStatus() in src/lib/inspections/inspection-due.ts,
// DUE_SOON_DAYS ahead, the due date itself still inside its interval). The fleet grid's flags, the planners'
// digest and testDueSoonSql() restate it in SQL; all are computed here on the same rows. Today is 1 Dec 2026.
import { describe, test, expect } from 'vitest';
import { usePoolWorld } from '../support/fixtures';
import { rawBin, sqlRows } from '../support/hand-made';
import { addDays } from '@/lib/calendar';
import { DUE_SOON_DAYS, testDueSoonSql, testStatus, type TestStatus } from '@/lib/inspections/inspection-due';
import { fetchBinsPage } from '@/lib/fleet/fleet-grid.server';
import { parseGridRequest, type QueryContext } from '@/lib/fleet/grid-query';
import { digestFigures } from '@/lib/jobs/planner-digest.server';

const w = usePoolWorld();
const CTX: QueryContext = { timeZone: 'Europe/Amsterdam', today: '2026-12-01' };

describe('due soon: SQL and testStatus() agree', () => {
  test('on due dates either side of today and of today + DUE_SOON_DAYS', async () => {
    expect(DUE_SOON_DAYS).toBe(30);
    const offsets = [-400, -1, 0, 1, 29, 30, 31, 365];
    const expected: Record<number, TestStatus | null> = {};
    for (const status of ['available', 'retired'] as const) {
      for (const o of offsets) {
        const id = await rawBin({ binTypeId: w.binType.id, status, siteId: w.depot.id, nextDue: addDays(CTX.today, o) });
        expected[id] = o < 0 ? 'overdue' : o <= 30 ? 'due_soon' : 'ok'; // worked by hand: 30 days ahead is still "soon", 31 is not
      }
    }
    expected[await rawBin({ binTypeId: w.binType.id, status: 'available', siteId: w.depot.id, nextDue: null })] = null; // no periodic regime

    const rows = await sqlRows<{ id: number; status: string; next_due: string | null; sql_soon: boolean }>(
      `SELECT a.id, a.status, a.next_due, (${testDueSoonSql('a.next_due', '$1::date')}) IS TRUE AS sql_soon FROM assets a ORDER BY a.id`,
      [CTX.today],
    );
    const pure = new Map(rows.map((r) => [r.id, r.next_due === null ? null : testStatus(r.next_due, CTX.today)]));
    expect(Object.fromEntries(pure)).toEqual(Object.fromEntries(Object.entries(expected).map(([k, v]) => [Number(k), v])));
    expect(rows.map((r) => r.sql_soon)).toEqual(rows.map((r) => pure.get(r.id) === 'due_soon'));

    const grid = await fetchBinsPage(parseGridRequest({ startRow: 0, endRow: 100 }), CTX);
    expect(Object.fromEntries(grid.rows.map((r) => [r.id, [r.dueSoon, r.overdue]]))).toEqual(
      Object.fromEntries([...pure].map(([id, s]) => [id, [s === 'due_soon', s === 'overdue']])),
    );

    // The digest counts bins in service only (not retired, not missing).
    const inService = rows.filter((r) => r.status !== 'retired').map((r) => pure.get(r.id));
    const digest = await digestFigures(new Date('2026-12-01T11:00:00Z'));
    expect({ soon: digest.testsDueSoon, lapsed: digest.testsLapsed }).toEqual({
      soon: inService.filter((s) => s === 'due_soon').length,
      lapsed: inService.filter((s) => s === 'overdue').length,
    });
    expect(digest.testsDueSoon).toBe(4);
  });
});
