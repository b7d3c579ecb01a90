// Voiding a wrong scan. The log is never edited or deleted: the scan (and the
// steps it implied) are marked void with a reason, and the bin's current state
// is re-derived from the scans that remain. Only a bin's latest recorded scan
// can be voided; to undo an older one, void the later ones first (each is a
// deliberate step a planner can see in the history).
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/models';
import { AppError } from '@/lib/api-errors';
import { replayState, type LoggedEvent } from './event-replay';
import { recordAudit } from '@/lib/audit.server';
import { reverseMovesOfEvents } from '@/lib/liners/liner-ledger.server';
import type { SessionUser } from '@/lib/accounts/session-user.server';
import { getSettings } from '@/lib/settings/settings.server';
import { UNDO_REASON, undoSecondsLeft } from './undo-window';
import { syncOrderStatus } from '@/lib/planning/orders.server';
import { syncRepositioningOrder } from '@/lib/planning/repositioning-execution.server';

// What each action wrote on its trip, cleared again when the scan is voided.
const TRIP_FIELDS_BY_ACTION: Record<string, string> = {
  deliver: 'delivered_at = NULL',
  fill_seal: "filled_at = NULL, fill_product = NULL, fill_volume_l = NULL, fill_mass_kg = NULL, fill_temperature_c = NULL, seals_applied = '{}'",
  discharge: "discharged_at = NULL, discharge_site_id = NULL, seals_verified = '{}', seal_mismatch = FALSE",
  collect: 'collected_at = NULL',
};

interface EventRow {
  id: number;
  asset_id: number;
  user_id: number | null;
  recorded_at: Date;
  action: string;
  client_event_id: string | null;
  trip_id: number | null;
  voided_at: Date | null;
  inferred: boolean;
  payload: { trip?: string };
}

/**
 * `ownWithin`: the scanner undoing their own scan — only theirs, only within
 * the operator's undo window, and (as every void) only while it is the bin's latest.
 */
export async function voidScan(user: SessionUser, eventId: number, reason: string, ip: string | null, ownWithin?: { seconds: number; now: Date }) {
  return sequelize.transaction(async (t) => {
    const [event] = await sequelize.query<EventRow>(
      'SELECT id, asset_id, user_id, recorded_at, action, client_event_id, trip_id, voided_at, inferred, payload FROM scan_events WHERE id = $1',
      {
        bind: [eventId],
        type: QueryTypes.SELECT,
        transaction: t,
      },
    );
    if (!event) throw new AppError('not_found', 'No such scan.');
    // Someone else's scan is not there for an undo: the same answer as no scan at all (it may be another organisation's).
    if (ownWithin && event.user_id !== user.id) throw new AppError('not_found', 'There is no scan of yours with this number. A planner voids other people’s scans with a reason.');
    if (event.voided_at) throw new AppError('conflict', 'This scan is already void.');
    if (event.inferred || event.action === 'register')
      throw new AppError('unprocessable', 'Inferred steps and registrations are not voided on their own; void the scan that implied them, or retire the bin.');
    // Lock the bin so nothing is recorded on it while its state is rebuilt.
    await sequelize.query('SELECT id FROM assets WHERE id = $1 FOR UPDATE', { bind: [event.asset_id], transaction: t });
    const [latest] = await sequelize.query<{ id: number }>(
      `SELECT id FROM scan_events WHERE asset_id = $1 AND voided_at IS NULL AND NOT inferred ORDER BY occurred_at DESC, id DESC LIMIT 1`,
      { bind: [event.asset_id], type: QueryTypes.SELECT, transaction: t },
    );
    if (ownWithin) {
      if (latest?.id !== event.id)
        throw new AppError('conflict', 'Something was recorded on this bin after your scan, so it can no longer be undone. Ask a planner to void it with a reason.');
      if (undoSecondsLeft(event.recorded_at, ownWithin.now, ownWithin.seconds) === 0) {
        throw new AppError('unprocessable', 'The time to undo this scan has passed. Ask a planner to void it with a reason.');
      }
    }
    if (latest?.id !== event.id) throw new AppError('conflict', 'Only the latest scan of a bin can be voided. Void the later scans first.');

    const voided = await sequelize.query<{ id: number }>(
      `UPDATE scan_events SET voided_at = now(), voided_by = $2, void_reason = $3
        WHERE id = $1 OR (inferred AND asset_id = $4 AND payload->>'inferredBy' = $5) RETURNING id`,
      { bind: [event.id, user.id, reason, event.asset_id, event.client_event_id ?? ''], type: QueryTypes.SELECT, transaction: t },
    );
    // Its liner moves are reversed: a voided fit puts the liner back on the shelf (liner-moves.ts).
    await reverseMovesOfEvents(
      voided.map((v) => Number(v.id)),
      user.id,
      `Scan voided: ${reason}`,
      new Date(),
      t,
    );
    // A voided dispatch takes its bin off the order: the order's status follows (dispatched → loading → confirmed).
    const [onOrder] =
      event.action === 'dispatch' && event.trip_id
        ? await sequelize.query<{ hire_order_id: number | null }>('SELECT hire_order_id FROM trips WHERE id = $1', {
            bind: [event.trip_id],
            type: QueryTypes.SELECT,
            transaction: t,
          })
        : [];
    await undoTripEffect(event, t);
    if (onOrder?.hire_order_id) await syncOrderStatus(onOrder.hire_order_id, t);
    const repositioningOrderId = (event.payload as { repositioningOrderId?: number } | null)?.repositioningOrderId;
    if (event.action === 'dispatch' && repositioningOrderId) await syncRepositioningOrder(repositioningOrderId, t);
    const state = await rederiveAsset(event.asset_id, t);
    await recordAudit(
      {
        actor: { userId: user.id, ip },
        action: 'scan.void',
        entityType: 'scan_event',
        entityId: event.id,
        before: { action: event.action },
        after: { action: event.action, voidReason: reason, status: state.status },
      },
      { transaction: t },
    );
    return state;
  });
}

/** The scanner undoes their own scan: recorded as a void with the reason "undone by the person who scanned it". */
export async function undoOwnScan(user: SessionUser, eventId: number, ip: string | null, now = new Date()) {
  const { undoSeconds } = await getSettings();
  return voidScan(user, eventId, UNDO_REASON, ip, { seconds: undoSeconds, now });
}

async function undoTripEffect(event: EventRow, t: Transaction) {
  if (!event.trip_id) return;
  const effect = event.payload?.trip;
  if (effect === 'open') {
    // The trip existed only because of this scan: it is derived data, so it goes.
    await sequelize.query('UPDATE assets SET current_trip_id = NULL WHERE current_trip_id = $1', { bind: [event.trip_id], transaction: t });
    await sequelize.query('UPDATE scan_events SET trip_id = NULL WHERE trip_id = $1', { bind: [event.trip_id], transaction: t });
    await sequelize.query('DELETE FROM trips WHERE id = $1', { bind: [event.trip_id], transaction: t });
    return;
  }
  const sets = [TRIP_FIELDS_BY_ACTION[event.action]];
  if (effect === 'close') sets.push("returned_at = NULL, closing_site_id = NULL, status = 'open'");
  const clause = sets.filter(Boolean).join(', ');
  if (clause) await sequelize.query(`UPDATE trips SET ${clause}, version = version + 1 WHERE id = $1`, { bind: [event.trip_id], transaction: t });
}

/** Rebuilds the bin's current-state columns from its non-voided scans. */
async function rederiveAsset(assetId: number, t: Transaction) {
  const events = await sequelize.query<{ occurred_at: Date; inferred: boolean; voided_at: Date | null; payload: LoggedEvent['payload'] }>(
    'SELECT occurred_at, inferred, voided_at, payload FROM scan_events WHERE asset_id = $1 ORDER BY occurred_at, id',
    { bind: [assetId], type: QueryTypes.SELECT, transaction: t },
  );
  const s = replayState(events.map((e) => ({ occurredAt: e.occurred_at, inferred: e.inferred, voided: e.voided_at !== null, payload: e.payload })));
  const [open] = await sequelize.query<{ id: number; customer_id: number }>(`SELECT id, customer_id FROM trips WHERE asset_id = $1 AND status = 'open'`, {
    bind: [assetId],
    type: QueryTypes.SELECT,
    transaction: t,
  });
  const lastScan = events.filter((e) => !e.voided_at).at(-1)?.occurred_at ?? null;
  await sequelize.query(
    `UPDATE assets SET status = $2, site_id = $3, site_since = $4, leg = $5, prep_checked = $6, liner_lot_id = $7, filled = $8,
            trip_count = $9, current_trip_id = $10, customer_id = $11, last_scan_at = $12, version = version + 1, updated_at = now()
      WHERE id = $1`,
    {
      bind: [
        assetId,
        s.status,
        s.siteId,
        s.siteSince,
        s.leg,
        s.prepChecked,
        s.linerLotId,
        s.filled,
        s.tripCount,
        s.tripOpen ? (open?.id ?? null) : null,
        s.tripOpen ? (open?.customer_id ?? null) : null,
        lastScan,
      ],
      transaction: t,
    },
  );
  return s;
}
