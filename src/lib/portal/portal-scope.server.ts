// Whose data a customer user may see: their organisation, and within it the sites they are limited to (none named:
// all the organisation's sites). Every portal query goes through this, on the server.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { AppError } from '@/lib/api-errors';
import type { SessionUser } from '@/lib/accounts/session-user.server';
export { SCOPE_SITE_SQL, reachableBins, siteLimited } from '@/lib/customer-scope.server';

export interface PortalScope {
  userId: number;
  name: string;
  email: string;
  organisationId: number;
  /** The sites this user is limited to; null = every site of the organisation. */
  siteIds: number[] | null;
}

export async function portalScope(user: Pick<SessionUser, 'id' | 'name' | 'email' | 'organisationId' | 'role' | 'siteIds'>): Promise<PortalScope> {
  if (user.role !== 'customer') throw new AppError('forbidden', 'The portal is for customers.');
  return { userId: user.id, name: user.name, email: user.email, organisationId: user.organisationId, siteIds: user.siteIds ?? null };
}

/** The scope's sites: active sites of the organisation, limited to the user's own when limited. */
export async function scopeSites(scope: PortalScope): Promise<Array<{ id: number; name: string; code: string; address: string | null }>> {
  return sequelize.query(
    `SELECT id, name, code, address FROM sites
      WHERE organisation_id = $1 AND active AND ($2::int[] IS NULL OR id = ANY($2::int[])) ORDER BY name`,
    { bind: [scope.organisationId, scope.siteIds], type: QueryTypes.SELECT },
  );
}

/** A site of the scope, or "no such site" — the same answer whether it is another organisation's or does not exist. */
export async function ownSite(scope: PortalScope, siteId: number): Promise<{ id: number; name: string; code: string }> {
  const site = (await scopeSites(scope)).find((s) => s.id === siteId);
  if (!site) throw new AppError('not_found', 'There is no such site of yours.');
  return site;
}
