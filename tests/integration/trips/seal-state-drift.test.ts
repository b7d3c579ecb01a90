// The trip list's "seal mismatch" filter restates sealState() in SQL (sealMismatchSql). Both are computed here on
// the same hand-made trips — re-ordered, duplicated (rows written before duplicates were refused), replaced,
// missing, extra, empty, case-differing, flagged — and must agree row by row.
import { describe, test, expect } from 'vitest';
import { usePoolWorld } from '../support/fixtures';
import { handBin, handTrip, sqlRows } from '../support/hand-made';
import { sealMismatchSql, sealState } from '@/lib/trips/seal-check';
import { listTrips } from '@/lib/trips/trip-list.server';
import { parseTripListQuery } from '@/lib/trips/trip-list-query';

const w = usePoolWorld();

const CASES: Array<[applied: string[], verified: string[], flagged: boolean]> = [
  [[], [], false],
  [['TE1', 'TE2'], [], false],
  [['TE1', 'TE2'], ['TE1', 'TE2'], false],
  [['TE1', 'TE2'], ['TE2', 'TE1'], false],
  [['A', 'B', 'C'], ['C', 'A', 'B'], false],
  [['TE1', 'TE2'], ['TE1', 'TE1'], false],
  [['TE1', 'TE1'], ['TE1'], false],
  [['TE1'], ['TE1', 'TE1'], false],
  [['TE1', 'TE1', 'TE2'], ['TE2', 'TE1', 'TE1'], false],
  [['TE1', 'TE2'], ['TE1', 'TE9'], false],
  [['TE1', 'TE2'], ['TE1'], false],
  [['TE1'], ['TE1', 'TE2'], false],
  [['C1'], ['c1'], false],
  [[], ['TE1'], false],
  [['Z-9', 'a.1', 'B/2'], ['B/2', 'Z-9', 'a.1'], false],
  [['TE1'], ['TE1'], true],
  [[], [], true],
];

describe('seal state: SQL and sealState() agree', () => {
  test('on every hand-made trip', async () => {
    const bin = await handBin(w.planner, { serial: '501', binTypeId: w.binType.id, siteId: w.depot.id, registeredAt: '2026-01-05T10:00:00Z' });
    const ids: number[] = [];
    for (const [i, [applied, verified, flagged]] of CASES.entries()) {
      const day = String(i + 1).padStart(2, '0');
      ids.push(
        await handTrip({
          assetId: bin.id,
          customerId: w.customer.id,
          depotSiteId: w.depot.id,
          dispatchedAt: `2026-03-${day}T10:00:00Z`,
          returnedAt: `2026-03-${day}T16:00:00Z`,
          sealsApplied: applied,
          sealsVerified: verified,
          sealMismatch: flagged,
        }),
      );
    }
    const rows = await sqlRows<{ id: number; seals_applied: string[]; seals_verified: string[]; seal_mismatch: boolean; sql_mismatch: boolean }>(
      `SELECT t.id, t.seals_applied, t.seals_verified, t.seal_mismatch, (${sealMismatchSql('t')}) IS TRUE AS sql_mismatch FROM trips t ORDER BY t.id`,
    );
    expect(rows.map((r) => r.id)).toEqual(ids);
    const pure = rows.map((r) => sealState(r.seals_applied, r.seals_verified, r.seal_mismatch) === 'mismatch');
    expect(rows.map((r) => r.sql_mismatch)).toEqual(pure);
    // and the worked answers, so the two cannot agree on something wrong
    expect(pure).toEqual([false, false, false, false, false, true, true, true, false, true, true, true, true, true, false, true, true]);

    // The list's filter and the badge it shows say the same.
    const parsed = parseTripListQuery({ mismatch: '1', size: '200' });
    if (!parsed.ok) throw new Error('query');
    const listed = await listTrips(parsed.query);
    expect(listed.rows.map((r) => r.id).sort((a, b) => a - b)).toEqual(ids.filter((_, i) => pure[i]));
    expect(new Set(listed.rows.map((r) => r.seals.state))).toEqual(new Set(['mismatch']));
  });
});
