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
}

/**
 * Re-reads the user behind a session token. The token is a signed JWT that
 * outlives deactivation and role changes, so on every request the row must
 * still exist, be active and still carry the role the token was issued for.
 * One primary-key lookup.
 */
export async function loadSessionUser(uid: unknown, tokenRole: unknown): Promise<SessionUser | null> {
  const id = Number(uid);
  if (!Number.isInteger(id) || id <= 0 || !isRole(tokenRole)) return null;
  const rows = await sequelize.query<{
    id: number; email: string; name: string; role: string; organisation_id: number;
    organisation_name: string; home_site_id: number | null; qualified_inspector: boolean; active: boolean;
  }>(
    `SELECT u.id, u.email, u.name, u.role, u.organisation_id, o.name AS organisation_name,
            u.home_site_id, u.qualified_inspector, u.active AND o.active AS active
       FROM users u JOIN organisations o ON o.id = u.organisation_id
      WHERE u.id = $1`,
    { bind: [id], type: QueryTypes.SELECT },
  );
  const row = rows[0];
  if (!row || !row.active || row.role !== tokenRole || !isRole(row.role)) return null;
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role,
    organisationId: row.organisation_id,
    organisationName: row.organisation_name,
    homeSiteId: row.home_site_id,
    qualifiedInspector: row.qualified_inspector,
  };
}
