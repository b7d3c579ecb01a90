// Repair orders for planners and the yard: the list and one order, opening one by hand or from a damage report,
// recording work on it (append-only entries), setting the estimate and the place, retiring the bin when the
// repair is proposed for retirement. Opening on a failed check and closing on a passed test after repair happen
// inside the scans and inspections themselves (repair-hooks.server.ts). Billing reads repairChargesFor().
import { QueryTypes, type Transaction } from 'sequelize';
import { randomUUID } from 'node:crypto';
import { sequelize } from '@/models';
import { AppError } from '@/lib/api-errors';
import { localDate, type LocalDate } from '@/lib/calendar';
import { getSettings } from '@/lib/settings/settings.server';
import { minorDigits } from '@/lib/billing/money';
import { recordAudit, type AuditActor } from '@/lib/audit.server';
import { recordScan, type Actor } from '@/lib/scans/scan-service.server';
import type { Status } from '@/lib/scans/lifecycle';
import { openRepairOrder } from './repair-hooks.server';
import {
  repairCost,
  repairWorkProblems,
  retirementProposal,
  toMinor,
  fromMinor,
  type RepairPlace,
  type RepairSource,
  type RepairStatus,
  type RepairWorkEntry,
  type RetirementProposal,
} from './repairs';

export interface RepairWork {
  id: number;
  performedOn: LocalDate;
  description: string;
  parts: string | null;
  labourHours: number;
  costMinor: number;
  photoIds: number[];
  recordedByName: string | null;
  createdAt: Date;
}

export interface RepairOrderView {
  id: number;
  assetId: number;
  grai: string;
  serial: string;
  binStatus: Status;
  binTypeName: string;
  unMarking: string | null;
  openedFrom: RepairSource;
  inspectionId: number | null;
  damageReportId: number | null;
  customerId: number | null;
  customerName: string | null;
  fault: string;
  estimatedMinor: number | null;
  place: RepairPlace;
  repairSiteId: number | null;
  repairSiteName: string | null;
  status: RepairStatus;
  closingInspectionId: number | null;
  closedAt: Date | null;
  closedByName: string | null;
  closeNote: string | null;
  openedByName: string | null;
  openedOn: LocalDate;
  createdAt: Date;
  version: number;
  costMinor: number;
  labourHours: number;
  currency: string;
  digits: number;
  proposal: RetirementProposal;
  thresholdMinor: number | null;
}

interface OrderRow {
  id: number;
  asset_id: number;
  grai: string;
  serial: string;
  bin_status: Status;
  bin_type_name: string;
  un_marking: string | null;
  opened_from: RepairSource;
  inspection_id: number | null;
  damage_report_id: number | null;
  customer_id: number | null;
  customer_name: string | null;
  fault: string;
  estimated_cost: string | null;
  place: RepairPlace;
  repair_site_id: number | null;
  repair_site_name: string | null;
  status: RepairStatus;
  closing_inspection_id: number | null;
  closed_at: Date | null;
  closed_by_name: string | null;
  close_note: string | null;
  opened_by_name: string | null;
  opened_on: string;
  created_at: Date;
  version: number;
  cost: string;
  labour_hours: string;
}

const ORDER_SQL = `
  SELECT r.id, r.asset_id, a.grai, a.serial, a.status AS bin_status, bt.name AS bin_type_name, a.un_marking, r.opened_from, r.inspection_id,
         r.damage_report_id, r.customer_id, o.name AS customer_name, r.fault, r.estimated_cost::text, r.place, r.repair_site_id, s.name AS repair_site_name,
         r.status, r.closing_inspection_id, r.closed_at, cu.name AS closed_by_name, r.close_note, ou.name AS opened_by_name,
         (r.created_at AT TIME ZONE $1)::date::text AS opened_on, r.created_at, r.version,
         COALESCE((SELECT sum(w.cost) FROM repair_work w WHERE w.repair_order_id = r.id), 0)::text AS cost,
         COALESCE((SELECT sum(w.labour_hours) FROM repair_work w WHERE w.repair_order_id = r.id), 0)::text AS labour_hours
    FROM repair_orders r JOIN assets a ON a.id = r.asset_id JOIN bin_types bt ON bt.id = a.bin_type_id
    LEFT JOIN organisations o ON o.id = r.customer_id LEFT JOIN sites s ON s.id = r.repair_site_id
    LEFT JOIN users cu ON cu.id = r.closed_by LEFT JOIN users ou ON ou.id = r.opened_by`;

async function money() {
  const settings = await getSettings();
  const digits = minorDigits(settings.currency);
  const thresholdMinor = settings.repairRetireThreshold === null ? null : toMinor(settings.repairRetireThreshold, digits);
  return { settings, digits, thresholdMinor };
}

function viewOf(r: OrderRow, m: Awaited<ReturnType<typeof money>>): RepairOrderView {
  const costMinor = toMinor(r.cost, m.digits) ?? 0;
  const estimatedMinor = r.estimated_cost === null ? null : (toMinor(r.estimated_cost, m.digits) ?? 0);
  return {
    id: r.id,
    assetId: r.asset_id,
    grai: r.grai,
    serial: r.serial,
    binStatus: r.bin_status,
    binTypeName: r.bin_type_name,
    unMarking: r.un_marking,
    openedFrom: r.opened_from,
    inspectionId: r.inspection_id,
    damageReportId: r.damage_report_id,
    customerId: r.customer_id,
    customerName: r.customer_name,
    fault: r.fault,
    estimatedMinor,
    place: r.place,
    repairSiteId: r.repair_site_id,
    repairSiteName: r.repair_site_name,
    status: r.status,
    closingInspectionId: r.closing_inspection_id,
    closedAt: r.closed_at,
    closedByName: r.closed_by_name,
    closeNote: r.close_note,
    openedByName: r.opened_by_name,
    openedOn: r.opened_on,
    createdAt: r.created_at,
    version: r.version,
    costMinor,
    labourHours: Number(r.labour_hours),
    currency: m.settings.currency,
    digits: m.digits,
    proposal: retirementProposal({ estimatedMinor, costMinor }, m.thresholdMinor),
    thresholdMinor: m.thresholdMinor,
  };
}

export type RepairFilter = 'open' | 'closed' | 'all';

/** The planners' list: open orders first by age, or the ended ones newest first (at most 500). */
export async function repairOrders(filter: RepairFilter = 'open'): Promise<RepairOrderView[]> {
  const m = await money();
  const where = filter === 'open' ? `WHERE r.status = 'open'` : filter === 'closed' ? `WHERE r.status <> 'open'` : '';
  const order = filter === 'open' ? 'r.created_at, r.id' : 'COALESCE(r.closed_at, r.created_at) DESC, r.id DESC';
  const rows = await sequelize.query<OrderRow>(`${ORDER_SQL} ${where} ORDER BY ${order} LIMIT 500`, { bind: [m.settings.timeZone], type: QueryTypes.SELECT });
  return rows.map((r) => viewOf(r, m));
}

export async function repairOrderById(id: number, t?: Transaction): Promise<(RepairOrderView & { work: RepairWork[] }) | null> {
  const m = await money();
  const [row] = await sequelize.query<OrderRow>(`${ORDER_SQL} WHERE r.id = $2`, { bind: [m.settings.timeZone, id], type: QueryTypes.SELECT, transaction: t });
  if (!row) return null;
  const work = await sequelize.query<{
    id: number;
    performed_on: string;
    description: string;
    parts: string | null;
    labour_hours: string;
    cost: string;
    photo_ids: number[];
    recorded_by_name: string | null;
    created_at: Date;
  }>(
    `SELECT w.id, w.performed_on::text, w.description, w.parts, w.labour_hours::text, w.cost::text, w.photo_ids, u.name AS recorded_by_name, w.created_at
       FROM repair_work w LEFT JOIN users u ON u.id = w.recorded_by WHERE w.repair_order_id = $1 ORDER BY w.performed_on, w.id`,
    { bind: [id], type: QueryTypes.SELECT, transaction: t },
  );
  return {
    ...viewOf(row, m),
    work: work.map((w) => ({
      id: w.id,
      performedOn: w.performed_on,
      description: w.description,
      parts: w.parts,
      labourHours: Number(w.labour_hours),
      costMinor: toMinor(w.cost, m.digits) ?? 0,
      photoIds: w.photo_ids,
      recordedByName: w.recorded_by_name,
      createdAt: w.created_at,
    })),
  };
}

/** The bin's open repair order, if any (the bin page links to it). */
export async function openRepairOfBin(assetId: number): Promise<{ id: number } | null> {
  const [row] = await sequelize.query<{ id: number }>(`SELECT id FROM repair_orders WHERE asset_id = $1 AND status = 'open'`, {
    bind: [assetId],
    type: QueryTypes.SELECT,
  });
  return row ?? null;
}

/** Damage reports on a known bin that no repair order was opened from yet (the planners open one from the list). */
export async function damageReportsWithoutRepair(): Promise<
  Array<{ id: number; grai: string; serial: string; description: string; customerName: string | null; createdAt: Date }>
> {
  const rows = await sequelize.query<{ id: number; grai: string; serial: string; description: string; customer_name: string | null; created_at: Date }>(
    `SELECT d.id, a.grai, a.serial, d.description, o.name AS customer_name, d.created_at
       FROM damage_reports d JOIN assets a ON a.id = d.asset_id LEFT JOIN organisations o ON o.id = d.customer_id
      WHERE d.status <> 'closed' AND a.status <> 'retired' AND NOT EXISTS (SELECT 1 FROM repair_orders r WHERE r.damage_report_id = d.id)
      ORDER BY d.created_at DESC LIMIT 50`,
    { type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ id: r.id, grai: r.grai, serial: r.serial, description: r.description, customerName: r.customer_name, createdAt: r.created_at }));
}

export interface OpenRepairInput {
  damageReportId?: number;
  assetId?: number;
  fault?: string | null;
  estimatedCost?: string | null;
}

function costOrThrow(value: string | null | undefined, digits: number, field: string): string | null {
  if (value === null || value === undefined || value.trim() === '') return null;
  const minor = toMinor(value, digits);
  if (minor === null || minor > 99_999_999_999)
    throw new AppError('validation_failed', `Enter the amount as a number such as 250 or 250.00.`, [{ path: field, message: 'An amount, e.g. 250.00.' }]);
  return fromMinor(minor, digits);
}

/**
 * A planner opens a repair order: from a damage report (the customer whose hire it was on comes with it, for
 * billing), or on a bin by hand with the fault described. A bin already under repair keeps its open order.
 */
export async function openRepair(actor: { id: number }, input: OpenRepairInput): Promise<{ id: number }> {
  const { digits } = await money();
  const estimatedCost = costOrThrow(input.estimatedCost, digits, 'estimatedCost');
  return sequelize.transaction(async (t) => {
    let o: Parameters<typeof openRepairOrder>[0];
    if (input.damageReportId !== undefined) {
      const [d] = await sequelize.query<{ id: number; asset_id: number | null; customer_id: number | null; description: string; site_id: number | null; status: string }>(
        `SELECT id, asset_id, customer_id, description, site_id, status FROM damage_reports WHERE id = $1 FOR UPDATE`,
        { bind: [input.damageReportId], type: QueryTypes.SELECT, transaction: t },
      );
      if (!d) throw new AppError('not_found', 'There is no such damage report.');
      if (d.asset_id === null) throw new AppError('unprocessable', 'That damage report names no bin: find the bin first.');
      const [already] = await sequelize.query<{ id: number }>('SELECT id FROM repair_orders WHERE damage_report_id = $1', {
        bind: [d.id],
        type: QueryTypes.SELECT,
        transaction: t,
      });
      if (already) throw new AppError('conflict', `A repair order (${already.id}) was opened from this damage report already.`, { repairOrderId: already.id });
      const fault = input.fault?.trim() || d.description;
      o = { assetId: d.asset_id, openedFrom: 'damage_report', damageReportId: d.id, customerId: d.customer_id, fault, estimatedCost, openedBy: actor.id };
    } else {
      if (input.assetId === undefined) throw new AppError('validation_failed', 'Name the bin or the damage report.', [{ path: 'assetId', message: 'Required.' }]);
      if (!input.fault?.trim()) throw new AppError('validation_failed', 'Describe the fault.', [{ path: 'fault', message: 'Say what is wrong with the bin.' }]);
      o = { assetId: input.assetId, openedFrom: 'planner', fault: input.fault, estimatedCost, openedBy: actor.id };
    }
    const [bin] = await sequelize.query<{ status: string; site_id: number | null }>('SELECT status, site_id FROM assets WHERE id = $1', {
      bind: [o.assetId],
      type: QueryTypes.SELECT,
      transaction: t,
    });
    if (!bin) throw new AppError('not_found', 'No bin with that identity is registered.');
    if (bin.status === 'retired') throw new AppError('transition_refused', 'That bin is retired; it is not repaired any more.');
    const opened = await openRepairOrder({ ...o, siteId: bin.site_id }, t);
    if (!opened.opened) {
      throw new AppError('conflict', `This bin already has an open repair order (${opened.id}); add to that one.`, { repairOrderId: opened.id });
    }
    return { id: opened.id };
  });
}

export interface WorkInput extends RepairWorkEntry {
  photoIds?: number[];
}

/** Work done on an open order (yard or planner): an entry that is never edited; the order's cost is their sum. */
export async function recordRepairWork(actor: { id: number; organisationId: number }, orderId: number, input: WorkInput, opts: { now?: Date } = {}): Promise<RepairWork> {
  const { settings, digits } = await money();
  const today = localDate(opts.now ?? new Date(), settings.timeZone);
  return sequelize.transaction(async (t) => {
    const [order] = await sequelize.query<{ id: number; asset_id: number; status: RepairStatus; opened_on: string }>(
      `SELECT id, asset_id, status, (created_at AT TIME ZONE $2)::date::text AS opened_on FROM repair_orders WHERE id = $1 FOR UPDATE`,
      { bind: [orderId, settings.timeZone], type: QueryTypes.SELECT, transaction: t },
    );
    if (!order) throw new AppError('not_found', 'There is no such repair order.');
    if (order.status !== 'open') throw new AppError('transition_refused', 'This repair order has ended; work is recorded on an open one.');
    const problems = repairWorkProblems(input, today, order.opened_on, digits);
    if (problems.length) {
      throw new AppError(
        'validation_failed',
        problems[0]!.message,
        problems.map((p) => ({ path: p.field, message: p.message })),
      );
    }
    const ids = [...new Set(input.photoIds ?? [])];
    if (ids.length) {
      // The same claim as a scan's photos: the organisation's own uploads, for this bin.
      const [claimed] = await sequelize.query<{ n: number }>(
        `WITH c AS (UPDATE attachments SET asset_id = $2 WHERE id = ANY($1::int[]) AND purpose = 'photo' AND organisation_id = $3 AND (asset_id IS NULL OR asset_id = $2) RETURNING id)
         SELECT count(*)::int AS n FROM c`,
        { bind: [ids, order.asset_id, actor.organisationId], type: QueryTypes.SELECT, transaction: t },
      );
      if (claimed?.n !== ids.length) throw new AppError('unprocessable', 'A photo named with this work is not one your organisation uploaded for this bin. Take the photo again.');
    }
    const [row] = await sequelize.query<{ id: number }>(
      `INSERT INTO repair_work (repair_order_id, performed_on, description, parts, labour_hours, cost, photo_ids, recorded_by)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8) RETURNING id`,
      {
        bind: [
          order.id,
          input.performedOn,
          input.description.trim(),
          input.parts?.trim() || null,
          input.labourHours,
          fromMinor(toMinor(input.cost, digits)!, digits),
          ids,
          actor.id,
        ],
        type: QueryTypes.SELECT,
        transaction: t,
      },
    );
    await sequelize.query('UPDATE repair_orders SET version = version + 1, updated_at = now() WHERE id = $1', { bind: [order.id], transaction: t });
    const full = await repairOrderById(order.id, t);
    return full!.work.find((w) => w.id === row!.id)!;
  });
}

export interface RepairChange {
  version: number;
  estimatedCost?: string | null;
  place?: RepairPlace;
  repairSiteId?: number | null;
}

/** A planner sets the estimate or where the repair happens; a stale page is refused (409), never merged. */
export async function updateRepairOrder(actor: AuditActor, id: number, change: RepairChange): Promise<RepairOrderView> {
  const { digits } = await money();
  return sequelize.transaction(async (t) => {
    const [order] = await sequelize.query<{ version: number; status: RepairStatus; place: RepairPlace; repair_site_id: number | null; estimated_cost: string | null }>(
      'SELECT version, status, place, repair_site_id, estimated_cost::text FROM repair_orders WHERE id = $1 FOR UPDATE',
      { bind: [id], type: QueryTypes.SELECT, transaction: t },
    );
    if (!order) throw new AppError('not_found', 'There is no such repair order.');
    if (order.version !== change.version) throw new AppError('changed_meanwhile', 'Someone changed this repair order meanwhile. Reload the page to see it.');
    if (order.status !== 'open') throw new AppError('transition_refused', 'This repair order has ended; it is kept as it was.');
    const estimated = change.estimatedCost === undefined ? order.estimated_cost : costOrThrow(change.estimatedCost, digits, 'estimatedCost');
    const place = change.place ?? order.place;
    let siteId = change.repairSiteId === undefined ? order.repair_site_id : change.repairSiteId;
    if (place === 'in_house') siteId = null;
    else {
      if (siteId === null) throw new AppError('validation_failed', 'Choose the repair shop.', [{ path: 'repairSiteId', message: 'Which repair shop?' }]);
      const [s] = await sequelize.query<{ kind: string; active: boolean }>('SELECT kind, active FROM sites WHERE id = $1', {
        bind: [siteId],
        type: QueryTypes.SELECT,
        transaction: t,
      });
      if (!s || s.kind !== 'repair' || !s.active)
        throw new AppError('validation_failed', 'That is not an open repair shop site.', [{ path: 'repairSiteId', message: 'Choose a repair shop.' }]);
    }
    await sequelize.query('UPDATE repair_orders SET estimated_cost = $2, place = $3, repair_site_id = $4, version = version + 1, updated_at = now() WHERE id = $1', {
      bind: [id, estimated, place, siteId],
      transaction: t,
    });
    await recordAudit(
      {
        actor,
        action: 'repair_order.update',
        entityType: 'repair_order',
        entityId: id,
        before: { estimatedCost: order.estimated_cost, place: order.place, repairSiteId: order.repair_site_id },
        after: { estimatedCost: estimated, place, repairSiteId: siteId },
      },
      { transaction: t },
    );
    return (await repairOrderById(id, t))!;
  });
}

/** The repair shops a planner may choose. */
export async function repairShops(): Promise<Array<{ id: number; name: string }>> {
  return sequelize.query<{ id: number; name: string }>(`SELECT id, name FROM sites WHERE kind = 'repair' AND active ORDER BY name`, { type: QueryTypes.SELECT });
}

/**
 * A planner retires the bin of an order (usually one proposed for retirement): the retire scan through the rule
 * table, which ends the order as retired (repair-hooks.server.ts).
 */
export async function retireFromRepair(actor: Actor & { id: number }, id: number, input: { version: number; note: string }): Promise<RepairOrderView> {
  const [order] = await sequelize.query<{ asset_id: number; version: number; status: RepairStatus }>('SELECT asset_id, version, status FROM repair_orders WHERE id = $1', {
    bind: [id],
    type: QueryTypes.SELECT,
  });
  if (!order) throw new AppError('not_found', 'There is no such repair order.');
  if (order.version !== input.version) throw new AppError('changed_meanwhile', 'Someone changed this repair order meanwhile. Reload the page to see it.');
  if (order.status !== 'open') throw new AppError('transition_refused', 'This repair order has ended already.');
  await recordScan(actor, { clientEventId: randomUUID(), assetId: order.asset_id, action: 'retire', siteId: null, note: input.note.trim() });
  return (await repairOrderById(id))!;
}

export interface RepairCharge {
  repairOrderId: number;
  damageReportId: number;
  assetId: number;
  grai: string;
  serial: string;
  fault: string;
  /** The day the repair ended (closed by its test, or the bin retired), in the operator's time zone. */
  endedOn: LocalDate;
  status: Extract<RepairStatus, 'closed' | 'retired'>;
  amountMinor: number;
  currency: string;
  /** The customer's trip the damage was reported on (their latest trip of the bin dispatched before the report). */
  tripId: number | null;
  /** The damage report's photo and those of the repair work, for the customer to see what was charged. */
  photoIds: number[];
}

/**
 * For billing: the repairs of damage reported while a bin was on this customer's hire, that ended within the
 * period (inclusive, the operator's days) with a cost recorded. Amounts in whole minor units (billing's money).
 */
export async function repairChargesFor(customerId: number, period: { from: LocalDate; to: LocalDate }, transaction?: Transaction): Promise<RepairCharge[]> {
  const { settings, digits } = await money();
  const rows = await sequelize.query<{
    id: number;
    damage_report_id: number;
    asset_id: number;
    grai: string;
    serial: string;
    fault: string;
    ended_on: string;
    status: 'closed' | 'retired';
    cost: string;
    trip_id: number | null;
    photo_ids: number[];
  }>(
    `SELECT r.id, r.damage_report_id, r.asset_id, a.grai, a.serial, r.fault, (r.closed_at AT TIME ZONE $2)::date::text AS ended_on, r.status,
            (SELECT sum(w.cost) FROM repair_work w WHERE w.repair_order_id = r.id)::text AS cost,
            (SELECT t.id FROM trips t WHERE t.asset_id = r.asset_id AND t.customer_id = r.customer_id AND t.dispatched_at <= d.created_at
              ORDER BY t.dispatched_at DESC LIMIT 1) AS trip_id,
            array_remove(ARRAY[d.photo_id] || coalesce((SELECT array_agg(p ORDER BY p) FROM repair_work w, unnest(w.photo_ids) AS p WHERE w.repair_order_id = r.id), '{}'), NULL) AS photo_ids
       FROM repair_orders r JOIN assets a ON a.id = r.asset_id JOIN damage_reports d ON d.id = r.damage_report_id
      WHERE r.customer_id = $1 AND r.status IN ('closed', 'retired')
        AND (r.closed_at AT TIME ZONE $2)::date BETWEEN $3::date AND $4::date
        AND EXISTS (SELECT 1 FROM repair_work w WHERE w.repair_order_id = r.id AND w.cost > 0)
      ORDER BY r.closed_at, r.id`,
    { bind: [customerId, settings.timeZone, period.from, period.to], type: QueryTypes.SELECT, transaction },
  );
  return rows.map((r) => ({
    repairOrderId: r.id,
    damageReportId: r.damage_report_id,
    assetId: r.asset_id,
    grai: r.grai,
    serial: r.serial,
    fault: r.fault,
    endedOn: r.ended_on,
    status: r.status,
    amountMinor: repairCost([{ costMinor: toMinor(r.cost, digits) ?? 0 }]),
    currency: settings.currency,
    tripId: r.trip_id,
    photoIds: r.photo_ids,
  }));
}

/** The retirement threshold in minor units and the currency, for the pages. */
export async function retireThreshold(): Promise<{ thresholdMinor: number | null; currency: string }> {
  const m = await money();
  return { thresholdMinor: m.thresholdMinor, currency: m.settings.currency };
}
