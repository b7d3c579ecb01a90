// Collection requests ("empties ready") and damage reports: creating them
// from any source (the public bin page today, the customer portal later),
// telling the planners by mail, listing them for the planners' page, and the
// planners' status steps with optimistic locking and an audit entry.
import { QueryTypes, type Model, type Transaction } from 'sequelize';
import { sequelize, Asset, CollectionRequest, DamageReport } from '@/models';
import { AppError } from '@/lib/api-errors';
import { groupGrai } from '@/lib/gs1';
import { collectionRequestMail, damageReportMail, type MailContent, type MailKind, type RequestMailBin } from '@/lib/mail/mail-templates';
import { canMove, refusalReason, statusLook, type RequestKind, type RequestStatus } from './request-status';
import type { CollectionRequestFields, DamageReportFields, PlannerCollectionRequest } from './report-forms';
import { appUrl } from '@/lib/app-url.server';
import { MERGE_WINDOW_HOURS, mergeTarget, type OpenRequest } from './request-merge';
import { storeAttachment } from '@/lib/attachments.server';
import { recordAudit, type AuditActor } from '@/lib/audit.server';
import { sendMail, type MailOutcome } from '@/lib/mail/mailer.server';
import { getSettings } from '@/lib/settings/settings.server';

/** Where the request is about: a bin, and the site/customer it stood at when asked. */
interface Placement {
  assetId: number | null;
  /** Taken from the bin's current state when left out. */
  siteId?: number | null;
  customerId?: number | null;
}

export interface CollectionRequestInput extends Placement, CollectionRequestFields {
  source: CollectionRequest['source'];
  /** The day the empties are ready (portal requests). */
  readyOn?: string | null;
  requestedBy: number | null;
  requesterIp: string | null;
}

export interface DamageReportInput extends Placement, DamageReportFields {
  source: DamageReport['source'];
  /** Already checked with checkUpload (or checked again here, inside the transaction). */
  photo: { bytes: Uint8Array; filename: string | null } | null;
  reportedBy: number | null;
  requesterIp: string | null;
}

export interface Created {
  id: number;
  /** The report joined a request already listed (same bin or site within the window): no new request, no mail. */
  merged?: boolean;
  /** The mail to the planners; it never rejects (outcomes are in the outbox). Routes need not await it. */
  delivery: Promise<MailOutcome[]>;
}

async function place(p: Placement, transaction: Transaction): Promise<{ assetId: number | null; siteId: number | null; customerId: number | null }> {
  if (p.assetId === null) return { assetId: null, siteId: p.siteId ?? null, customerId: p.customerId ?? null };
  const asset = await Asset.findByPk(p.assetId, { attributes: ['id', 'siteId', 'customerId'], transaction });
  if (!asset) throw new AppError('not_found', 'There is no such bin.');
  return {
    assetId: asset.id,
    siteId: p.siteId === undefined ? asset.siteId : p.siteId,
    customerId: p.customerId === undefined ? asset.customerId : p.customerId,
  };
}

export async function createCollectionRequest(input: CollectionRequestInput): Promise<Created> {
  const now = new Date();
  const out = await sequelize.transaction(async (transaction) => {
    const where = await place(input, transaction);
    // The same bin or site asked about within the window: the report joins that request (mergeTarget()). Reports
    // for one site (or bin) queue here, so two at once cannot both open a new request.
    await sequelize.query(`SELECT pg_advisory_xact_lock(hashtext('collection_request'), $1)`, {
      bind: [where.assetId !== null ? -where.assetId : (where.siteId ?? 0)],
      transaction,
    });
    const open = await sequelize.query<{ id: number; asset_id: number | null; site_id: number | null; status: OpenRequest['status']; last_reported_at: Date }>(
      `SELECT id, asset_id, site_id, status, last_reported_at FROM collection_requests
        WHERE status IN ('open', 'scheduled') AND last_reported_at > $3::timestamptz - make_interval(hours => $4)
          AND ((asset_id IS NOT NULL AND asset_id = $1) OR (site_id IS NOT NULL AND site_id = $2))
        ORDER BY last_reported_at DESC FOR UPDATE`,
      { bind: [where.assetId, where.siteId, now, MERGE_WINDOW_HOURS], type: QueryTypes.SELECT, transaction },
    );
    const target = mergeTarget(
      open.map((r) => ({ id: r.id, assetId: r.asset_id, siteId: r.site_id, status: r.status, lastReportedAt: new Date(r.last_reported_at) })),
      where,
      now,
    );
    if (target) {
      // The latest quantity stated stands (reports are not added up); the latest contact and note are kept when given.
      await sequelize.query(
        `UPDATE collection_requests SET report_count = report_count + 1, last_reported_at = $2, quantity = $3, ready_on = coalesce($4, ready_on),
                contact_name = coalesce($5, contact_name), contact_phone = coalesce($6, contact_phone), contact_email = coalesce($7, contact_email),
                note = coalesce($8, note), location_note = coalesce($9, location_note), version = version + 1, updated_at = now()
          WHERE id = $1`,
        {
          bind: [target.id, now, input.quantity, input.readyOn ?? null, input.contactName, input.contactPhone, input.contactEmail, input.note, input.locationNote],
          transaction,
        },
      );
      return { id: target.id, merged: true };
    }
    const row = await CollectionRequest.create(
      {
        source: input.source,
        ...where,
        quantity: input.quantity,
        locationNote: input.locationNote,
        contactName: input.contactName,
        contactPhone: input.contactPhone,
        contactEmail: input.contactEmail,
        note: input.note,
        requestedBy: input.requestedBy,
        readyOn: input.readyOn ?? null,
        requesterIp: input.requesterIp?.slice(0, 64) ?? null,
        lastReportedAt: now,
      },
      { transaction },
    );
    return { id: row.id, merged: false };
  });
  // The planners hear of a request once: a report that joins one already listed sends no mail.
  return { id: out.id, merged: out.merged, delivery: out.merged ? Promise.resolve([]) : tellPlanners('collection', out.id) };
}

/** The open customer sites a planner may record a request for, by customer and name. */
export async function customerSitesForRequests(): Promise<Array<{ id: number; name: string; customer: string }>> {
  return sequelize.query(
    `SELECT s.id, s.name, o.name AS customer FROM sites s JOIN organisations o ON o.id = s.organisation_id
      WHERE s.kind = 'customer' AND s.active AND o.active ORDER BY o.name, s.name`,
    { type: QueryTypes.SELECT },
  );
}

/** A request a planner records for a customer site (taken on the phone); the site must be an open customer site. */
export async function recordPlannerCollection(input: PlannerCollectionRequest, actor: AuditActor): Promise<Created> {
  const [site] = await sequelize.query<{ id: number; organisation_id: number; kind: string; active: boolean; name: string }>(
    'SELECT id, organisation_id, kind, active, name FROM sites WHERE id = $1',
    { bind: [input.siteId], type: QueryTypes.SELECT },
  );
  if (!site || site.kind !== 'customer' || !site.active) {
    throw new AppError('validation_failed', 'That is not an open customer site.', [{ path: 'siteId', message: 'Choose the customer site.' }]);
  }
  const created = await createCollectionRequest({
    source: 'planner',
    assetId: null,
    siteId: site.id,
    customerId: site.organisation_id,
    quantity: input.quantity,
    readyOn: input.readyOn,
    locationNote: null,
    contactName: input.contactName,
    contactPhone: input.contactPhone,
    contactEmail: null,
    note: input.note,
    requestedBy: actor.userId,
    requesterIp: null,
  });
  await recordAudit({
    actor,
    action: 'collection_request.record',
    entityType: 'collection_request',
    entityId: created.id,
    after: { siteId: site.id, quantity: input.quantity, readyOn: input.readyOn },
  });
  return created;
}

/** The report and its photo are stored together or not at all. */
export async function createDamageReport(input: DamageReportInput): Promise<Created> {
  const row = await sequelize.transaction(async (transaction) => {
    const where = await place(input, transaction);
    // A photo from the public page is for the operator's staff only; one sent
    // through the portal belongs to the customer who sent it too.
    const photo = input.photo
      ? await storeAttachment({ ...input.photo, purpose: 'photo', organisationId: input.source === 'portal' ? where.customerId : null, uploadedBy: input.reportedBy }, transaction)
      : null;
    return DamageReport.create(
      {
        source: input.source,
        ...where,
        description: input.description,
        photoId: photo?.id ?? null,
        contactName: input.contactName,
        contactEmail: input.contactEmail,
        reportedBy: input.reportedBy,
        requesterIp: input.requesterIp?.slice(0, 64) ?? null,
      },
      { transaction },
    );
  });
  return { id: row.id, delivery: tellPlanners('damage', row.id) };
}

// Mail to planners

/** Every active planner of the operator. */
export async function plannerAddresses(): Promise<string[]> {
  const rows = await sequelize.query<{ email: string }>(
    `SELECT u.email FROM users u JOIN organisations o ON o.id = u.organisation_id
      WHERE u.role = 'planner' AND u.active AND o.active AND o.kind = 'operator' ORDER BY u.id`,
    { type: QueryTypes.SELECT },
  );
  return rows.map((r) => r.email);
}

async function mailFor(kind: RequestKind, id: number): Promise<{ kind: MailKind; content: MailContent }> {
  const settings = await getSettings();
  const [row] = kind === 'collection' ? await listCollectionRequests({ id }).then((p) => p.rows) : await listDamageReports({ id }).then((p) => p.rows);
  if (!row) throw new Error(`${kind} request ${id} vanished before its mail was written`);
  const bin: RequestMailBin | null = row.bin ? { serial: row.bin.serial, grai: groupGrai(row.bin.grai, settings.gs1PrefixLength) } : null;
  const common = {
    operatorName: settings.operatorName,
    bin,
    siteName: row.site?.name ?? null,
    customerName: row.customer?.name ?? null,
    receivedAt: new Date(row.createdAt),
    timeZone: settings.timeZone,
    link: `${appUrl()}/requests`,
  };
  if (row.kind === 'collection') {
    return {
      kind: 'collection_request',
      content: collectionRequestMail({
        ...common,
        source: row.source,
        quantity: row.quantity,
        locationNote: row.locationNote,
        contactName: row.contactName,
        contactPhone: row.contactPhone,
        contactEmail: row.contactEmail,
        note: row.note,
        readyOn: row.readyOn,
      }),
    };
  }
  return {
    kind: 'damage_report',
    content: damageReportMail({
      ...common,
      source: row.source,
      description: row.description,
      hasPhoto: row.photoId !== null,
      contactName: row.contactName,
      contactEmail: row.contactEmail,
    }),
  };
}

/** One message per planner (nobody sees the others' addresses); failures stay in the outbox, never thrown. */
async function tellPlanners(kind: RequestKind, id: number): Promise<MailOutcome[]> {
  try {
    const [{ kind: mailKind, content }, to] = await Promise.all([mailFor(kind, id), plannerAddresses()]);
    const outcomes: MailOutcome[] = [];
    for (const address of to) outcomes.push(await sendMail({ to: address, ...content, kind: mailKind }));
    return outcomes;
  } catch (err) {
    console.error(`[requests] could not mail the planners about ${kind} request ${id}:`, err);
    return [];
  }
}

// Lists for the planners' page

const REQUESTS_PAGE_SIZE = 20;

interface RowCommon {
  id: number;
  createdAt: string;
  status: string;
  version: number;
  contactName: string | null;
  contactEmail: string | null;
  bin: { grai: string; serial: string } | null;
  site: { id: number; name: string; code: string } | null;
  customer: { id: number; name: string } | null;
}

export interface CollectionRequestRow extends RowCommon {
  kind: 'collection';
  source: CollectionRequest['source'];
  quantity: number;
  locationNote: string | null;
  contactPhone: string | null;
  note: string | null;
  readyOn: string | null;
  plannedFor: string | null;
  /** Reports this request holds (merged within the window) and when the latest came. */
  reportCount: number;
  lastReportedAt: Date;
}

export interface DamageReportRow extends RowCommon {
  kind: 'damage';
  source: DamageReport['source'];
  description: string;
  photoId: number | null;
}

export interface RequestPage<T> {
  rows: T[];
  total: number;
  page: number;
  pages: number;
}

export type RequestFilter = 'unfinished' | 'all';

const UNFINISHED: Record<RequestKind, string[]> = { collection: ['open', 'scheduled'], damage: ['open', 'triaged'] };
const TABLES: Record<RequestKind, string> = { collection: 'collection_requests', damage: 'damage_reports' };
const EXTRA_COLUMNS: Record<RequestKind, string> = {
  collection: `r.quantity, r.location_note AS "locationNote", r.contact_phone AS "contactPhone", r.note,
    to_char(r.ready_on, 'YYYY-MM-DD') AS "readyOn", to_char(r.planned_for, 'YYYY-MM-DD') AS "plannedFor",
    r.report_count AS "reportCount", r.last_reported_at AS "lastReportedAt"`,
  damage: `r.description, r.photo_id AS "photoId"`,
};

interface ListOptions {
  filter?: RequestFilter;
  page?: number;
  /** One request by id (for its mail). */
  id?: number;
}

type RawRow = Record<string, unknown> & {
  id: number;
  createdAt: Date;
  assetGrai: string | null;
  assetSerial: string | null;
  siteId: number | null;
  siteName: string | null;
  siteCode: string | null;
  customerId: number | null;
  customerName: string | null;
};

async function list<T extends CollectionRequestRow | DamageReportRow>(kind: RequestKind, opts: ListOptions): Promise<RequestPage<T>> {
  const conditions: string[] = [];
  const bind: unknown[] = [];
  if (opts.id !== undefined) {
    bind.push(opts.id);
    conditions.push(`r.id = $${bind.length}`);
  } else if ((opts.filter ?? 'unfinished') === 'unfinished') {
    bind.push(UNFINISHED[kind]);
    conditions.push(`r.status = ANY($${bind.length})`);
  }
  const where = conditions.length ? `WHERE ${conditions.join(' AND ')}` : '';
  const table = TABLES[kind];
  const [{ n }] = (await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM ${table} r ${where}`, { bind, type: QueryTypes.SELECT })) as [{ n: number }];
  const pages = Math.max(1, Math.ceil(n / REQUESTS_PAGE_SIZE));
  const page = Math.min(Math.max(1, opts.page ?? 1), pages);
  const raw = await sequelize.query<RawRow>(
    `SELECT r.id, r.created_at AS "createdAt", r.status, r.version, r.source, r.contact_name AS "contactName", r.contact_email AS "contactEmail",
            ${EXTRA_COLUMNS[kind]},
            a.grai AS "assetGrai", a.serial AS "assetSerial",
            s.id AS "siteId", s.name AS "siteName", s.code AS "siteCode", o.id AS "customerId", o.name AS "customerName"
       FROM ${table} r
       LEFT JOIN assets a ON a.id = r.asset_id
       LEFT JOIN sites s ON s.id = r.site_id
       LEFT JOIN organisations o ON o.id = r.customer_id
       ${where}
      ORDER BY r.created_at DESC, r.id DESC
      LIMIT ${REQUESTS_PAGE_SIZE} OFFSET ${(page - 1) * REQUESTS_PAGE_SIZE}`,
    { bind, type: QueryTypes.SELECT },
  );
  const rows = raw.map((r) => {
    const { assetGrai, assetSerial, siteId, siteName, siteCode, customerId, customerName, createdAt, ...rest } = r;
    return {
      ...rest,
      kind,
      createdAt: new Date(createdAt).toISOString(),
      bin: assetGrai && assetSerial ? { grai: assetGrai, serial: assetSerial } : null,
      site: siteId !== null && siteName && siteCode ? { id: siteId, name: siteName, code: siteCode } : null,
      customer: customerId !== null && customerName ? { id: customerId, name: customerName } : null,
    } as unknown as T;
  });
  return { rows, total: n, page, pages };
}

export const listCollectionRequests = (opts: ListOptions = {}) => list<CollectionRequestRow>('collection', opts);
export const listDamageReports = (opts: ListOptions = {}) => list<DamageReportRow>('damage', opts);

// Status steps

export interface StatusChange {
  status: RequestStatus;
  /** The version the planner's page showed: a stale one is refused (409), never merged. */
  version: number;
  /** A collection being scheduled: the day of the run (shown to the customer in the portal). */
  plannedFor?: string | null;
}

export async function changeRequestStatus(kind: RequestKind, id: number, change: StatusChange, actor: AuditActor): Promise<{ id: number; status: string; version: number }> {
  const entityType = kind === 'collection' ? 'collection_request' : 'damage_report';
  return sequelize.transaction(async (transaction) => {
    const options = { transaction, lock: transaction.LOCK.UPDATE };
    const row: (Model & { id: number; status: string; version: number }) | null =
      kind === 'collection' ? await CollectionRequest.findByPk(id, options) : await DamageReport.findByPk(id, options);
    if (!row) throw new AppError('not_found', kind === 'collection' ? 'There is no such collection request.' : 'There is no such damage report.');
    if (row.version !== change.version) {
      throw new AppError(
        'changed_meanwhile',
        `Someone changed this ${kind === 'collection' ? 'request' : 'report'} meanwhile (it is now ${statusLook(kind, row.status).label.toLowerCase()}). Reload the page to see it.`,
        { status: row.status, version: row.version },
      );
    }
    if (kind === 'collection' && (row as CollectionRequest).truckRunId) {
      throw new AppError('unprocessable', 'A truck run collects this request; change it on the run’s page (/planning/runs).');
    }
    if (!canMove(kind, row.status, change.status)) throw new AppError('transition_refused', refusalReason(kind, row.status, change.status));
    const before: Record<string, unknown> = { status: row.status };
    const after: Record<string, unknown> = { status: change.status };
    row.set('status', change.status);
    if (kind === 'collection' && change.plannedFor !== undefined) {
      if (change.status !== 'scheduled')
        throw new AppError('validation_failed', 'A run day goes with scheduling the collection.', [{ path: 'plannedFor', message: 'Only when scheduling.' }]);
      const readyOn = (row as CollectionRequest).readyOn;
      if (change.plannedFor && readyOn && change.plannedFor < readyOn) {
        throw new AppError('validation_failed', `The run cannot be before the empties are ready (${readyOn}).`, [{ path: 'plannedFor', message: 'Before the ready day.' }]);
      }
      before.plannedFor = (row as CollectionRequest).plannedFor;
      after.plannedFor = change.plannedFor;
      row.set('plannedFor', change.plannedFor);
    }
    await row.save({ transaction });
    await recordAudit({ actor, action: `${entityType}.status`, entityType, entityId: row.id, before, after }, { transaction });
    return { id: row.id, status: row.status, version: row.version };
  });
}
