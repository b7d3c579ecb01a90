import { describe, test, expect } from 'vitest';
import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { usePoolWorld, newBin, appErrorOf } from '../support/fixtures';
import { sequelize } from '../support/db';
import { recordScan, type ScanInput } from '@/lib/scans/scan-service.server';
import { voidScan } from '@/lib/scans/scan-corrections.server';
import { onHand, receiveLot, scrapLiners, sendTransfer, receiveTransfer, inTransitTo, sendKits, recordCount, stockAt } from '@/lib/liners/liner-ledger.server';
import { lotsAt } from '@/lib/yard/action-options.server';
import { User } from '@/models';
import type { SessionUser } from '@/lib/accounts/session-user.server';

const w = usePoolWorld();
const NOW = new Date('2026-12-01T12:00:00Z');
let minute = 0;
const at = () => new Date(Date.UTC(2026, 10, 20, 8, minute++));
const scan = (actor: typeof w.yard, assetId: number, input: Omit<ScanInput, 'clientEventId' | 'assetId'>) =>
  recordScan(actor, { clientEventId: randomUUID(), assetId, occurredAt: at(), ...input }, { now: NOW });

async function checkedBin() {
  const bin = await newBin(w);
  await scan(w.yard, bin.id, { action: 'prep_check', prepResult: 'pass', siteId: w.depot.id });
  return bin;
}

async function negativeBalances(): Promise<number> {
  const [r] = await sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM (SELECT lot_id, site_id FROM liner_moves GROUP BY lot_id, site_id HAVING sum(quantity) < 0) x', {
    type: QueryTypes.SELECT,
  });
  return r!.n;
}

async function newLot(lotNumber: string, quantity: number) {
  const { lotId } = await receiveLot(
    { id: null },
    { supplier: 'Ledger Liners', lotNumber, spec: 'PE bag', quantity, receivedOn: '2026-10-01', expiryDate: '2028-10-01', siteId: w.depot.id },
  );
  return lotId;
}

describe('the liner stock ledger', () => {
  test('20 concurrent fits on the last 5 liners: exactly 5 succeed, stock ends at 0, never below', async () => {
    const lotId = await newLot('LL-LAST5', 20);
    await scrapLiners({ id: null }, { lotId, siteId: w.depot.id, quantity: 15, reason: 'Cartons crushed in the rack' });
    expect(await onHand(lotId, w.depot.id)).toBe(5);
    const bins = [];
    for (let i = 0; i < 20; i += 1) bins.push(await checkedBin());

    const results = await Promise.allSettled(bins.map((b) => scan(w.yard, b.id, { action: 'fit_liner', linerLotId: lotId, siteId: w.depot.id })));
    const ok = results.filter((r) => r.status === 'fulfilled');
    const refused = results.filter((r): r is PromiseRejectedResult => r.status === 'rejected');
    expect(ok.length).toBe(5);
    expect(refused.length).toBe(15);
    for (const r of refused) {
      expect(r.reason.code).toBe('transition_refused');
      expect(r.reason.details.reason).toBe('lot_empty');
      expect(r.reason.message).toMatch(/No liners of lot LL-LAST5 are left at this depot/);
    }
    expect(await onHand(lotId, w.depot.id)).toBe(0);
    expect(await negativeBalances()).toBe(0);
    const [fits] = await sequelize.query<{ moves: number; events: number }>(
      `SELECT (SELECT count(*)::int FROM liner_moves WHERE lot_id = $1 AND kind = 'fitted') moves,
              (SELECT count(*)::int FROM scan_events WHERE action = 'fit_liner' AND (payload->>'linerLotId')::int = $1) events`,
      { bind: [lotId], type: QueryTypes.SELECT },
    );
    expect(fits).toEqual({ moves: 5, events: 5 });
    // the used-up lot is no longer offered for a fit
    expect((await lotsAt(w.depot.id, '2026-11-20')).map((l) => l.lotNumber)).not.toContain('LL-LAST5');
  }, 60_000);

  test('a fit takes one liner; folding the lined bin at the depot records the liner as discarded, not restocked', async () => {
    const bin = await checkedBin();
    const before = await onHand(w.lot.id, w.depot.id);
    await scan(w.yard, bin.id, { action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id });
    expect(await onHand(w.lot.id, w.depot.id)).toBe(before - 1);
    await scan(w.yard, bin.id, { action: 'fold', siteId: w.depot.id });
    expect(await onHand(w.lot.id, w.depot.id)).toBe(before - 1);
    const moves = await sequelize.query<{ kind: string; quantity: number; reason: string | null }>(
      'SELECT kind, quantity, reason FROM liner_moves WHERE asset_id = $1 ORDER BY id',
      { bind: [bin.id], type: QueryTypes.SELECT },
    );
    expect(moves.map((m) => [m.kind, m.quantity])).toEqual([
      ['fitted', -1],
      ['fitted_discarded', 0],
    ]);
    expect(moves[1]!.reason).toMatch(/folded at the depot/);
  });

  test('quarantining a lined bin records its liner as discarded', async () => {
    const bin = await checkedBin();
    await scan(w.yard, bin.id, { action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id });
    await scan(w.yard, bin.id, { action: 'quarantine', siteId: w.depot.id });
    const kinds = await sequelize.query<{ kind: string }>('SELECT kind FROM liner_moves WHERE asset_id = $1 ORDER BY id', { bind: [bin.id], type: QueryTypes.SELECT });
    expect(kinds.map((k) => k.kind)).toEqual(['fitted', 'fitted_discarded']);
  });

  test('a voided fit puts its liner back on the shelf', async () => {
    const planner = (await User.findByPk(w.planner.id!))!;
    const me: SessionUser = {
      id: planner.id,
      email: planner.email,
      name: planner.name,
      role: planner.role,
      organisationId: planner.organisationId,
      organisationName: '',
      homeSiteId: null,
      qualifiedInspector: false,
    };
    const bin = await checkedBin();
    const before = await onHand(w.lot.id, w.depot.id);
    const fit = await scan(w.yard, bin.id, { action: 'fit_liner', linerLotId: w.lot.id, siteId: w.depot.id });
    expect(await onHand(w.lot.id, w.depot.id)).toBe(before - 1);
    await voidScan(me, fit.eventId, 'Wrong bin scanned', '127.0.0.1');
    expect(await onHand(w.lot.id, w.depot.id)).toBe(before);
    const moves = await sequelize.query<{ kind: string; quantity: number }>('SELECT kind, quantity FROM liner_moves WHERE asset_id = $1 ORDER BY id', {
      bind: [bin.id],
      type: QueryTypes.SELECT,
    });
    expect(moves).toEqual([
      { kind: 'fitted', quantity: -1 },
      { kind: 'reversal', quantity: 1 },
    ]);
  });

  test('a lot with no stock at the fitting depot is refused, and the refusal leaves no trace', async () => {
    const lotId = await newLot('LL-ELSEWHERE', 10);
    await sendTransfer({ id: null }, { lotId, fromSiteId: w.depot.id, toSiteId: w.depot2.id, quantity: 10 });
    const bin = await checkedBin();
    const err = await appErrorOf(scan(w.yard, bin.id, { action: 'fit_liner', linerLotId: lotId, siteId: w.depot.id }));
    expect((err.details as { reason: string }).reason).toBe('lot_empty');
    expect(await sequelize.query('SELECT 1 FROM scan_events WHERE asset_id = $1 AND action = $2', { bind: [bin.id, 'fit_liner'], type: QueryTypes.SELECT })).toEqual([]);
  });

  test('a transfer is in transit until it arrives; kits, scrap and counts each write their move', async () => {
    const lotId = await newLot('LL-MOVES', 100);
    const sent = await sendTransfer({ id: w.planner.id }, { lotId, fromSiteId: w.depot.id, toSiteId: w.depot2.id, quantity: 30 });
    expect(await onHand(lotId, w.depot.id)).toBe(70);
    expect(await onHand(lotId, w.depot2.id)).toBe(0);
    expect((await inTransitTo(w.depot2.id)).filter((m) => m.lotId === lotId)).toEqual([expect.objectContaining({ sentMoveId: sent, quantity: 30, fromSiteId: w.depot.id })]);
    await receiveTransfer({ id: w.planner.id }, sent);
    expect(await onHand(lotId, w.depot2.id)).toBe(30);
    expect((await inTransitTo(w.depot2.id)).filter((m) => m.lotId === lotId)).toEqual([]);
    expect((await appErrorOf(receiveTransfer({ id: w.planner.id }, sent))).code).toBe('conflict');

    await sendKits({ id: w.planner.id }, { lotId, siteId: w.depot.id, hireOrderId: w.order.id, quantity: 12, foldedBins: 12 });
    expect(await onHand(lotId, w.depot.id)).toBe(58);
    expect((await appErrorOf(scrapLiners({ id: null }, { lotId, siteId: w.depot.id, quantity: 59, reason: 'Water damage' }))).message).toMatch(
      /Only 58 liners of lot LL-MOVES are left/,
    );
    await scrapLiners({ id: null }, { lotId, siteId: w.depot.id, quantity: 3, reason: 'Water damage' });
    const count = await recordCount({ id: w.yard.id }, { lotId, siteId: w.depot.id, counted: 52 });
    expect(count).toMatchObject({ counted: 52, expected: 55, quantity: -3 });
    const matched = await recordCount({ id: w.yard.id }, { lotId, siteId: w.depot.id, counted: 52 });
    expect(matched).toMatchObject({ counted: 52, expected: 52, quantity: 0 });
    expect(await onHand(lotId, w.depot.id)).toBe(52);
    expect((await stockAt(w.depot2.id)).find((l) => l.lotId === lotId)?.onHand).toBe(30);
    expect(await negativeBalances()).toBe(0);
  });

  test('the table itself refuses a negative balance and any edit of a move', async () => {
    const lotId = await newLot('LL-GUARD', 2);
    const sqlError = async (sql: string, bind: unknown[]) => {
      try {
        await sequelize.query(sql, { bind });
        return null;
      } catch (e) {
        return (e as { parent?: { constraint?: string } }).parent?.constraint ?? 'other';
      }
    };
    expect(await sqlError(`INSERT INTO liner_moves (lot_id, site_id, kind, quantity, occurred_at, reason) VALUES ($1, $2, 'scrapped', -3, now(), 'x')`, [lotId, w.depot.id])).toBe(
      'liner_moves_never_negative',
    );
    expect(await sqlError('UPDATE liner_moves SET quantity = 5 WHERE lot_id = $1', [lotId])).toBe('liner_moves_append_only');
    expect(await sqlError('DELETE FROM liner_moves WHERE lot_id = $1', [lotId])).toBe('liner_moves_append_only');
    expect(await onHand(lotId, w.depot.id)).toBe(2);
  });
});
