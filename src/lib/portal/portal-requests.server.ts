// Collection requests and damage reports from the portal, and the customer's view of all their requests — those
// sent through the portal and those anyone sent from the public bin page about their bins — scoped to their own
// organisation and sites. Storing and telling the planners is src/lib/requests/requests.server.ts.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { AppError } from '@/lib/api-errors';
import { appUrl } from '@/lib/app-url.server';
import { collectionConfirmationMail } from '@/lib/mail/mail-templates';
import { sendMail } from '@/lib/mail/mailer.server';
import { getSettings } from '@/lib/settings/settings.server';
import { createCollectionRequest, createDamageReport } from '@/lib/requests/requests.server';
import type { CollectionInput, DamageInput } from './portal-forms';
import { ownSite, SCOPE_SITE_SQL, type PortalScope } from './portal-scope.server';

export interface PortalCollectionRow {
  id: number;
  source: 'public' | 'portal' | 'planner';
  status: 'open' | 'scheduled' | 'done' | 'cancelled';
  quantity: number;
  site: string | null;
  readyOn: string | null;
  plannedFor: string | null;
  createdAt: string;
  binSerial: string | null;
  /** Reports merged into this request (the same site asked again within the window: the latest quantity stands). */
  reportCount: number;
}

const inScope = (column: string, n: number) => `($${n}::int[] IS NULL OR ${column} = ANY($${n}::int[]))`;

/** The run day is the truck run's once the run is confirmed (a planned run's day may still move); before any run, the planner's own day. */
export async function listPortalCollections(scope: PortalScope): Promise<PortalCollectionRow[]> {
  return sequelize.query<PortalCollectionRow>(
    `SELECT r.id, r.source, r.status, r.quantity, s.name AS site, to_char(r.ready_on, 'YYYY-MM-DD') AS "readyOn",
            to_char(CASE WHEN tr.id IS NULL THEN r.planned_for WHEN tr.status IN ('confirmed', 'done') THEN tr.planned_on END, 'YYYY-MM-DD') AS "plannedFor",
            r.created_at AS "createdAt", a.serial AS "binSerial", r.report_count AS "reportCount"
       FROM collection_requests r LEFT JOIN sites s ON s.id = r.site_id LEFT JOIN assets a ON a.id = r.asset_id
       LEFT JOIN truck_runs tr ON tr.id = r.truck_run_id
      WHERE r.customer_id = $1 AND ${inScope('r.site_id', 2)}
      ORDER BY r.created_at DESC, r.id DESC LIMIT 50`,
    { bind: [scope.organisationId, scope.siteIds], type: QueryTypes.SELECT },
  );
}

/** Stores the request, tells the planners and confirms it to the requester (the mail never throws). */
export async function requestCollection(scope: PortalScope, input: CollectionInput, ip: string | null): Promise<{ id: number; delivery: Promise<unknown> }> {
  const site = await ownSite(scope, input.siteId);
  const created = await createCollectionRequest({
    source: 'portal',
    assetId: null,
    siteId: site.id,
    customerId: scope.organisationId,
    quantity: input.quantity,
    readyOn: input.readyOn,
    locationNote: null,
    contactName: scope.name,
    contactPhone: null,
    contactEmail: scope.email,
    note: input.note,
    requestedBy: scope.userId,
    requesterIp: ip,
  });
  const settings = await getSettings();
  const content = collectionConfirmationMail({
    recipientName: scope.name,
    operatorName: settings.operatorName,
    siteName: site.name,
    quantity: input.quantity,
    readyOn: input.readyOn,
    link: `${appUrl()}/portal/collections`,
  });
  const confirmation = sendMail({ to: scope.email, ...content, kind: 'collection_confirmation' });
  return { id: created.id, delivery: Promise.all([created.delivery, confirmation]) };
}

export interface PortalDamageRow {
  id: number;
  status: 'open' | 'triaged' | 'closed';
  description: string;
  binSerial: string | null;
  createdAt: string;
  photoId: number | null;
  source: string;
}

export async function listPortalDamage(scope: PortalScope): Promise<PortalDamageRow[]> {
  return sequelize.query<PortalDamageRow>(
    `SELECT r.id, r.status, r.description, a.serial AS "binSerial", r.created_at AS "createdAt", r.source,
            CASE WHEN p.organisation_id = $1 THEN r.photo_id END AS "photoId"
       FROM damage_reports r JOIN assets a ON a.id = r.asset_id LEFT JOIN attachments p ON p.id = r.photo_id
      WHERE a.customer_id = $1 AND r.source = 'portal' AND ${inScope('r.site_id', 2)}
      ORDER BY r.created_at DESC, r.id DESC LIMIT 50`,
    { bind: [scope.organisationId, scope.siteIds], type: QueryTypes.SELECT },
  );
}

/** The bins a customer may report on: on hire to them, at (or on the way to) one of their scope's sites. */
export async function damageableBins(scope: PortalScope): Promise<Array<{ grai: string; serial: string; site: string | null }>> {
  return sequelize.query(
    `SELECT a.grai, a.serial, s.name AS site
       FROM assets a LEFT JOIN sites s ON s.id = a.site_id LEFT JOIN trips t ON t.id = a.current_trip_id
      WHERE a.customer_id = $1 AND a.status IN ('on_hire', 'awaiting_collection', 'in_transit')
        AND ${inScope(SCOPE_SITE_SQL, 2)}
      ORDER BY a.serial`,
    { bind: [scope.organisationId, scope.siteIds], type: QueryTypes.SELECT },
  );
}

export async function reportPortalDamage(
  scope: PortalScope,
  input: DamageInput,
  photo: { bytes: Uint8Array; filename: string | null } | null,
  ip: string | null,
): Promise<{ id: number; delivery: Promise<unknown> }> {
  const bin = (await damageableBins(scope)).find((b) => b.grai === input.grai);
  if (!bin) throw new AppError('not_found', 'That bin is not on hire to you; choose one from the list.');
  const [row] = await sequelize.query<{ id: number }>('SELECT id FROM assets WHERE grai = $1', { bind: [bin.grai], type: QueryTypes.SELECT });
  const created = await createDamageReport({
    source: 'portal',
    assetId: row!.id,
    description: input.description,
    photo,
    contactName: scope.name,
    contactEmail: scope.email,
    reportedBy: scope.userId,
    requesterIp: ip,
  });
  return { id: created.id, delivery: created.delivery };
}
