import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { QueryTypes } from 'sequelize';
import { randomUUID } from 'node:crypto';
import { resetDatabase, sequelize } from '../support/db';
import { seedDemo } from '@/db/seed/demo';
import { replayState } from '@/lib/scans/event-replay';
import { recordScan } from '@/lib/scans/scan-service.server';
import { voidScan } from '@/lib/scans/scan-corrections.server';
import { forgetSettings } from '@/lib/settings/settings.server';
import { Asset, Trip, User, AuditEntry } from '@/models';
import type { SessionUser } from '@/lib/accounts/session-user.server';

beforeAll(async () => {
  await resetDatabase();
  forgetSettings();
  await seedDemo({ bins: 30, months: 8, now: new Date('2026-12-01T12:00:00Z') });
}, 300_000);
afterAll(async () => {
  await sequelize.close();
});

describe('the generated demo history', () => {
  test('every bin’s stored state equals the state re-derived from its events', async () => {
    const assets = await Asset.findAll({ order: [['id', 'ASC']] });
    expect(assets.length).toBe(30);
    const events = await sequelize.query<{ asset_id: number; occurred_at: Date; inferred: boolean; voided_at: Date | null; payload: never }>(
      'SELECT asset_id, occurred_at, inferred, voided_at, payload FROM scan_events ORDER BY asset_id, occurred_at, id',
      { type: QueryTypes.SELECT },
    );
    const byAsset = new Map<number, typeof events>();
    for (const e of events) byAsset.set(e.asset_id, [...(byAsset.get(e.asset_id) ?? []), e]);
    let tested = 0;
    for (const a of assets) {
      const s = replayState((byAsset.get(a.id) ?? []).map((e) => ({ occurredAt: e.occurred_at, inferred: e.inferred, voided: e.voided_at !== null, payload: e.payload })));
      const stored = {
        status: a.status,
        siteId: a.siteId,
        siteSince: a.siteSince,
        leg: a.leg,
        prepChecked: a.prepChecked,
        linerLotId: a.linerLotId,
        filled: a.filled,
        tripCount: a.tripCount,
        tripOpen: a.currentTripId !== null,
      };
      expect({ grai: a.grai, ...stored }).toEqual({
        grai: a.grai,
        status: s.status,
        siteId: s.siteId,
        siteSince: s.siteSince,
        leg: s.leg,
        prepChecked: s.prepChecked,
        linerLotId: s.linerLotId,
        filled: s.filled,
        tripCount: s.tripCount,
        tripOpen: s.tripOpen,
      });
      // the test columns follow the last passed inspection in the log (as registered when there is none)
      if (s.schedule) {
        expect({
          grai: a.grai,
          lastInspectionOn: a.lastInspectionOn,
          lastLeakTestOn: a.lastLeakTestOn,
          lastFullInspectionOn: a.lastFullInspectionOn,
          nextIntermediateDue: a.nextIntermediateDue,
          nextFullDue: a.nextFullDue,
          nextDue: a.nextDue,
        }).toEqual({ grai: a.grai, ...s.schedule });
        tested += 1;
      }
      // the bin's open trip is the one its log opened last and did not close
      const open = await Trip.findOne({ where: { assetId: a.id, status: 'open' } });
      expect(open?.id ?? null).toBe(a.currentTripId);
      // trips closed = trip count; at most one open
      const closed = await Trip.count({ where: { assetId: a.id, status: 'closed' } });
      expect(closed).toBe(a.tripCount);
    }
    expect(tested).toBeGreaterThan(0); // the demo history tests bins through the log
  });

  test('nothing in the history happens after the day it was generated on (no test, scan or trip dated ahead)', async () => {
    const [row] = await sequelize.query<{ events: number; tests: number; assets: number }>(
      `SELECT (SELECT count(*)::int FROM scan_events WHERE occurred_at > $1) events,
              (SELECT count(*)::int FROM inspections WHERE performed_on > $2::date) tests,
              (SELECT count(*)::int FROM assets WHERE last_inspection_on > $2::date OR last_scan_at > $1) assets`,
      { type: QueryTypes.SELECT, bind: ['2026-12-01T12:00:00Z', '2026-12-01'] },
    );
    expect(row).toEqual({ events: 0, tests: 0, assets: 0 });
  });

  test('the history has trips, inferred steps and bins in several states', async () => {
    const [row] = await sequelize.query<{ trips: number; inferred: number; statuses: number }>(
      `SELECT (SELECT count(*)::int FROM trips) trips, (SELECT count(*)::int FROM scan_events WHERE inferred) inferred,
              (SELECT count(DISTINCT status)::int FROM assets) statuses`,
      { type: QueryTypes.SELECT },
    );
    expect(row!.trips).toBeGreaterThan(30);
    expect(row!.inferred).toBeGreaterThan(0);
    expect(row!.statuses).toBeGreaterThanOrEqual(3);
  });
});

describe('the demo history’s liner ledger', () => {
  test('every lot has its receipt, every fit its move, no balance below zero, and stock = received − fitted', async () => {
    const [r] = await sequelize.query<{ lots: number; receipts: number; fits: number; fitted: number; negative: number; drift: number; discarded: number }>(
      `SELECT (SELECT count(*)::int FROM liner_lots) lots,
              (SELECT count(*)::int FROM liner_moves WHERE kind = 'receipt') receipts,
              (SELECT count(*)::int FROM scan_events WHERE action = 'fit_liner' AND voided_at IS NULL) fits,
              (SELECT count(*)::int FROM liner_moves m JOIN scan_events e ON e.id = m.scan_event_id AND e.action = 'fit_liner' WHERE m.kind = 'fitted') fitted,
              (SELECT count(*)::int FROM (SELECT 1 FROM liner_moves GROUP BY lot_id, site_id HAVING sum(quantity) < 0) x) negative,
              (SELECT count(*)::int FROM liner_lots l WHERE (SELECT sum(quantity) FROM liner_moves WHERE lot_id = l.id)
                 <> l.quantity_received - (SELECT count(*) FROM scan_events e WHERE e.action = 'fit_liner' AND (e.payload->>'linerLotId')::int = l.id)) drift,
              (SELECT count(*)::int FROM liner_moves WHERE kind = 'fitted_discarded') discarded`,
      { type: QueryTypes.SELECT },
    );
    expect(r!.lots).toBeGreaterThan(0);
    expect(r!.receipts).toBe(r!.lots);
    expect(r!.fitted).toBe(r!.fits);
    expect(r!.fits).toBeGreaterThan(30);
    expect(r!.negative).toBe(0);
    expect(r!.drift).toBe(0);
  });
});

describe('voiding a wrong scan', () => {
  test('the latest scan is voided with a reason and the bin goes back to its state before it', async () => {
    const planner = await User.findOne({ where: { role: 'planner' } });
    // An empty bin waiting at a depot, quarantined by that depot's yard hand (the planner where it has none).
    const asset = await Asset.findOne({ where: { status: 'available', prepChecked: false }, order: [['id', 'ASC']] });
    expect(asset).not.toBeNull();
    const yard = (await User.findOne({ where: { role: 'yard', homeSiteId: asset!.siteId! } })) ?? planner;
    const before = { status: asset!.status, prepChecked: asset!.prepChecked };
    const me = (u: User): SessionUser => ({
      id: u.id,
      email: u.email,
      name: u.name,
      role: u.role,
      organisationId: u.organisationId,
      organisationName: '',
      homeSiteId: u.homeSiteId,
      qualifiedInspector: u.qualifiedInspector,
    });
    const out = await recordScan(me(yard!), { clientEventId: randomUUID(), assetId: asset!.id, action: 'quarantine', siteId: asset!.siteId }, { now: new Date() });
    expect(out.statusTo).toBe('quarantine');
    await voidScan(me(planner!), out.eventId, 'Scanned the wrong bin', '127.0.0.1');
    const after = await Asset.findByPk(asset!.id);
    expect({ status: after!.status, prepChecked: after!.prepChecked }).toEqual(before);
    expect(await AuditEntry.count({ where: { action: 'scan.void' } })).toBe(1);
    // the voided scan stays in the log
    const [ev] = await sequelize.query<{ void_reason: string }>('SELECT void_reason FROM scan_events WHERE id = $1', { bind: [out.eventId], type: QueryTypes.SELECT });
    expect(ev!.void_reason).toBe('Scanned the wrong bin');
  });
});
