// What scans and inspections do to a bin's repair order, inside their own transaction: a failed prep check or a
// failed inspection opens one (one open order per bin), a passed test after repair closes it, sending the bin to
// a repair shop moves it there, retiring the bin ends it, and a planner's release ends it as withdrawn — unless
// work was recorded on it: a repaired bin goes back in service through the test after repair. Kept apart from
// repairs.server.ts so the scan service can call it without importing what imports the scan service.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/models';
import { AppError } from '@/lib/api-errors';
import type { Action } from '@/lib/scans/lifecycle';
import type { TestOutcome } from './inspection-due';
import type { PeriodicKind } from './inspection-form';
import { closesRepair, opensRepair, type RepairSource } from './repairs';

export interface OpenRepair {
  assetId: number;
  openedFrom: RepairSource;
  fault: string;
  inspectionId?: number | null;
  scanEventId?: number | null;
  damageReportId?: number | null;
  customerId?: number | null;
  estimatedCost?: string | null;
  /** Where it is: a repair shop site makes it a shop repair there. */
  siteId?: number | null;
  openedBy: number | null;
}

/** Opens the bin's repair order, or answers the one already open (opened: false). */
export async function openRepairOrder(o: OpenRepair, t: Transaction): Promise<{ id: number; opened: boolean }> {
  const [row] = await sequelize.query<{ id: number }>(
    `INSERT INTO repair_orders (asset_id, opened_from, inspection_id, scan_event_id, damage_report_id, customer_id, fault, estimated_cost, place, repair_site_id, opened_by)
     SELECT $1, $2, $3, $4, $5, $6, left(btrim($7), 2000), $8,
            CASE WHEN s.kind = 'repair' THEN 'shop' ELSE 'in_house' END, CASE WHEN s.kind = 'repair' THEN s.id END, $10
       FROM (SELECT 1) one LEFT JOIN sites s ON s.id = $9
     ON CONFLICT (asset_id) WHERE status = 'open' DO NOTHING RETURNING id`,
    {
      bind: [
        o.assetId,
        o.openedFrom,
        o.inspectionId ?? null,
        o.scanEventId ?? null,
        o.damageReportId ?? null,
        o.customerId ?? null,
        o.fault.trim() || 'No fault described.',
        o.estimatedCost ?? null,
        o.siteId ?? null,
        o.openedBy,
      ],
      type: QueryTypes.SELECT,
      transaction: t,
    },
  );
  if (row) return { id: row.id, opened: true };
  const [open] = await sequelize.query<{ id: number }>(`SELECT id FROM repair_orders WHERE asset_id = $1 AND status = 'open'`, {
    bind: [o.assetId],
    type: QueryTypes.SELECT,
    transaction: t,
  });
  return { id: open!.id, opened: false };
}

async function openOrderOf(assetId: number, t: Transaction): Promise<{ id: number; work: number } | undefined> {
  const [row] = await sequelize.query<{ id: number; work: number }>(
    `SELECT r.id, (SELECT count(*)::int FROM repair_work w WHERE w.repair_order_id = r.id) AS work
       FROM repair_orders r WHERE r.asset_id = $1 AND r.status = 'open' FOR UPDATE OF r`,
    { bind: [assetId], type: QueryTypes.SELECT, transaction: t },
  );
  return row;
}

async function endOrder(id: number, status: 'retired' | 'withdrawn', actorId: number | null, note: string | null, t: Transaction) {
  await sequelize.query(
    `UPDATE repair_orders SET status = $2, closed_at = now(), closed_by = $3, close_note = left($4, 500), version = version + 1, updated_at = now() WHERE id = $1`,
    { bind: [id, status, actorId, note], transaction: t },
  );
}

export interface ScanForRepair {
  action: Action;
  assetId: number;
  eventId: number;
  siteId: number | null;
  siteKind: string | null;
  actorId: number | null;
  prepResult?: 'pass' | 'fail';
  faults?: string;
  note?: string;
}

/** Called by the scan service after the event is written (never on a replay). */
export async function repairEffectsOfScan(s: ScanForRepair, t: Transaction): Promise<void> {
  if (s.action === 'prep_check' && s.prepResult === 'fail') {
    await openRepairOrder(
      { assetId: s.assetId, openedFrom: 'prep_check', scanEventId: s.eventId, fault: s.faults?.trim() || 'The prep check failed.', siteId: s.siteId, openedBy: s.actorId },
      t,
    );
    return;
  }
  if (!['send_to_repair', 'retire', 'release'].includes(s.action)) return;
  const open = await openOrderOf(s.assetId, t);
  if (!open) return;
  if (s.action === 'send_to_repair' && s.siteKind === 'repair') {
    await sequelize.query(`UPDATE repair_orders SET place = 'shop', repair_site_id = $2, version = version + 1, updated_at = now() WHERE id = $1`, {
      bind: [open.id, s.siteId],
      transaction: t,
    });
  } else if (s.action === 'retire') {
    await endOrder(open.id, 'retired', s.actorId, s.note?.trim() || null, t);
  } else if (s.action === 'release') {
    if (open.work > 0) {
      throw new AppError('transition_refused', `Repair order ${open.id} has work recorded on it: the bin goes back in service through a passed test after repair, not a release.`, {
        reason: 'repair_needs_test',
        action: 'release',
        repairOrderId: open.id,
      });
    }
    await endOrder(open.id, 'withdrawn', s.actorId, s.note?.trim() || 'Released by a planner without repair.', t);
  }
}

/** After an inspection record is written: open an order for a failure, close the open one on a passed test after repair. */
export async function repairEffectsOfInspection(
  i: { assetId: number; inspectionId: number; kind: PeriodicKind; outcome: TestOutcome; remarks: string | null; siteId: number | null; actorId: number },
  t: Transaction,
): Promise<{ repairOrderId: number | null; repairClosed: boolean }> {
  if (closesRepair(i.kind, i.outcome)) {
    const [row] = await sequelize.query<{ id: number }>(
      `UPDATE repair_orders SET status = 'closed', closing_inspection_id = $2, closed_at = now(), closed_by = $3, version = version + 1, updated_at = now()
        WHERE asset_id = $1 AND status = 'open' RETURNING id`,
      { bind: [i.assetId, i.inspectionId, i.actorId], type: QueryTypes.SELECT, transaction: t },
    );
    return { repairOrderId: row?.id ?? null, repairClosed: Boolean(row) };
  }
  if (opensRepair(i.outcome)) {
    const { id } = await openRepairOrder(
      { assetId: i.assetId, openedFrom: 'inspection', inspectionId: i.inspectionId, fault: i.remarks ?? 'The inspection failed.', siteId: i.siteId, openedBy: i.actorId },
      t,
    );
    return { repairOrderId: id, repairClosed: false };
  }
  return { repairOrderId: null, repairClosed: false };
}
