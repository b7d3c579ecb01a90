// Hand-made pool rows for report tests: bins registered through the app (so each has its register entry in
// the log), then put into exactly the state a test needs with plain SQL, and trips and log entries written
// with the dates the test's arithmetic uses. The table constraints still apply, so every state is a legal one.
import { QueryTypes } from 'sequelize';
import { sequelize } from './db';
import { registerBin } from '@/lib/bins/bin-register.server';
import { makeGrai } from '@/lib/gs1';
import type { Actor } from '@/lib/scans/scan-service.server';

export async function handBin(actor: Actor, opts: { serial: string; binTypeId: number; siteId: number; registeredAt: string; assetType?: string }) {
  const grai = makeGrai('9529999', opts.assetType ?? '10010', opts.serial);
  return registerBin(actor, { grai, binTypeId: opts.binTypeId, siteId: opts.siteId, manufactureMonth: '2026-01' }, { now: new Date(opts.registeredAt) });
}

/** Sets asset columns directly (column names as in the table). */
export async function setAsset(id: number, fields: Record<string, unknown>) {
  const keys = Object.keys(fields);
  const sets = keys.map((k, i) => `${k} = $${i + 2}`).join(', ');
  await sequelize.query(`UPDATE assets SET ${sets} WHERE id = $1`, { bind: [id, ...keys.map((k) => fields[k])] });
}

export interface HandTrip {
  assetId: number;
  customerId: number;
  depotSiteId: number;
  customerSiteId?: number | null;
  linerLotId?: number | null;
  dispatchedAt: string;
  deliveredAt?: string | null;
  dischargedAt?: string | null;
  collectedAt?: string | null;
  returnedAt?: string | null;
  fillProduct?: string | null;
  fillVolumeL?: number | null;
  sealsApplied?: string[];
  sealsVerified?: string[];
  sealMismatch?: boolean;
}

export async function handTrip(t: HandTrip): Promise<number> {
  const [row] = await sequelize.query<{ id: number }>(
    `INSERT INTO trips (asset_id, customer_id, depot_site_id, customer_site_id, liner_lot_id, dispatched_at, delivered_at, discharged_at,
                        collected_at, returned_at, fill_product, fill_volume_l, seals_applied, seals_verified, seal_mismatch, status)
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14, $15, $16) RETURNING id`,
    {
      bind: [
        t.assetId,
        t.customerId,
        t.depotSiteId,
        t.customerSiteId ?? null,
        t.linerLotId ?? null,
        t.dispatchedAt,
        t.deliveredAt ?? null,
        t.dischargedAt ?? null,
        t.collectedAt ?? null,
        t.returnedAt ?? null,
        t.fillProduct ?? null,
        t.fillVolumeL ?? null,
        t.sealsApplied ?? [],
        t.sealsVerified ?? [],
        t.sealMismatch ?? false,
        t.returnedAt ? 'closed' : 'open',
      ],
      type: QueryTypes.SELECT,
    },
  );
  return row!.id;
}

export async function logEvent(e: { assetId: number; action: string; occurredAt: string; statusTo: string; tripId?: number | null; siteId?: number | null; voided?: boolean }) {
  await sequelize.query(
    `INSERT INTO scan_events (asset_id, action, occurred_at, status_to, trip_id, site_id, voided_at, void_reason)
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8)`,
    { bind: [e.assetId, e.action, e.occurredAt, e.statusTo, e.tripId ?? null, e.siteId ?? null, e.voided ? e.occurredAt : null, e.voided ? 'scanned the wrong bin' : null] },
  );
}

export async function sqlRows<T extends object>(sql: string, bind: unknown[] = []): Promise<T[]> {
  return sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT });
}

let rawSerial = 0;
/**
 * A bin row written straight into `assets` in exactly the given state (no register event), with an optional
 * current trip: for drift tests that compare an SQL restatement of a rule with the pure rule on many states.
 */
export async function rawBin(b: {
  binTypeId: number;
  status: string;
  siteId?: number | null;
  siteSince?: string | null;
  customerId?: number | null;
  leg?: string | null;
  lastScanAt?: string | null;
  nextDue?: string | null;
  trip?: { customerId: number; depotSiteId: number; dispatchedAt: string; deliveredAt?: string | null };
}): Promise<number> {
  rawSerial += 1;
  const serial = `D${String(rawSerial).padStart(5, '0')}`;
  const [row] = await sequelize.query<{ id: number }>(
    `INSERT INTO assets (grai, serial, bin_type_id, manufacture_month, status, site_id, site_since, customer_id, leg, last_scan_at,
                         next_intermediate_due, next_full_due, next_due)
     VALUES ($1, $2, $3, '2024-01-01', $4, $5, $6, $7, $8, $9, $10, $10, $10) RETURNING id`,
    {
      bind: [
        makeGrai('9529999', '10010', serial),
        serial,
        b.binTypeId,
        b.status,
        b.siteId ?? null,
        b.siteSince ?? null,
        b.customerId ?? null,
        b.leg ?? null,
        b.lastScanAt ?? null,
        b.nextDue ?? null,
      ],
      type: QueryTypes.SELECT,
    },
  );
  const id = row!.id;
  if (b.trip) {
    const [trip] = await sequelize.query<{ id: number }>(
      `INSERT INTO trips (asset_id, customer_id, depot_site_id, dispatched_at, delivered_at, status) VALUES ($1, $2, $3, $4, $5, 'open') RETURNING id`,
      { bind: [id, b.trip.customerId, b.trip.depotSiteId, b.trip.dispatchedAt, b.trip.deliveredAt ?? null], type: QueryTypes.SELECT },
    );
    await sequelize.query('UPDATE assets SET current_trip_id = $1 WHERE id = $2', { bind: [trip!.id, id] });
  }
  return id;
}
