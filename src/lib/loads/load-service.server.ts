// Loads: many bins scanned onto one truck in one go. Each bin added is a
// dispatch scan through the scan service (so the rule table refuses bins that
// are not ready, with its reason); the load counts them against its target,
// then carries the carrier's details onto a printable dispatch note whose link
// lets the receiving end confirm delivery with a name and a photo.
import { createHmac, timingSafeEqual } from 'node:crypto';
import { stableEventId } from '@/lib/scans/stable-event-id.server';
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize, Load, HireOrder, Site } from '@/models';
import { AppError } from '@/lib/api-errors';
import { nextReference } from '@/lib/reference-numbers.server';
import { localDate } from '@/lib/calendar';
import { recordScan, type Actor, type ScanOutcome } from '@/lib/scans/scan-service.server';
import { getSettings } from '@/lib/settings/settings.server';
import { countsAsDemand } from '@/lib/planning/order-status';
import { syncOrderStatus } from '@/lib/planning/orders.server';
import { trailerById } from '@/lib/planning/truck-runs.server';
import { binTypesForLoading } from '@/lib/planning/bin-types-for-loading.server';
import { LOAD_KIND_BY_PURPOSE, loadCapacity } from '@/lib/planning/load-plan';

export interface LoadBin {
  grai: string;
  serial: string;
  lotNumber: string | null;
  statusNow: string;
  dispatchedAt: string;
}

export interface LoadView {
  id: number;
  reference: string;
  purpose: 'hire' | 'transfer';
  status: string;
  targetCount: number;
  loaded: number;
  order: { id: number; reference: string; quantity: number; neededBy: string; product: string | null } | null;
  customer: string | null;
  depot: { id: number; name: string; address: string | null };
  destination: { id: number; name: string; address: string | null } | null;
  carrier: string | null;
  vehicleRegistration: string | null;
  driverName: string | null;
  trailerSeals: string[];
  trailer: string | null;
  dispatchedAt: string | null;
  deliveredAt: string | null;
  receivedByName: string | null;
  deliveryPhotoId: number | null;
  bins: LoadBin[];
}

/** The advisory-lock class for starting loads at a depot (the second key is the depot). */
const LOAD_START_LOCK = 7301;
const q = <T extends object>(sql: string, bind: unknown[], t?: Transaction) => sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT, transaction: t });

async function loadedCount(loadId: number, t?: Transaction): Promise<number> {
  const [row] = await q<{ n: number }>(
    `SELECT count(*)::int AS n FROM scan_events WHERE action = 'dispatch' AND payload ? 'loadId' AND (payload->>'loadId')::int = $1 AND voided_at IS NULL`,
    [loadId],
    t,
  );
  return row?.n ?? 0;
}

/** Starts a load at the user's depot for a hire order (or a transfer of empties), or resumes the one already loading. */
export async function startLoad(
  user: Actor & { id: number },
  input: { hireOrderId?: number; purpose: 'hire' | 'transfer'; destinationSiteId?: number; depotSiteId?: number; targetCount?: number },
) {
  const depotId = input.depotSiteId ?? user.homeSiteId;
  if (!depotId) throw new AppError('unprocessable', 'Choose the depot the load leaves from.');
  const depot = await Site.findByPk(depotId);
  if (!depot || depot.kind !== 'depot') throw new AppError('unprocessable', 'Loads leave from a depot.');
  const settings = await getSettings(); // read before the transaction: it must not wait for a second connection
  // Two people starting loads at one depot at once: one at a time per depot (a transaction-scoped advisory lock),
  // so the second finds the first's load for the same order instead of opening a second one.
  return sequelize.transaction(async (t) => {
    await sequelize.query('SELECT pg_advisory_xact_lock($1, $2)', { bind: [LOAD_START_LOCK, depot.id], transaction: t });
    let target = input.targetCount;
    let destination = input.destinationSiteId ?? null;
    if (input.purpose === 'hire') {
      const order = input.hireOrderId ? await HireOrder.findByPk(input.hireOrderId, { transaction: t }) : null;
      if (!order || !countsAsDemand(order.status)) throw new AppError('unprocessable', 'Choose a confirmed hire order (drafts are not loaded).');
      if (order.depotSiteId !== depot.id) throw new AppError('unprocessable', `Hire order ${order.reference} is served from another depot.`);
      const existing = await Load.findOne({ where: { hireOrderId: order.id, status: 'loading', depotSiteId: depot.id }, transaction: t });
      if (existing) return existing;
      const [{ loaded }] = (await q<{ loaded: number }>('SELECT count(*)::int AS loaded FROM trips WHERE hire_order_id = $1', [order.id], t)) as [{ loaded: number }];
      target ??= Math.max(1, Math.min(200, order.quantity - loaded));
      destination = order.deliverySiteId;
    } else {
      const dest = destination ? await Site.findByPk(destination, { transaction: t }) : null;
      if (!dest || dest.kind !== 'depot' || dest.id === depot.id) throw new AppError('unprocessable', 'A transfer goes to another depot.');
      target ??= 40;
    }
    const day = localDate(new Date(), settings.timeZone).replaceAll('-', '').slice(2);
    // Numbered per depot and local day: LD-261201-RTM-003 is Rotterdam's third load that day.
    const reference = await nextReference('loads', `LD-${day}-${depot.code.replace(/^DEP-/, '')}-`, 3, t);
    return Load.create(
      {
        reference,
        hireOrderId: input.purpose === 'hire' ? input.hireOrderId! : null,
        depotSiteId: depot.id,
        destinationSiteId: destination,
        purpose: input.purpose,
        targetCount: target,
        carrier: null,
        vehicleRegistration: null,
        driverName: null,
        dispatchedAt: null,
        deliveredAt: null,
        receivedByName: null,
        deliveryPhotoId: null,
        createdBy: user.id,
      },
      { transaction: t },
    );
  });
}

/** Adds one bin to a loading load: a dispatch scan on the load's order, refused when the load is full. */
export async function addBinToLoad(
  user: Actor,
  loadId: number,
  input: { clientEventId: string; assetId: number; occurredAt?: Date; overrideReason?: string },
): Promise<ScanOutcome & { loaded: number; target: number }> {
  return sequelize.transaction(async (t) => {
    // Lock the load so two phones loading the same truck cannot overfill it.
    const [load] = await q<{ id: number; status: string; target_count: number; hire_order_id: number | null; depot_site_id: number; purpose: 'hire' | 'transfer' }>(
      'SELECT id, status, target_count, hire_order_id, depot_site_id, purpose FROM loads WHERE id = $1 FOR UPDATE',
      [loadId],
      t,
    );
    if (!load) throw new AppError('not_found', 'No such load.');
    if (load.status !== 'loading') throw new AppError('conflict', 'This load has left; start a new one.');
    const loaded = await loadedCount(load.id, t);
    if (loaded >= load.target_count) {
      // A replay of a scan already on the load is answered, not refused.
      const [prior] = await q<{ outcome: ScanOutcome }>('SELECT outcome FROM scan_event_keys WHERE client_event_id = $1', [input.clientEventId], t);
      if (prior) return { ...prior.outcome, replayed: true, loaded, target: load.target_count };
      throw new AppError('transition_refused', `The load is full: ${loaded} of ${load.target_count} bins.`, { reason: 'load_full', action: 'dispatch' });
    }
    const outcome = await recordScan(
      user,
      {
        clientEventId: input.clientEventId,
        assetId: input.assetId,
        action: 'dispatch',
        occurredAt: input.occurredAt,
        siteId: load.depot_site_id,
        purpose: load.purpose,
        hireOrderId: load.hire_order_id ?? undefined,
        loadId: load.id,
        overrideReason: input.overrideReason,
      },
      { transaction: t },
    );
    return { ...outcome, loaded: outcome.replayed ? loaded : loaded + 1, target: load.target_count };
  });
}

/** The truck leaves: carrier details go on the load, the order is marked dispatched when complete. */
export async function dispatchLoad(
  loadId: number,
  input: { carrier: string; vehicleRegistration: string; driverName?: string | null; trailerSeals: string[]; trailerId?: number | null },
) {
  return sequelize.transaction(async (t) => {
    const load = await Load.findByPk(loadId, { transaction: t, lock: t.LOCK.UPDATE });
    if (!load) throw new AppError('not_found', 'No such load.');
    if (load.status !== 'loading') throw new AppError('conflict', 'This load has already left.');
    const loaded = await loadedCount(load.id, t);
    if (loaded === 0) throw new AppError('unprocessable', 'Scan at least one bin onto the load first.');
    if (input.trailerId != null) await checkLoadFitsTrailer(load, loaded, input.trailerId, t);
    Object.assign(load, { ...input, trailerId: input.trailerId ?? null, driverName: input.driverName || null, status: 'dispatched', dispatchedAt: new Date() });
    await load.save({ transaction: t });
    if (load.hireOrderId) await syncOrderStatus(load.hireOrderId, t);
    return load;
  });
}

/**
 * The chosen trailer must be in use and take the bins scanned on: its capacity by the load plan for the load's
 * bin type (when all its bins are of one type), erected for hire and folded for transfers.
 */
async function checkLoadFitsTrailer(load: Load, loaded: number, trailerId: number, t: Transaction) {
  const trailer = await trailerById(trailerId, t);
  if (!trailer?.active) throw new AppError('validation_failed', 'There is no trailer in use by that number.', [{ path: 'trailerId', message: 'Choose a trailer.' }]);
  const types = await q<{ id: number }>(
    `SELECT DISTINCT a.bin_type_id AS id FROM scan_events e JOIN assets a ON a.id = e.asset_id
      WHERE e.action = 'dispatch' AND e.payload ? 'loadId' AND (e.payload->>'loadId')::int = $1 AND e.voided_at IS NULL`,
    [load.id],
    t,
  );
  if (types.length !== 1) return;
  const [type] = await binTypesForLoading(types[0]!.id, t);
  const cap = type ? loadCapacity(trailer, type.bin, LOAD_KIND_BY_PURPOSE[load.purpose as 'hire' | 'transfer']) : null;
  if (cap?.ok && loaded > cap.bins) {
    throw new AppError('unprocessable', `${loaded} bins are on the load but the ${trailer.name} takes ${cap.bins} ${type!.name}: ${cap.explanation}`, {
      capacity: cap.bins,
    });
  }
}

/** The delivery link printed on the note: the load reference and an HMAC of it (nothing stored). */
export function deliveryToken(load: { id: number; reference: string }): string {
  const mac = createHmac('sha256', secret()).update(`load-delivery:${load.id}:${load.reference}`).digest('base64url').slice(0, 32);
  return `${load.reference}.${mac}`;
}

/** The id of the load with this reference; not_found when there is none. */
export async function loadIdByReference(reference: string): Promise<number> {
  const load = reference ? await Load.findOne({ where: { reference }, attributes: ['id'] }) : null;
  if (!load) throw new AppError('not_found', 'No such load.');
  return load.id;
}

/** The customer a load goes to (through its hire order); null for a transfer between depots. */
export async function loadCustomerId(load: Load): Promise<number | null> {
  const order = load.hireOrderId ? await HireOrder.findByPk(load.hireOrderId, { attributes: ['customerId'] }) : null;
  return order?.customerId ?? null;
}

export async function loadFromToken(token: string): Promise<Load | null> {
  const [reference, mac] = token.split('.');
  if (!reference || !mac || reference.length > 40) return null;
  const load = await Load.findOne({ where: { reference } });
  if (!load) return null;
  const want = Buffer.from(deliveryToken(load).split('.')[1]!);
  const got = Buffer.from(mac);
  return want.length === got.length && timingSafeEqual(want, got) ? load : null;
}

function secret(): string {
  const s = process.env.AUTH_SECRET;
  if (!s) throw new AppError('unavailable', 'The server has no AUTH_SECRET; delivery links cannot be made.');
  return s;
}

/** One delivery event per (load, bin): confirming twice records each delivery once. */
const deliveryEventId = (loadId: number, assetId: number) => stableEventId(`deliver:${loadId}:${assetId}`);

/**
 * The receiving end confirms the load arrived: each bin still on its way is
 * recorded delivered at the order's delivery site, and the load keeps the
 * receiver's name and photo.
 */
export async function confirmDelivery(load: Load, input: { receivedByName: string; photoId: number | null; userId: number | null }) {
  if (load.purpose !== 'hire' || !load.hireOrderId || !load.destinationSiteId) throw new AppError('unprocessable', 'Only hire loads are confirmed at a customer site.');
  if (load.status === 'delivered') return { delivered: 0, already: true };
  if (load.status !== 'dispatched') throw new AppError('conflict', 'This load has not left the depot yet.');
  const order = await HireOrder.findByPk(load.hireOrderId);
  const actor: Actor = { id: input.userId, role: 'customer', organisationId: order!.customerId, homeSiteId: null };
  const bins = await q<{ asset_id: number }>(
    `SELECT t.asset_id FROM trips t JOIN assets a ON a.id = t.asset_id
      WHERE t.load_id = $1 AND a.current_trip_id = t.id AND a.status = 'in_transit' AND a.leg = 'outbound'`,
    [load.id],
  );
  let delivered = 0;
  for (const b of bins) {
    await recordScan(actor, {
      clientEventId: deliveryEventId(load.id, b.asset_id),
      assetId: b.asset_id,
      action: 'deliver',
      siteId: load.destinationSiteId,
      note: `Received by ${input.receivedByName}`,
    });
    delivered += 1;
  }
  load.status = 'delivered';
  load.deliveredAt = new Date();
  load.receivedByName = input.receivedByName;
  load.deliveryPhotoId = input.photoId;
  await load.save();
  return { delivered, already: false };
}

export async function loadView(reference: string): Promise<LoadView | null> {
  const [row] = await q<Record<string, unknown>>(
    `SELECT l.*, ho.reference AS order_ref, ho.quantity, ho.needed_by, ho.product, o.name AS customer,
            d.name AS depot_name, d.address AS depot_address, ds.name AS dest_name, ds.address AS dest_address, tr.name AS trailer_name
       FROM loads l JOIN sites d ON d.id = l.depot_site_id
       LEFT JOIN trailers tr ON tr.id = l.trailer_id
       LEFT JOIN hire_orders ho ON ho.id = l.hire_order_id
       LEFT JOIN organisations o ON o.id = ho.customer_id
       LEFT JOIN sites ds ON ds.id = l.destination_site_id
      WHERE l.reference = $1`,
    [reference],
  );
  if (!row) return null;
  const bins = await q<LoadBin>(
    `SELECT a.grai, a.serial, ll.lot_number AS "lotNumber", a.status AS "statusNow", e.occurred_at AS "dispatchedAt"
       FROM scan_events e JOIN assets a ON a.id = e.asset_id
       LEFT JOIN trips t ON t.id = e.trip_id
       LEFT JOIN liner_lots ll ON ll.id = t.liner_lot_id
      WHERE e.action = 'dispatch' AND e.payload ? 'loadId' AND (e.payload->>'loadId')::int = $1 AND e.voided_at IS NULL
      ORDER BY e.occurred_at DESC, e.id DESC`,
    [row.id],
  );
  const iso = (v: unknown) => (v instanceof Date ? v.toISOString() : v == null ? null : String(v));
  return {
    id: row.id as number,
    reference: row.reference as string,
    purpose: row.purpose as 'hire' | 'transfer',
    status: row.status as string,
    targetCount: row.target_count as number,
    loaded: bins.length,
    order: row.hire_order_id
      ? {
          id: row.hire_order_id as number,
          reference: row.order_ref as string,
          quantity: row.quantity as number,
          neededBy: row.needed_by as string,
          product: (row.product as string) ?? null,
        }
      : null,
    customer: (row.customer as string) ?? null,
    depot: { id: row.depot_site_id as number, name: row.depot_name as string, address: (row.depot_address as string) ?? null },
    destination: row.destination_site_id ? { id: row.destination_site_id as number, name: row.dest_name as string, address: (row.dest_address as string) ?? null } : null,
    carrier: (row.carrier as string) ?? null,
    vehicleRegistration: (row.vehicle_registration as string) ?? null,
    driverName: (row.driver_name as string) ?? null,
    trailerSeals: (row.trailer_seals as string[]) ?? [],
    trailer: (row.trailer_name as string) ?? null,
    dispatchedAt: iso(row.dispatched_at),
    deliveredAt: iso(row.delivered_at),
    receivedByName: (row.received_by_name as string) ?? null,
    deliveryPhotoId: (row.delivery_photo_id as number) ?? null,
    bins: bins.map((b) => ({ ...b, dispatchedAt: iso(b.dispatchedAt)! })),
  };
}
