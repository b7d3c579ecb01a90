// Liner purchase orders: made from a suggested order, printed, mailed to the supplier's order address through
// the mail outbox, received against (liner-ledger.server.ts receiveLot names the order) and closed when the
// deliveries reach the quantity. Rules are in purchase-orders.ts.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/models';
import { AppError } from '@/lib/api-errors';
import { recordAudit, type AuditActor } from '@/lib/audit.server';
import { getSettings } from '@/lib/settings/settings.server';
import { formatLongDate, localDate } from '@/lib/calendar';
import { sendMail } from '@/lib/mail/mailer.server';
import { purchaseOrderMail } from '@/lib/mail/mail-templates';
import { orderQuantityProblem, poProgress, poReference, wantedBy, type PoState, type PoStatus } from './purchase-orders';

async function rows<T extends object>(sql: string, bind: unknown[], t?: Transaction): Promise<T[]> {
  return sequelize.query<T>(sql, { bind, transaction: t, type: QueryTypes.SELECT });
}

export interface PurchaseOrder {
  id: number;
  reference: string;
  supplierId: number;
  supplier: string;
  orderEmail: string | null;
  specId: number;
  specCode: string;
  specName: string;
  articleNumber: string | null;
  depotSiteId: number;
  depot: string;
  depotAddress: string | null;
  quantity: number;
  pricePerLiner: string;
  orderedOn: string;
  wantedBy: string;
  status: PoStatus;
  state: PoState;
  received: number;
  remaining: number;
  mailedAt: Date | null;
  createdBy: string | null;
  note: string | null;
  version: number;
  lots: Array<{ id: number; lotNumber: string; quantity: number; receivedOn: string; expiryDate: string }>;
}

type PoRow = Omit<PurchaseOrder, 'reference' | 'state' | 'remaining' | 'lots'>;

const SELECT = `SELECT p.id, p.supplier_id AS "supplierId", sup.name AS supplier, sup.order_email AS "orderEmail", p.liner_spec_id AS "specId", sp.code AS "specCode",
         sp.name AS "specName", sp.article_number AS "articleNumber", p.depot_site_id AS "depotSiteId", s.name AS depot, s.address AS "depotAddress", p.quantity,
         p.price_per_liner AS "pricePerLiner", p.ordered_on::text AS "orderedOn", p.wanted_by::text AS "wantedBy", p.status,
         (SELECT COALESCE(sum(l.quantity_received), 0)::int FROM liner_lots l WHERE l.purchase_order_id = p.id) AS received,
         p.mailed_at AS "mailedAt", u.name AS "createdBy", p.note, p.version
    FROM liner_purchase_orders p JOIN liner_suppliers sup ON sup.id = p.supplier_id JOIN liner_specs sp ON sp.id = p.liner_spec_id
    JOIN sites s ON s.id = p.depot_site_id LEFT JOIN users u ON u.id = p.created_by`;

function shaped(r: PoRow, lots: PurchaseOrder['lots'] = []): PurchaseOrder {
  const p = poProgress(r);
  return { ...r, reference: poReference(r.id), state: p.state, remaining: p.remaining, lots };
}

export async function getPurchaseOrder(id: number, t?: Transaction): Promise<PurchaseOrder | null> {
  const [r] = await rows<PoRow>(`${SELECT} WHERE p.id = $1`, [id], t);
  if (!r) return null;
  const lots = await rows<PurchaseOrder['lots'][number]>(
    `SELECT id, lot_number AS "lotNumber", quantity_received AS quantity, received_on::text AS "receivedOn", expiry_date::text AS "expiryDate"
       FROM liner_lots WHERE purchase_order_id = $1 ORDER BY received_on, id`,
    [id],
    t,
  );
  return shaped(r, lots);
}

/** Purchase orders, open first then newest; optionally of one depot. */
export async function listPurchaseOrders(f: { depotSiteId?: number; openOnly?: boolean; limit?: number } = {}): Promise<PurchaseOrder[]> {
  const bind: unknown[] = [];
  const where: string[] = [];
  if (f.depotSiteId) where.push(`p.depot_site_id = $${bind.push(f.depotSiteId)}`);
  if (f.openOnly) where.push(`p.status = 'open'`);
  const list = await rows<PoRow>(
    `${SELECT} ${where.length ? `WHERE ${where.join(' AND ')}` : ''} ORDER BY (p.status = 'open') DESC, p.id DESC LIMIT $${bind.push(f.limit ?? 200)}`,
    bind,
  );
  return list.map((r) => shaped(r));
}

/** Liners still to come on open purchase orders, per depot and spec ("depot:spec"). */
export async function onOrderBy(t?: Transaction): Promise<Map<string, number>> {
  const list = await rows<{ site: number; spec: number; n: number }>(
    `SELECT p.depot_site_id AS site, p.liner_spec_id AS spec,
            sum(GREATEST(p.quantity - (SELECT COALESCE(sum(l.quantity_received), 0) FROM liner_lots l WHERE l.purchase_order_id = p.id), 0))::int AS n
       FROM liner_purchase_orders p WHERE p.status = 'open' GROUP BY 1, 2`,
    [],
    t,
  );
  return new Map(list.map((r) => [`${r.site}:${r.spec}`, r.n]));
}

/** A suggested order becomes a purchase order: supplier and price from the spec's supplier, wanted by the lead time. */
export async function createPurchaseOrder(
  actor: AuditActor,
  input: { depotSiteId: number; specId: number; quantity: number; note?: string | null },
  opts: { now?: Date } = {},
): Promise<PurchaseOrder> {
  const now = opts.now ?? new Date();
  const { timeZone } = await getSettings();
  return sequelize.transaction(async (t) => {
    const [spec] = await rows<{ code: string; supplier_id: number | null; lead_time_days: number; pack_size: number; min_order_qty: number; price: string; active: boolean }>(
      `SELECT sp.code, sp.supplier_id, sup.lead_time_days, sup.pack_size, sup.min_order_qty, sup.price_per_liner AS price, sup.active
         FROM liner_specs sp LEFT JOIN liner_suppliers sup ON sup.id = sp.supplier_id WHERE sp.id = $1`,
      [input.specId],
      t,
    );
    if (!spec) throw new AppError('unprocessable', 'No liner spec with that number.', [{ path: 'specId', message: 'Choose a liner spec.' }]);
    if (!spec.supplier_id) throw new AppError('unprocessable', `${spec.code} has no supplier: give it one on the liner specs page first.`);
    const [depot] = await rows<{ kind: string; active: boolean }>('SELECT kind, active FROM sites WHERE id = $1', [input.depotSiteId], t);
    if (!depot || depot.kind !== 'depot' || !depot.active) throw new AppError('unprocessable', 'That is not an open depot.', [{ path: 'depotSiteId', message: 'Choose a depot.' }]);
    const problem = orderQuantityProblem(input.quantity, { packSize: spec.pack_size, minimumOrder: spec.min_order_qty });
    if (problem) throw new AppError('validation_failed', problem, [{ path: 'quantity', message: problem }]);
    const orderedOn = localDate(now, timeZone);
    const [po] = await rows<{ id: number }>(
      `INSERT INTO liner_purchase_orders (supplier_id, liner_spec_id, depot_site_id, quantity, price_per_liner, ordered_on, wanted_by, created_by, note, created_at, updated_at)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $10) RETURNING id`,
      [
        spec.supplier_id,
        input.specId,
        input.depotSiteId,
        input.quantity,
        spec.price,
        orderedOn,
        wantedBy(orderedOn, spec.lead_time_days),
        actor.userId,
        input.note?.trim() || null,
        now,
      ],
      t,
    );
    await recordAudit({ actor, action: 'liner_po.create', entityType: 'liner_purchase_order', entityId: po!.id, after: { ...input } }, { transaction: t });
    return (await getPurchaseOrder(po!.id, t))!;
  });
}

/** Sends the order to the supplier's order address through the outbox; the order keeps when and which message. */
export async function mailPurchaseOrder(actor: AuditActor & { name: string }, id: number, opts: { now?: Date } = {}): Promise<PurchaseOrder> {
  const po = await getPurchaseOrder(id);
  if (!po) throw new AppError('not_found', 'No purchase order with that number.');
  if (po.status !== 'open') throw new AppError('conflict', `${po.reference} is no longer open.`);
  if (!po.orderEmail) throw new AppError('unprocessable', `${po.supplier} has no order address: add it on the liner suppliers page.`);
  const settings = await getSettings();
  const mail = purchaseOrderMail({
    operatorName: settings.operatorName,
    supplierName: po.supplier,
    reference: po.reference,
    orderedOn: formatLongDate(po.orderedOn),
    wantedBy: formatLongDate(po.wantedBy),
    quantity: po.quantity,
    articleNumber: po.articleNumber,
    specName: po.specName,
    pricePerLiner: `${Number(po.pricePerLiner).toFixed(2)} ${settings.currency}`,
    deliverTo: { name: po.depot, address: po.depotAddress },
    note: po.note,
    plannerName: actor.name,
  });
  const sent = await sendMail({ to: po.orderEmail, ...mail, kind: 'liner_purchase_order' });
  if (sent.status !== 'sent') throw new AppError('unavailable', `The order could not be mailed (${sent.error ?? 'mail server'}); it stays unsent. Try again, or print it.`);
  await sequelize.query('UPDATE liner_purchase_orders SET mailed_at = $2, mail_id = $3, updated_at = $2 WHERE id = $1', { bind: [id, opts.now ?? new Date(), sent.id] });
  await recordAudit({ actor, action: 'liner_po.mail', entityType: 'liner_purchase_order', entityId: id, after: { to: po.orderEmail, mail: sent.id } });
  return (await getPurchaseOrder(id))!;
}

/** A planner closes an order short (the rest will not come) or cancels one nothing was received on. */
export async function closePurchaseOrder(actor: AuditActor, id: number, input: { version: number }, opts: { now?: Date } = {}): Promise<PurchaseOrder> {
  return sequelize.transaction(async (t) => {
    const [po] = await rows<{ status: PoStatus; version: number; received: number }>(
      `SELECT p.status, p.version, (SELECT COALESCE(sum(l.quantity_received), 0)::int FROM liner_lots l WHERE l.purchase_order_id = p.id) AS received
         FROM liner_purchase_orders p WHERE p.id = $1 FOR UPDATE`,
      [id],
      t,
    );
    if (!po) throw new AppError('not_found', 'No purchase order with that number.');
    if (po.version !== input.version) throw new AppError('changed_meanwhile', 'The order changed meanwhile (a delivery may have been received). Look at it again.');
    if (po.status !== 'open') throw new AppError('conflict', 'The order is no longer open.');
    const status = po.received > 0 ? 'closed' : 'cancelled';
    await sequelize.query(`UPDATE liner_purchase_orders SET status = $2, closed_at = $3, version = version + 1, updated_at = $3 WHERE id = $1`, {
      bind: [id, status, opts.now ?? new Date()],
      transaction: t,
    });
    await recordAudit({ actor, action: `liner_po.${status === 'closed' ? 'close' : 'cancel'}`, entityType: 'liner_purchase_order', entityId: id }, { transaction: t });
    return (await getPurchaseOrder(id, t))!;
  });
}

/**
 * Inside a receipt's transaction: the order must be open and for this spec, supplier and depot. Locks its row so two
 * deliveries received at once both count. Returns a closer to call after the receipt is written.
 */
export async function checkReceiptAgainst(
  poId: number,
  lot: { supplierId: number | null; linerSpecId: number | null; siteId: number },
  t: Transaction,
): Promise<{ supplier: string; close: (now: Date) => Promise<boolean> }> {
  const [po] = await rows<{ status: PoStatus; supplier_id: number; supplier: string; liner_spec_id: number; depot_site_id: number; quantity: number }>(
    `SELECT p.status, p.supplier_id, sup.name AS supplier, p.liner_spec_id, p.depot_site_id, p.quantity FROM liner_purchase_orders p JOIN liner_suppliers sup ON sup.id = p.supplier_id
      WHERE p.id = $1 FOR UPDATE OF p`,
    [poId],
    t,
  );
  const ref = poReference(poId);
  if (!po) throw new AppError('unprocessable', `There is no purchase order ${ref}.`, [{ path: 'purchaseOrderId', message: 'Choose an open purchase order, or none.' }]);
  if (po.status !== 'open') throw new AppError('conflict', `${ref} is already closed; receive the lot without an order, or ask a planner.`);
  if (lot.linerSpecId !== null && lot.linerSpecId !== po.liner_spec_id)
    throw new AppError('unprocessable', `${ref} is for another liner spec.`, [{ path: 'linerSpecId', message: 'Not the ordered spec.' }]);
  if (lot.supplierId !== null && lot.supplierId !== po.supplier_id)
    throw new AppError('unprocessable', `${ref} was placed with ${po.supplier}.`, [{ path: 'supplierId', message: 'Not the ordered supplier.' }]);
  if (lot.siteId !== po.depot_site_id) throw new AppError('unprocessable', `${ref} is to be delivered to another depot.`);
  return {
    supplier: po.supplier,
    close: async (now) => {
      const [{ received } = { received: 0 }] = await rows<{ received: number }>(
        'SELECT COALESCE(sum(quantity_received), 0)::int AS received FROM liner_lots WHERE purchase_order_id = $1',
        [poId],
        t,
      );
      if (!poProgress({ status: 'open', quantity: po.quantity, received }).complete) return false;
      await sequelize.query(`UPDATE liner_purchase_orders SET status = 'closed', closed_at = $2, version = version + 1, updated_at = $2 WHERE id = $1`, {
        bind: [poId, now],
        transaction: t,
      });
      return true;
    },
  };
}
