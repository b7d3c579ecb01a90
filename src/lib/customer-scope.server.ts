// What a customer user may see of the pool: bins on hire to their organisation and, when they are limited to some
// of its sites, only those at (or on the road for) those sites. Cross-cutting: the bin page, the bin finder, scans,
// attachments and the portal all ask here, on the server.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import type { SessionUser } from '@/lib/accounts/session-user.server';

/**
 * The customer site a bin counts at for site limits, as SQL over the aliases a (assets), s (its site) and
 * t (its current trip): the customer site it stands at, else the one its trip serves (on the road to or from it).
 */
export const SCOPE_SITE_SQL = `CASE WHEN s.kind = 'customer' THEN a.site_id ELSE t.customer_site_id END`;

/** Of these bins, the ones a customer user may see: on hire to their organisation, at (or for) a site of theirs. */
export async function reachableBins(user: Pick<SessionUser, 'role' | 'organisationId' | 'siteIds'>, assetIds: number[]): Promise<Set<number>> {
  if (user.role !== 'customer') return new Set(assetIds);
  if (assetIds.length === 0) return new Set();
  const rows = await sequelize.query<{ id: number }>(
    `SELECT a.id FROM assets a LEFT JOIN sites s ON s.id = a.site_id LEFT JOIN trips t ON t.id = a.current_trip_id
      WHERE a.id = ANY($1::int[]) AND a.customer_id = $2 AND ($3::int[] IS NULL OR ${SCOPE_SITE_SQL} = ANY($3::int[]))`,
    { bind: [assetIds, user.organisationId, user.siteIds ?? null], type: QueryTypes.SELECT },
  );
  return new Set(rows.map((r) => r.id));
}

/** True when a customer user is limited to some sites (the extra checks only they need). */
export const siteLimited = (user: Pick<SessionUser, 'role' | 'siteIds'>): boolean => user.role === 'customer' && Array.isArray(user.siteIds);
