// Sites as the admin sets them up: the operator's depots, repair shops and
// recycling points, and the customers' filling and receiving sites — with
// coordinates (the pool map) and kind.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { Organisation, Site } from '@/models';
import { AppError } from '@/lib/api-errors';
import type { AuditActor } from '@/lib/audit.server';
import { positionProblems, siteOwnerKind, SITE_KIND_LABELS, type SiteCreate, type SitePatch, type SiteKindName } from './setup-schemas';
import { createAudited, editVersioned } from './versioned-edit.server';

export interface SiteRow {
  id: number;
  code: string;
  name: string;
  kind: SiteKindName;
  organisationId: number;
  organisationName: string;
  address: string | null;
  latitude: number | null;
  longitude: number | null;
  /** Bins a collection must have before a truck run goes (1 = any). */
  minCollectionQty: number;
  active: boolean;
  version: number;
  /** Bins standing there now. */
  bins: number;
}

export interface SiteOwnerChoice {
  id: number;
  name: string;
  kind: 'operator' | 'customer';
}

const SITE_SQL = `
  SELECT s.id, s.code, s.name, s.kind, s.organisation_id AS "organisationId", o.name AS "organisationName", s.address,
         s.latitude::float8 AS latitude, s.longitude::float8 AS longitude, s.min_collection_qty AS "minCollectionQty", s.active, s.version,
         (SELECT count(*)::int FROM assets a WHERE a.site_id = s.id) AS bins
    FROM sites s JOIN organisations o ON o.id = s.organisation_id`;

export async function listSites(): Promise<SiteRow[]> {
  return sequelize.query<SiteRow>(`${SITE_SQL} ORDER BY s.active DESC, array_position(ARRAY['depot','repair','recycling','customer']::varchar[], s.kind), lower(s.name), s.id`, {
    type: QueryTypes.SELECT,
  });
}

export async function siteById(id: number): Promise<SiteRow> {
  const [row] = await sequelize.query<SiteRow>(`${SITE_SQL} WHERE s.id = $1`, { bind: [id], type: QueryTypes.SELECT });
  if (!row) throw new AppError('not_found', 'There is no such site.');
  return row;
}

/** Who may own a site: the operator and the active customers. */
export async function siteOwners(): Promise<SiteOwnerChoice[]> {
  const orgs = await Organisation.findAll({
    attributes: ['id', 'name', 'kind', 'active'],
    order: [
      ['kind', 'DESC'],
      ['name', 'ASC'],
    ],
  });
  return orgs.filter((o) => o.active || o.kind === 'operator').map((o) => ({ id: o.id, name: o.name, kind: o.kind }));
}

async function checkOwner(organisationId: number, kind: SiteKindName, transaction?: import('sequelize').Transaction) {
  const org = await Organisation.findByPk(organisationId, { attributes: ['kind'], transaction });
  if (!org) throw new AppError('validation_failed', 'Some fields are not valid.', [{ path: 'organisationId', message: 'That organisation does not exist.' }]);
  const wanted = siteOwnerKind(kind);
  if (org.kind !== wanted) {
    const message = wanted === 'operator' ? `A ${SITE_KIND_LABELS[kind].toLowerCase()} belongs to the operator.` : 'A customer site belongs to a customer.';
    throw new AppError('validation_failed', message, [{ path: kind === 'customer' ? 'organisationId' : 'kind', message }]);
  }
}

async function codeTaken(code: string, exceptId: number | null, transaction?: import('sequelize').Transaction) {
  const other = await Site.findOne({ where: { code }, attributes: ['id'], transaction });
  if (other && other.id !== exceptId) {
    throw new AppError('validation_failed', 'Some fields are not valid.', [{ path: 'code', message: `The code ${code} is already used by another site.` }]);
  }
}

function snapshot(s: Site) {
  return {
    code: s.code,
    name: s.name,
    kind: s.kind,
    address: s.address,
    latitude: s.latitude === null ? null : Number(s.latitude),
    longitude: s.longitude === null ? null : Number(s.longitude),
    minCollectionQty: s.minCollectionQty,
    active: s.active,
  };
}

export async function createSite(input: SiteCreate, actor: AuditActor): Promise<SiteRow> {
  const id = await createAudited('site', actor, async (transaction) => {
    await checkOwner(input.organisationId, input.kind, transaction);
    await codeTaken(input.code, null, transaction);
    const site = await Site.create(
      {
        organisationId: input.organisationId,
        code: input.code,
        name: input.name,
        kind: input.kind,
        address: input.address ?? null,
        latitude: input.latitude === null ? null : String(input.latitude),
        longitude: input.longitude === null ? null : String(input.longitude),
        minCollectionQty: input.minCollectionQty ?? 1,
        active: input.active ?? true,
      },
      { transaction },
    );
    return { id: site.id, snapshot: { organisationId: site.organisationId, ...snapshot(site) }, result: site.id };
  });
  return siteById(id);
}

export async function updateSite(id: number, patch: SitePatch, actor: AuditActor): Promise<SiteRow> {
  await editVersioned({
    model: Site,
    id,
    version: patch.version,
    entityType: 'site',
    actor,
    notFound: 'There is no such site.',
    describe: (s) => `the site ${s.code}`,
    snapshot,
    apply: async (s, transaction) => {
      if (patch.kind !== undefined && patch.kind !== s.kind) await checkOwner(s.organisationId, patch.kind, transaction);
      if (patch.code !== undefined && patch.code !== s.code) await codeTaken(patch.code, s.id, transaction);
      if (patch.active === false && s.active) {
        const [{ n }] = (await sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM assets WHERE site_id = $1', {
          bind: [s.id],
          type: QueryTypes.SELECT,
          transaction,
        })) as [{ n: number }];
        if (n > 0) {
          throw new AppError('unprocessable', `${n} ${n === 1 ? 'bin stands' : 'bins stand'} at ${s.code}. Move ${n === 1 ? 'it' : 'them'} elsewhere before closing the site.`, [
            { path: 'active', message: 'Bins still stand here.' },
          ]);
        }
      }
      if (patch.code !== undefined) s.code = patch.code;
      if (patch.name !== undefined) s.name = patch.name;
      if (patch.kind !== undefined) s.kind = patch.kind;
      if (patch.address !== undefined) s.address = patch.address;
      if (patch.latitude !== undefined) s.latitude = patch.latitude === null ? null : String(patch.latitude);
      if (patch.longitude !== undefined) s.longitude = patch.longitude === null ? null : String(patch.longitude);
      if (patch.minCollectionQty !== undefined) s.minCollectionQty = patch.minCollectionQty;
      if (patch.active !== undefined) s.active = patch.active;
      const position = positionProblems({ latitude: s.latitude === null ? null : Number(s.latitude), longitude: s.longitude === null ? null : Number(s.longitude) });
      if (position.length) throw new AppError('validation_failed', position[0]!.message, position);
    },
  });
  return siteById(id);
}
