import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { isRole, type Role } from '@/lib/permissions';

/** What every request knows about the signed-in user (Astro.locals.user). */
export interface SessionUser {
  id: number;
  email: string;
  name: string;
  role: Role;
  organisationId: number;
  organisationName: string;
  homeSiteId: number | null;
  qualifiedInspector: boolean;
  /** Customers: may invite colleagues and limit them to sites. */
  portalAdmin?: boolean;
  /** Customers: the sites they are limited to; absent or null = every site of their organisation. */
  siteIds?: number[] | null;
}

/** The claims a session token carries (src/lib/session/session-cookie.ts). */
export interface SessionKey {
  uid: number;
  role: string;
  sid: string;
  epoch: number;
}

/**
 * Re-reads the user behind a session token. The token is an encrypted cookie
 * that outlives deactivation, role changes and sign-out, so on every request
 * the row must still exist and be active, still carry the role and the session
 * epoch the token was issued with, and this session must not have been signed
 * out. One query: a primary-key lookup, a primary-key probe and the (few) site limits by the user_sites key.
 */
export async function loadSessionUser(key: SessionKey): Promise<SessionUser | null> {
  const { uid: id, role: tokenRole, sid, epoch } = key;
  if (!Number.isInteger(id) || id <= 0 || !isRole(tokenRole)) return null;
  const rows = await sequelize.query<{
    id: number;
    email: string;
    name: string;
    role: string;
    organisation_id: number;
    organisation_name: string;
    home_site_id: number | null;
    qualified_inspector: boolean;
    active: boolean;
    session_epoch: number;
    ended: boolean;
    portal_admin: boolean;
    site_ids: number[] | null;
  }>(
    `SELECT u.id, u.email, u.name, u.role, u.organisation_id, o.name AS organisation_name,
            u.home_site_id, u.qualified_inspector, u.active AND o.active AS active, u.session_epoch, u.portal_admin,
            (SELECT array_agg(us.site_id ORDER BY us.site_id) FROM user_sites us WHERE us.user_id = u.id) AS site_ids,
            EXISTS (SELECT 1 FROM ended_sessions e WHERE e.session_id = $2::uuid) AS ended
       FROM users u JOIN organisations o ON o.id = u.organisation_id
      WHERE u.id = $1`,
    { bind: [id, sid], type: QueryTypes.SELECT },
  );
  const row = rows[0];
  if (!row || !row.active || row.ended || row.session_epoch !== epoch || row.role !== tokenRole || !isRole(row.role)) return null;
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role,
    organisationId: row.organisation_id,
    organisationName: row.organisation_name,
    homeSiteId: row.home_site_id,
    qualifiedInspector: row.qualified_inspector,
    portalAdmin: row.portal_admin,
    siteIds: row.site_ids,
  };
}
