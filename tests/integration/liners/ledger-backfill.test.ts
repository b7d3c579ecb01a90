import { describe, test, expect } from 'vitest';
import { randomUUID } from 'node:crypto';
import { createRequire } from 'node:module';
import { QueryTypes } from 'sequelize';
import { usePoolWorld, newBin } from '../support/fixtures';
import { sequelize } from '../support/db';
import { recordScan, type ScanInput } from '@/lib/scans/scan-service.server';
import { voidScan } from '@/lib/scans/scan-corrections.server';
import { onHand } from '@/lib/liners/liner-ledger.server';
import { User } from '@/models';

const migration = createRequire(import.meta.url)('../../../migrations/20261223000100-liner-ledger.cjs') as {
  up: (qi: unknown) => Promise<void>;
  down: (qi: unknown) => Promise<void>;
};

const w = usePoolWorld();
const NOW = new Date('2026-12-01T12:00:00Z');
let minute = 0;
const scan = (assetId: number, input: Omit<ScanInput, 'clientEventId' | 'assetId'>) =>
  recordScan(w.yard, { clientEventId: randomUUID(), assetId, occurredAt: new Date(Date.UTC(2026, 10, 20, 8, minute++)), ...input }, { now: NOW });

describe('the ledger backfill', () => {
  test('rebuilds receipts and fits from the lots and the scan log; a voided fit counts for nothing; a shortfall becomes a count', async () => {
    const fits = [];
    for (let i = 0; i < 3; i += 1) {
      const bin = await newBin(w);
      await scan(bin.id, { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id });
      fits.push(await scan(bin.id, { action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id }));
    }
    const planner = (await User.findByPk(w.planner.id!))!;
    await voidScan(
      {
        id: planner.id,
        email: planner.email,
        name: planner.name,
        role: 'planner',
        organisationId: planner.organisationId,
        organisationName: '',
        homeSiteId: null,
        qualifiedInspector: false,
      },
      fits[2]!.eventId,
      'Wrong bin',
      null,
    );
    expect(await onHand(w.lot.id, w.depot.id)).toBe(98);

    // History from before the ledger: the table goes, and a lot shows more fits than it received.
    const qi = sequelize.getQueryInterface();
    await migration.down(qi);
    const [short] = await sequelize.query<{ id: number }>(
      `INSERT INTO liner_lots (supplier, lot_number, spec, quantity_received, received_on, expiry_date, site_id)
       VALUES ('Test Liners', 'TL-SHORT', 'PE bag', 1, '2026-01-01', '2028-01-01', $1) RETURNING id`,
      { bind: [w.depot.id], type: QueryTypes.SELECT },
    );
    const extra = await newBin(w);
    for (let i = 0; i < 3; i += 1) {
      await sequelize.query(`INSERT INTO scan_events (asset_id, action, occurred_at, site_id, status_to, payload) VALUES ($1, 'fit_liner', now(), $2, 'prepared', $3::jsonb)`, {
        bind: [extra.id, w.depot.id, JSON.stringify({ linerLotId: short!.id })],
      });
    }
    await migration.up(qi);

    expect(await onHand(w.lot.id, w.depot.id)).toBe(98);
    expect(await onHand(short!.id, w.depot.id)).toBe(0);
    const moves = await sequelize.query<{ lot_id: number; kind: string; n: number; q: number }>(
      'SELECT lot_id, kind, count(*)::int AS n, sum(quantity)::int AS q FROM liner_moves GROUP BY lot_id, kind ORDER BY lot_id, kind',
      { type: QueryTypes.SELECT },
    );
    expect(moves).toEqual([
      { lot_id: w.lot.id, kind: 'fitted', n: 2, q: -2 },
      { lot_id: w.lot.id, kind: 'receipt', n: 1, q: 100 },
      { lot_id: short!.id, kind: 'counted', n: 1, q: 2 },
      { lot_id: short!.id, kind: 'fitted', n: 3, q: -3 },
      { lot_id: short!.id, kind: 'receipt', n: 1, q: 1 },
    ]);
    const [count] = await sequelize.query<{ counted: number; expected: number }>(`SELECT counted, expected FROM liner_moves WHERE kind = 'counted'`, { type: QueryTypes.SELECT });
    expect(count).toEqual({ counted: 0, expected: -2 });
  });
});
