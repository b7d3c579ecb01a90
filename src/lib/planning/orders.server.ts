// Hire orders: the list, the order page, entering one, the planner's commands,
// and the status that follows from the order's loads. The rules are the pure
// table of ./order-status; terms come from the tariff in force at the wanted
// date (./tariffs), never copied onto the order.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { AppError } from '@/lib/api-errors';
import { recordAudit, type AuditActor } from '@/lib/audit.server';
import { getSettings } from '@/lib/settings/settings.server';
import { localDate } from '@/lib/calendar';
import { HireOrder } from '@/models';
import { availableCommands, decideCommand, DEMAND_STATUSES, statusFromLoads, type OrderCommand, type OrderProgress, type OrderStatus } from './order-status';
import type { OrderInput, OrderListQuery, OrderSortKey } from './order-forms';
import type { Tariff } from './tariffs';

const q = <T extends object>(sql: string, bind: unknown[], t?: Transaction) => sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT, transaction: t });

// Bins for the order: every trip opened by a dispatch scan on it. A trip on a load
// still loading is loaded, not yet dispatched; one without a load left at its scan.
const PROGRESS_SQL = `
  SELECT count(*)::int AS loaded,
         count(*) FILTER (WHERE t.load_id IS NULL OR l.status IN ('dispatched', 'delivered'))::int AS dispatched
    FROM trips t LEFT JOIN loads l ON l.id = t.load_id
   WHERE t.hire_order_id = $1`;

async function orderProgress(orderId: number, quantity: number, t?: Transaction): Promise<OrderProgress> {
  const [row] = await q<{ loaded: number; dispatched: number }>(PROGRESS_SQL, [orderId], t);
  return { quantity, loaded: row?.loaded ?? 0, dispatched: row?.dispatched ?? 0 };
}

/**
 * Moves the order to the status its loads give it (confirmed → loading →
 * dispatched). Call inside the transaction that loaded or dispatched bins.
 */
export async function syncOrderStatus(orderId: number, t: Transaction): Promise<OrderStatus | null> {
  const [order] = await q<{ id: number; status: OrderStatus; quantity: number }>('SELECT id, status, quantity FROM hire_orders WHERE id = $1 FOR UPDATE', [orderId], t);
  if (!order) return null;
  const next = statusFromLoads(order.status, await orderProgress(order.id, order.quantity, t));
  if (next !== order.status) {
    await sequelize.query('UPDATE hire_orders SET status = $2, version = version + 1, updated_at = now() WHERE id = $1', {
      bind: [order.id, next],
      transaction: t,
    });
  }
  return next;
}

// ---------------------------------------------------------------------------
// Tariffs
// ---------------------------------------------------------------------------

const TARIFF_COLUMNS = `id, customer_id AS "customerId", free_days AS "freeDays", daily_rate AS "dailyRate",
  per_trip_fee AS "perTripFee", lost_bin_fee AS "lostBinFee", currency, valid_from AS "validFrom", valid_to AS "validTo",
  liner_fee AS "linerFee", stop_fee AS "stopFee", first_day_counts AS "firstDayCounts", last_day_counts AS "lastDayCounts",
  hire_starts_at AS "hireStartsAt", hire_stops_at AS "hireStopsAt"`;

export async function tariffsOf(customerId: number): Promise<Tariff[]> {
  return q<Tariff>(`SELECT ${TARIFF_COLUMNS} FROM tariffs WHERE customer_id = $1 ORDER BY valid_from DESC`, [customerId]);
}

/** The customer's tariff in force on a day (both ends of a tariff included). */
export async function tariffOn(customerId: number, day: string, t?: Transaction): Promise<Tariff | null> {
  const [row] = await q<Tariff>(
    `SELECT ${TARIFF_COLUMNS} FROM tariffs
      WHERE customer_id = $1 AND valid_from <= $2 AND (valid_to IS NULL OR valid_to >= $2)`,
    [customerId, day],
    t,
  );
  return row ?? null;
}

// ---------------------------------------------------------------------------
// The list
// ---------------------------------------------------------------------------

export interface OrderListRow {
  id: number;
  reference: string;
  status: OrderStatus;
  customerId: number;
  customer: string;
  deliverySite: string;
  depot: string;
  binType: string;
  quantity: number;
  neededBy: string;
  loaded: number;
  dispatched: number;
}

const SORT_SQL: Record<OrderSortKey, string> = {
  wanted: 'ho.needed_by',
  reference: 'ho.reference',
  customer: 'o.name',
  status: 'ho.status',
  quantity: 'ho.quantity',
  created: 'ho.created_at',
};

/** WHERE clause and binds for the filters (values always bound, never in the text). */
function orderWhere(filters: OrderListQuery['filters']): { where: string; bind: unknown[] } {
  const parts: string[] = [];
  const bind: unknown[] = [];
  const add = (sql: (n: string) => string, value: unknown) => {
    bind.push(value);
    parts.push(sql(`$${bind.length}`));
  };
  if (filters.status === 'demand') add((n) => `ho.status = ANY(${n})`, [...DEMAND_STATUSES]);
  else if (filters.status) add((n) => `ho.status = ${n}`, filters.status);
  if (filters.customer !== undefined) add((n) => `ho.customer_id = ${n}`, filters.customer);
  if (filters.depot !== undefined) add((n) => `ho.depot_site_id = ${n}`, filters.depot);
  if (filters.type !== undefined) add((n) => `ho.bin_type_id = ${n}`, filters.type);
  if (filters.from) add((n) => `ho.needed_by >= ${n}`, filters.from);
  if (filters.to) add((n) => `ho.needed_by <= ${n}`, filters.to);
  if (filters.ref) add((n) => `upper(ho.reference) LIKE ${n}`, `${filters.ref.toUpperCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`);
  return { where: parts.length ? `WHERE ${parts.join(' AND ')}` : '', bind };
}

export async function listOrders(query: OrderListQuery): Promise<{ rows: OrderListRow[]; total: number; page: number; size: number }> {
  const { where, bind } = orderWhere(query.filters);
  const order = `${SORT_SQL[query.sort]} ${query.dir === 'asc' ? 'ASC' : 'DESC'}, ho.id ${query.dir === 'asc' ? 'ASC' : 'DESC'}`;
  const limit = bind.length + 1;
  const [countRow] = await q<{ n: number }>(`SELECT count(*)::int AS n FROM hire_orders ho JOIN organisations o ON o.id = ho.customer_id ${where}`, bind);
  const rows = await q<OrderListRow>(
    `SELECT ho.id, ho.reference, ho.status, ho.customer_id AS "customerId", o.name AS customer, ds.name AS "deliverySite",
            dp.name AS depot, bt.name AS "binType", ho.quantity, ho.needed_by AS "neededBy",
            coalesce(p.loaded, 0)::int AS loaded, coalesce(p.dispatched, 0)::int AS dispatched
       FROM hire_orders ho
       JOIN organisations o ON o.id = ho.customer_id
       JOIN sites ds ON ds.id = ho.delivery_site_id
       JOIN sites dp ON dp.id = ho.depot_site_id
       JOIN bin_types bt ON bt.id = ho.bin_type_id
       LEFT JOIN LATERAL (
         SELECT count(*) AS loaded, count(*) FILTER (WHERE t.load_id IS NULL OR l.status IN ('dispatched', 'delivered')) AS dispatched
           FROM trips t LEFT JOIN loads l ON l.id = t.load_id WHERE t.hire_order_id = ho.id
       ) p ON TRUE
       ${where}
      ORDER BY ${order}
      LIMIT $${limit} OFFSET $${limit + 1}`,
    [...bind, query.size, (query.page - 1) * query.size],
  );
  return { rows, total: countRow?.n ?? 0, page: query.page, size: query.size };
}

// ---------------------------------------------------------------------------
// The order page
// ---------------------------------------------------------------------------

export interface OrderLoad {
  id: number;
  reference: string;
  status: string;
  bins: number;
  dispatchedAt: string | null;
  deliveredAt: string | null;
}

export interface OrderView {
  id: number;
  reference: string;
  status: OrderStatus;
  version: number;
  customerId: number;
  customer: string;
  deliverySite: { id: number; name: string; address: string | null };
  depot: { id: number; name: string };
  binType: {
    id: number;
    name: string;
    nominalCapacityL: number;
    footprintLengthMm: number;
    footprintWidthMm: number;
    heightErectedMm: number;
    heightFoldedMm: number;
    tareKg: number;
    maxGrossKg: number;
  };
  quantity: number;
  neededBy: string;
  product: string | null;
  notes: string | null;
  linerFoodContact: boolean;
  linerMaxFillTempC: number | null;
  confirmedAt: string | null;
  finishedAt: string | null;
  createdAt: string;
  progress: OrderProgress;
  loads: OrderLoad[];
  tariff: Tariff | null;
  commands: { command: OrderCommand; label: string }[];
}

const iso = (v: unknown) => (v instanceof Date ? v.toISOString() : v == null ? null : String(v));

export async function orderView(id: number): Promise<OrderView | null> {
  const [row] = await q<Record<string, unknown>>(
    `SELECT ho.*, o.name AS customer, ds.name AS ds_name, ds.address AS ds_address, dp.name AS dp_name,
            bt.name AS bt_name, bt.nominal_capacity_l AS bt_capacity, bt.footprint_length_mm, bt.footprint_width_mm,
            bt.height_erected_mm, bt.height_folded_mm, bt.tare_kg, bt.max_gross_kg
       FROM hire_orders ho
       JOIN organisations o ON o.id = ho.customer_id
       JOIN sites ds ON ds.id = ho.delivery_site_id
       JOIN sites dp ON dp.id = ho.depot_site_id
       JOIN bin_types bt ON bt.id = ho.bin_type_id
      WHERE ho.id = $1`,
    [id],
  );
  if (!row) return null;
  const status = row.status as OrderStatus;
  const quantity = row.quantity as number;
  const [progress, loads, tariff] = await Promise.all([
    orderProgress(id, quantity),
    q<OrderLoad>(
      `SELECT l.id, l.reference, l.status, count(t.id)::int AS bins, l.dispatched_at AS "dispatchedAt", l.delivered_at AS "deliveredAt"
         FROM loads l LEFT JOIN trips t ON t.load_id = l.id AND t.hire_order_id = l.hire_order_id
        WHERE l.hire_order_id = $1
        GROUP BY l.id ORDER BY l.created_at, l.id`,
      [id],
    ),
    tariffOn(row.customer_id as number, row.needed_by as string),
  ]);
  return {
    id,
    reference: row.reference as string,
    status,
    version: row.version as number,
    customerId: row.customer_id as number,
    customer: row.customer as string,
    deliverySite: { id: row.delivery_site_id as number, name: row.ds_name as string, address: (row.ds_address as string) ?? null },
    depot: { id: row.depot_site_id as number, name: row.dp_name as string },
    binType: {
      id: row.bin_type_id as number,
      name: row.bt_name as string,
      nominalCapacityL: row.bt_capacity as number,
      footprintLengthMm: row.footprint_length_mm as number,
      footprintWidthMm: row.footprint_width_mm as number,
      heightErectedMm: row.height_erected_mm as number,
      heightFoldedMm: row.height_folded_mm as number,
      tareKg: Number(row.tare_kg),
      maxGrossKg: Number(row.max_gross_kg),
    },
    quantity,
    neededBy: row.needed_by as string,
    product: (row.product as string) ?? null,
    notes: (row.notes as string) ?? null,
    linerFoodContact: row.liner_food_contact as boolean,
    linerMaxFillTempC: (row.liner_max_fill_temp_c as number) ?? null,
    confirmedAt: iso(row.confirmed_at),
    finishedAt: iso(row.finished_at),
    createdAt: iso(row.created_at)!,
    progress,
    loads: loads.map((l) => ({ ...l, dispatchedAt: iso(l.dispatchedAt), deliveredAt: iso(l.deliveredAt) })),
    tariff,
    commands: availableCommands(status, progress),
  };
}

// ---------------------------------------------------------------------------
// Entering an order, and the planner's commands
// ---------------------------------------------------------------------------

function noTariff(customer: string, day: string): AppError {
  return new AppError('unprocessable', `${customer} has no tariff in force on ${day}: enter their terms first, then confirm the order.`, [
    { path: 'neededBy', message: 'no tariff in force for this customer on this date' },
  ]);
}

/** Checks the customer, sites and bin type fit together; answers the customer's name. */
async function checkReferences(input: OrderInput, t: Transaction): Promise<string> {
  const [customer] = await q<{ name: string; kind: string; active: boolean }>('SELECT name, kind, active FROM organisations WHERE id = $1', [input.customerId], t);
  const fields: Record<string, string> = {};
  if (!customer || customer.kind !== 'customer') fields.customerId = 'no such customer';
  else if (!customer.active) fields.customerId = 'this customer is inactive';
  const [site] = await q<{ organisation_id: number; kind: string; active: boolean }>('SELECT organisation_id, kind, active FROM sites WHERE id = $1', [input.deliverySiteId], t);
  if (!site || site.kind !== 'customer' || site.organisation_id !== input.customerId) fields.deliverySiteId = "must be one of the customer's own sites";
  else if (!site.active) fields.deliverySiteId = 'this site is inactive';
  const [depot] = await q<{ kind: string; active: boolean }>('SELECT kind, active FROM sites WHERE id = $1', [input.depotSiteId], t);
  if (!depot || depot.kind !== 'depot' || !depot.active) fields.depotSiteId = 'must be an active depot';
  const [type] = await q<{ active: boolean }>('SELECT active FROM bin_types WHERE id = $1', [input.binTypeId], t);
  if (!type || !type.active) fields.binTypeId = 'must be an active bin type';
  if (Object.keys(fields).length > 0) {
    throw new AppError(
      'validation_failed',
      'Some fields do not fit together.',
      Object.entries(fields).map(([path, message]) => ({ path, message })),
    );
  }
  return customer!.name;
}

/** HO-261202-01: the second planner-entered order of 2 Dec 2026 (operator's local day). */
async function nextReference(t: Transaction): Promise<string> {
  const settings = await getSettings();
  const day = localDate(new Date(), settings.timeZone).replaceAll('-', '').slice(2);
  const prefix = `HO-${day}-`;
  await sequelize.query(`SELECT pg_advisory_xact_lock(hashtext('hire_order_reference'))`, { transaction: t });
  const [row] = await q<{ n: number }>(
    `SELECT coalesce(max(substring(reference FROM '^HO-[0-9]{6}-([0-9]+)$')::int), 0) + 1 AS n FROM hire_orders WHERE reference LIKE $1`,
    [`${prefix}%`],
    t,
  );
  return `${prefix}${String(row?.n ?? 1).padStart(2, '0')}`;
}

export async function createOrder(input: OrderInput, actor: AuditActor): Promise<{ id: number; reference: string; status: OrderStatus }> {
  return sequelize.transaction(async (t) => {
    const customer = await checkReferences(input, t);
    if (input.confirm && !(await tariffOn(input.customerId, input.neededBy, t))) throw noTariff(customer, input.neededBy);
    const order = await HireOrder.create(
      {
        reference: await nextReference(t),
        customerId: input.customerId,
        deliverySiteId: input.deliverySiteId,
        depotSiteId: input.depotSiteId,
        binTypeId: input.binTypeId,
        quantity: input.quantity,
        neededBy: input.neededBy,
        status: input.confirm ? 'confirmed' : 'draft',
        product: input.product,
        notes: input.notes,
        linerFoodContact: input.linerFoodContact,
        linerMaxFillTempC: input.linerMaxFillTempC,
        createdBy: actor.userId,
        confirmedAt: input.confirm ? new Date() : null,
      },
      { transaction: t },
    );
    await recordAudit(
      {
        actor,
        action: 'order.create',
        entityType: 'hire_order',
        entityId: order.id,
        after: { reference: order.reference, status: order.status, quantity: order.quantity, neededBy: order.neededBy },
      },
      { transaction: t },
    );
    return { id: order.id, reference: order.reference, status: order.status };
  });
}

/** Confirm, cancel or close, on the version the planner saw. */
export async function commandOrder(id: number, input: { command: OrderCommand; version: number }, actor: AuditActor): Promise<{ status: OrderStatus; version: number }> {
  return sequelize.transaction(async (t) => {
    const order = await HireOrder.findByPk(id, { transaction: t, lock: t.LOCK.UPDATE });
    if (!order) throw new AppError('not_found', 'No such hire order.');
    if (order.version !== input.version) throw new AppError('changed_meanwhile', 'Someone changed this order meanwhile. Reload it and try again.');
    const decision = decideCommand(order.status, input.command, await orderProgress(order.id, order.quantity, t));
    if (!decision.ok) throw new AppError('transition_refused', decision.reason, { reason: 'order_status', command: input.command });
    if (input.command === 'confirm' && !(await tariffOn(order.customerId, order.neededBy, t))) {
      const [c] = await q<{ name: string }>('SELECT name FROM organisations WHERE id = $1', [order.customerId], t);
      throw noTariff(c?.name ?? 'The customer', order.neededBy);
    }
    const before = { status: order.status };
    order.status = decision.to;
    if (decision.to === 'confirmed') order.confirmedAt = new Date();
    if (decision.to === 'closed' || decision.to === 'cancelled') order.finishedAt = new Date();
    await order.save({ transaction: t });
    await recordAudit({ actor, action: `order.${input.command}`, entityType: 'hire_order', entityId: order.id, before, after: { status: order.status } }, { transaction: t });
    return { status: order.status, version: order.version };
  });
}

// ---------------------------------------------------------------------------
// Choices for the form
// ---------------------------------------------------------------------------

export interface OrderFormChoices {
  customers: { id: number; name: string; sites: { id: number; name: string }[] }[];
  depots: { id: number; name: string }[];
  binTypes: { id: number; name: string; nominalCapacityL: number }[];
}

export async function orderFormChoices(): Promise<OrderFormChoices> {
  const [customers, sites, depots, binTypes] = await Promise.all([
    q<{ id: number; name: string }>(`SELECT id, name FROM organisations WHERE kind = 'customer' AND active ORDER BY name`, []),
    q<{ id: number; name: string; organisation_id: number }>(`SELECT id, name, organisation_id FROM sites WHERE kind = 'customer' AND active ORDER BY name`, []),
    q<{ id: number; name: string }>(`SELECT id, name FROM sites WHERE kind = 'depot' AND active ORDER BY name`, []),
    q<{ id: number; name: string; nominalCapacityL: number }>(`SELECT id, name, nominal_capacity_l AS "nominalCapacityL" FROM bin_types WHERE active ORDER BY name`, []),
  ]);
  return {
    customers: customers.map((c) => ({ ...c, sites: sites.filter((s) => s.organisation_id === c.id).map(({ id, name }) => ({ id, name })) })),
    depots,
    binTypes,
  };
}

// ---------------------------------------------------------------------------
// The fill planner's view of an order
// ---------------------------------------------------------------------------

export interface FillPlannerData {
  orderId: number;
  reference: string;
  customer: string;
  product: string | null;
  linerFoodContact: boolean;
  linerMaxFillTempC: number | null;
  binType: { name: string; capacityL: number; tareKg: number; maxGrossKg: number; unCode: string | null };
  /** The UN mark most bins of the type carry, as a starting point for the dangerous goods check. */
  usualMark: string | null;
  binsWithUsualMark: number;
  binsOfType: number;
}

export async function fillPlannerData(orderId: number): Promise<FillPlannerData | null> {
  const [row] = await q<Record<string, unknown>>(
    `SELECT ho.id, ho.reference, ho.product, ho.liner_food_contact, ho.liner_max_fill_temp_c, o.name AS customer,
            bt.id AS bt_id, bt.name AS bt_name, bt.nominal_capacity_l, bt.tare_kg, bt.max_gross_kg, bt.un_code
       FROM hire_orders ho JOIN organisations o ON o.id = ho.customer_id JOIN bin_types bt ON bt.id = ho.bin_type_id
      WHERE ho.id = $1`,
    [orderId],
  );
  if (!row) return null;
  const [mark] = await q<{ un_marking: string | null; n: number; total: number }>(
    `SELECT un_marking, count(*)::int AS n, sum(count(*)) OVER ()::int AS total
       FROM assets WHERE bin_type_id = $1 AND status <> 'retired'
      GROUP BY un_marking ORDER BY (un_marking IS NULL), count(*) DESC, un_marking LIMIT 1`,
    [row.bt_id],
  );
  return {
    orderId: row.id as number,
    reference: row.reference as string,
    customer: row.customer as string,
    product: (row.product as string) ?? null,
    linerFoodContact: row.liner_food_contact as boolean,
    linerMaxFillTempC: (row.liner_max_fill_temp_c as number) ?? null,
    binType: {
      name: row.bt_name as string,
      capacityL: row.nominal_capacity_l as number,
      tareKg: Number(row.tare_kg),
      maxGrossKg: Number(row.max_gross_kg),
      unCode: (row.un_code as string) ?? null,
    },
    usualMark: mark?.un_marking ?? null,
    binsWithUsualMark: mark?.un_marking ? mark.n : 0,
    binsOfType: mark?.total ?? 0,
  };
}
