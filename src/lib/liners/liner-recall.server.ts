// Hold and recall of a liner lot: the status change (under the lot's row lock, so a fit waiting on the lock
// reads the new status), the trace of every use of the lot, and the notice to the customers concerned.
// Rules are in liner-recall.ts.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/models';
import { AppError } from '@/lib/api-errors';
import { recordAudit, type AuditActor } from '@/lib/audit.server';
import { getSettings } from '@/lib/settings/settings.server';
import { localDate, formatLongDate } from '@/lib/calendar';
import { STATUS_LABELS, type Status } from '@/lib/scans/lifecycle';
import { sendMail } from '@/lib/mail/mailer.server';
import { linerLotNoticeMail } from '@/lib/mail/mail-templates';
import { FIT_FROM_STOPPED_LOT, TRACE_USE_WORDS, nextLotStatus, noticeRecipients, type LotStatus, type LotStatusAction, type TraceUseKind } from './liner-recall';

async function rows<T extends object>(sql: string, bind: unknown[], t?: Transaction): Promise<T[]> {
  return sequelize.query<T>(sql, { bind, transaction: t, type: QueryTypes.SELECT });
}

export interface LotHeader {
  id: number;
  lotNumber: string;
  supplier: string;
  spec: string;
  specCode: string | null;
  status: LotStatus;
  statusReason: string | null;
  statusChangedAt: Date | null;
  statusChangedBy: string | null;
  expiryDate: string;
  receivedOn: string;
  quantityReceived: number;
  depot: string;
  version: number;
  onShelf: number;
}

export async function lotHeader(lotId: number, t?: Transaction): Promise<LotHeader | null> {
  const [lot] = await rows<LotHeader>(
    `SELECT l.id, l.lot_number AS "lotNumber", l.supplier, l.spec, sp.code AS "specCode", l.status, l.status_reason AS "statusReason",
            l.status_changed_at AS "statusChangedAt", u.name AS "statusChangedBy", l.expiry_date::text AS "expiryDate", l.received_on::text AS "receivedOn",
            l.quantity_received AS "quantityReceived", s.name AS depot, l.version,
            (SELECT COALESCE(sum(m.quantity), 0)::int FROM liner_moves m WHERE m.lot_id = l.id) AS "onShelf"
       FROM liner_lots l JOIN sites s ON s.id = l.site_id LEFT JOIN liner_specs sp ON sp.id = l.liner_spec_id LEFT JOIN users u ON u.id = l.status_changed_by
      WHERE l.id = $1`,
    [lotId],
    t,
  );
  return lot ?? null;
}

/** Hold, recall or release a lot. Fits wait on the lot's row lock, so none slips through after the change commits. */
export async function setLotStatus(
  actor: AuditActor,
  lotId: number,
  input: { action: LotStatusAction; reason: string; version: number },
  opts: { now?: Date } = {},
): Promise<LotHeader> {
  const now = opts.now ?? new Date();
  return sequelize.transaction(async (t) => {
    const [lot] = await rows<{ status: LotStatus; version: number; status_reason: string | null }>(
      'SELECT status, version, status_reason FROM liner_lots WHERE id = $1 FOR UPDATE',
      [lotId],
      t,
    );
    if (!lot) throw new AppError('not_found', 'No liner lot with that number.');
    if (lot.version !== input.version) throw new AppError('changed_meanwhile', 'Someone changed this lot meanwhile. Look at it again, then repeat the change if it still applies.');
    const next = nextLotStatus(lot.status, input.action);
    if (!next.ok) throw new AppError('conflict', next.reason);
    const reason = input.reason.trim();
    if (!reason && input.action !== 'release') throw new AppError('validation_failed', 'Say why the lot is stopped.', [{ path: 'reason', message: 'Give the reason.' }]);
    await sequelize.query(
      `UPDATE liner_lots SET status = $2, status_reason = $3, status_changed_at = $4, status_changed_by = $5, version = version + 1, updated_at = $4 WHERE id = $1`,
      { bind: [lotId, next.status, reason || null, now, actor.userId], transaction: t },
    );
    await recordAudit(
      {
        actor,
        action: `liner_lot.${input.action}`,
        entityType: 'liner_lot',
        entityId: lotId,
        before: { status: lot.status, reason: lot.status_reason },
        after: { status: next.status, reason: reason || null },
      },
      { transaction: t },
    );
    return (await lotHeader(lotId, t))!;
  });
}

export interface TraceUse {
  kind: TraceUseKind;
  assetId: number | null;
  grai: string | null;
  serial: string | null;
  tripId: number | null;
  customerId: number | null;
  customer: string | null;
  orderRef: string | null;
  /** The site where the bin was filled (the customer's site of the trip), or the kit's delivery site. */
  fillingSite: string | null;
  filledAt: Date | null;
  product: string | null;
  /** When it left (trip), was lined (not dispatched) or the kit was sent. */
  at: Date;
  liners: number;
  binStatus: Status | null;
  /** Where the bin is now: its site, or the customer it is with. */
  now: string | null;
  /** The fit was made from the lot after it was stopped, on a phone that did not know yet. */
  flaggedFit: boolean;
  /** A lined bin's dispatch is refused until it is lined from another lot. */
  dispatchBlocked: boolean;
}

/** Every use of a lot: trips its liners went out on, bins lined from it not yet dispatched, kits sent with folded bins. */
export async function lotTrace(lotId: number, t?: Transaction): Promise<TraceUse[]> {
  const fit = (alias: string, before: string) => `LEFT JOIN LATERAL (
      SELECT COALESCE(e.payload->'flags' ? '${FIT_FROM_STOPPED_LOT}', false) AS flagged FROM scan_events e
       WHERE e.asset_id = ${alias}.id AND e.action = 'fit_liner' AND e.voided_at IS NULL AND e.payload->>'linerLotId' = ($1::int)::text AND e.occurred_at <= ${before}
       ORDER BY e.occurred_at DESC, e.id DESC LIMIT 1) f ON true`;
  const where = `COALESCE(ns.name, nc.name)`;
  const trips = await rows<Omit<TraceUse, 'kind' | 'dispatchBlocked' | 'liners'>>(
    `SELECT a.id AS "assetId", a.grai, a.serial, t.id AS "tripId", t.customer_id AS "customerId", o.name AS customer, ho.reference AS "orderRef",
            fs.name AS "fillingSite", t.filled_at AS "filledAt", COALESCE(t.fill_product, ho.product) AS product, t.dispatched_at AS at,
            a.status AS "binStatus", ${where} AS now, COALESCE(f.flagged, false) AS "flaggedFit"
       FROM trips t JOIN assets a ON a.id = t.asset_id JOIN organisations o ON o.id = t.customer_id
       LEFT JOIN sites fs ON fs.id = t.customer_site_id LEFT JOIN hire_orders ho ON ho.id = t.hire_order_id
       LEFT JOIN sites ns ON ns.id = a.site_id LEFT JOIN organisations nc ON nc.id = a.customer_id
       ${fit('a', 't.dispatched_at')}
      WHERE t.liner_lot_id = $1 ORDER BY t.dispatched_at, t.id`,
    [lotId],
    t,
  );
  const lined = await rows<Omit<TraceUse, 'kind' | 'dispatchBlocked' | 'liners'>>(
    `SELECT a.id AS "assetId", a.grai, a.serial, NULL::int AS "tripId", NULL::int AS "customerId", NULL AS customer, NULL AS "orderRef",
            NULL AS "fillingSite", NULL::timestamptz AS "filledAt", NULL AS product,
            COALESCE((SELECT max(m.occurred_at) FROM liner_moves m WHERE m.asset_id = a.id AND m.lot_id = $1 AND m.kind = 'fitted'), a.last_scan_at) AS at,
            a.status AS "binStatus", ${where} AS now, COALESCE(f.flagged, false) AS "flaggedFit"
       FROM assets a LEFT JOIN sites ns ON ns.id = a.site_id LEFT JOIN organisations nc ON nc.id = a.customer_id
       ${fit('a', 'now()')}
      WHERE a.liner_lot_id = $1 AND a.status = 'prepared' ORDER BY a.serial`,
    [lotId],
    t,
  );
  const kits = await rows<{ at: Date; liners: number; customerId: number; customer: string; orderRef: string; site: string | null; product: string | null }>(
    `SELECT m.occurred_at AS at, -m.quantity AS liners, ho.customer_id AS "customerId", o.name AS customer, ho.reference AS "orderRef", s.name AS site, ho.product
       FROM liner_moves m JOIN hire_orders ho ON ho.id = m.hire_order_id JOIN organisations o ON o.id = ho.customer_id LEFT JOIN sites s ON s.id = ho.delivery_site_id
      WHERE m.lot_id = $1 AND m.kind = 'kit_sent' AND NOT EXISTS (SELECT 1 FROM liner_moves r WHERE r.reverses_move_id = m.id)
      ORDER BY m.occurred_at, m.id`,
    [lotId],
    t,
  );
  return [
    ...trips.map((r) => ({ ...r, kind: 'trip' as const, liners: 1, dispatchBlocked: false })),
    ...lined.map((r) => ({ ...r, kind: 'lined' as const, liners: 1, dispatchBlocked: true })),
    ...kits.map((k) => ({
      kind: 'kit' as const,
      assetId: null,
      grai: null,
      serial: null,
      tripId: null,
      customerId: k.customerId,
      customer: k.customer,
      orderRef: k.orderRef,
      fillingSite: k.site,
      filledAt: null,
      product: k.product,
      at: k.at,
      liners: k.liners,
      binStatus: null,
      now: null,
      flaggedFit: false,
      dispatchBlocked: false,
    })),
  ];
}

/** A use as a line of the trace CSV (and the page). */
export function traceRow(u: TraceUse, timeZone: string) {
  return {
    use: TRACE_USE_WORDS[u.kind],
    bin: u.serial,
    grai: u.grai,
    customer: u.customer,
    order: u.orderRef,
    fillingSite: u.fillingSite,
    fillDay: u.filledAt ? localDate(u.filledAt, timeZone) : null,
    product: u.product,
    day: localDate(u.at, timeZone),
    liners: u.liners,
    binNow: u.binStatus ? [STATUS_LABELS[u.binStatus], u.now].filter(Boolean).join(', ') : null,
    flaggedFit: u.flaggedFit,
    dispatchBlocked: u.dispatchBlocked,
  };
}

export interface NoticeRecord {
  id: number;
  sentAt: Date;
  sentBy: string | null;
  lotStatus: LotStatus;
  subject: string;
  message: string;
  recipients: Array<{ organisation: string; email: string; status: 'sent' | 'failed'; uses: number }>;
}

export async function noticesOf(lotId: number): Promise<NoticeRecord[]> {
  const list = await rows<Omit<NoticeRecord, 'recipients'>>(
    `SELECT n.id, n.sent_at AS "sentAt", u.name AS "sentBy", n.lot_status AS "lotStatus", n.subject, n.message
       FROM liner_recall_notices n LEFT JOIN users u ON u.id = n.sent_by WHERE n.lot_id = $1 ORDER BY n.sent_at DESC, n.id DESC`,
    [lotId],
  );
  if (!list.length) return [];
  const to = await rows<{ notice_id: number; organisation: string; email: string; status: 'sent' | 'failed'; uses: number }>(
    `SELECT r.notice_id, o.name AS organisation, r.email, r.status, r.uses FROM liner_recall_notice_recipients r JOIN organisations o ON o.id = r.organisation_id
      WHERE r.notice_id = ANY($1::int[]) ORDER BY o.name, r.email`,
    [list.map((n) => n.id)],
  );
  return list.map((n) => ({ ...n, recipients: to.filter((r) => r.notice_id === n.id).map(({ notice_id: _n, ...r }) => r) }));
}

/** The customers a notice would reach now, with their addresses (for the form). */
export async function noticeAudience(lotId: number, uses?: TraceUse[]) {
  const all = uses ?? (await lotTrace(lotId));
  const byCustomer = new Map<number, { name: string; uses: TraceUse[] }>();
  for (const u of all) {
    if (u.customerId === null || u.customer === null) continue;
    const c = byCustomer.get(u.customerId) ?? { name: u.customer, uses: [] };
    c.uses.push(u);
    byCustomer.set(u.customerId, c);
  }
  const ids = [...byCustomer.keys()];
  const addresses = ids.length
    ? await rows<{ organisation_id: number; email: string | null }>(
        `SELECT o.id AS organisation_id, o.contact_email AS email, 0 AS rank, 0 AS uid FROM organisations o WHERE o.id = ANY($1::int[])
         UNION ALL
         SELECT u.organisation_id, u.email, CASE WHEN u.portal_admin THEN 1 ELSE 2 END, u.id FROM users u
          WHERE u.organisation_id = ANY($1::int[]) AND u.role = 'customer' AND u.active AND u.portal_admin
         ORDER BY 1, 3, 4`,
        [ids],
      )
    : [];
  const contacts = ids
    .map((id) => ({
      organisationId: id,
      organisationName: byCustomer.get(id)!.name,
      addresses: addresses.filter((a) => a.organisation_id === id).map((a) => a.email),
      uses: byCustomer.get(id)!.uses.length,
    }))
    .sort((a, b) => a.organisationName.localeCompare(b.organisationName));
  return { ...noticeRecipients(contacts), byCustomer };
}

/** Mails the notice to every customer concerned (each about their own bins only) and records who received it. */
export async function sendLotNotice(actor: AuditActor, lotId: number, input: { message: string }, opts: { now?: Date } = {}): Promise<NoticeRecord> {
  const now = opts.now ?? new Date();
  const lot = await lotHeader(lotId);
  if (!lot) throw new AppError('not_found', 'No liner lot with that number.');
  const message = input.message.trim();
  if (!message) throw new AppError('validation_failed', 'Write what the customers should know.', [{ path: 'message', message: 'Write the notice.' }]);
  const settings = await getSettings();
  const { to, byCustomer } = await noticeAudience(lotId);
  if (!to.length) throw new AppError('unprocessable', 'No customer with an address received bins or kits from this lot: there is nobody to notify.');
  const subject = `Liner lot ${lot.lotNumber}`;
  const [notice] = await rows<{ id: number }>(
    `INSERT INTO liner_recall_notices (lot_id, sent_by, sent_at, lot_status, subject, message) VALUES ($1, $2, $3, $4, $5, $6) RETURNING id`,
    [lotId, actor.userId, now, lot.status, subject, message],
  );
  for (const r of to) {
    const mine = byCustomer.get(r.organisationId)!.uses;
    const mail = linerLotNoticeMail({
      operatorName: settings.operatorName,
      customerName: r.organisationName,
      lotNumber: lot.lotNumber,
      supplier: lot.supplier,
      status: lot.status,
      message,
      uses: mine.map((u) => ({
        serial: u.serial ?? `kit of ${u.liners} liner${u.liners === 1 ? '' : 's'}`,
        what: [TRACE_USE_WORDS[u.kind], u.orderRef && `order ${u.orderRef}`].filter(Boolean).join(', '),
        fillDay: u.filledAt ? formatLongDate(localDate(u.filledAt, settings.timeZone)) : null,
        product: u.product,
        site: u.fillingSite,
      })),
    });
    const sent = await sendMail({ to: r.email, ...mail, kind: 'liner_lot_notice' });
    await sequelize.query(
      'INSERT INTO liner_recall_notice_recipients (notice_id, organisation_id, email, mail_id, status, uses) VALUES ($1, $2, $3, $4, $5, $6) ON CONFLICT (notice_id, email) DO NOTHING',
      { bind: [notice!.id, r.organisationId, r.email, sent.id, sent.status, r.uses] },
    );
  }
  await recordAudit({ actor, action: 'liner_lot.notice', entityType: 'liner_lot', entityId: lotId, after: { notice: notice!.id, recipients: to.length } });
  return (await noticesOf(lotId)).find((n) => n.id === notice!.id)!;
}
