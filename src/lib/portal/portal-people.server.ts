// People of a customer: their customer admin invites colleagues (a customer account of the same organisation, through
// the one invitation flow of lib/accounts) and limits any of them to some of the organisation's sites. Only a customer
// admin may; only people and sites of their own organisation can be named.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { User } from '@/models';
import { AppError } from '@/lib/api-errors';
import { invitePerson, type Inviter } from '@/lib/accounts/accounts.server';
import { recordAudit, type AuditActor } from '@/lib/audit.server';
import type { SessionUser } from '@/lib/accounts/session-user.server';
import type { ColleagueSitesInput, InviteColleagueInput } from './portal-forms';

export function requirePortalAdmin(user: Pick<SessionUser, 'role' | 'portalAdmin'>): void {
  if (user.role !== 'customer' || !user.portalAdmin) throw new AppError('forbidden', "Only your organisation's portal admin manages its people.");
}

export interface Colleague {
  id: number;
  name: string;
  email: string;
  active: boolean;
  admin: boolean;
  invited: boolean;
  siteIds: number[];
  version: number;
}

export async function listColleagues(admin: Pick<SessionUser, 'role' | 'portalAdmin' | 'organisationId'>): Promise<Colleague[]> {
  requirePortalAdmin(admin);
  return sequelize.query<Colleague>(
    `SELECT u.id, u.name, u.email, u.active, u.portal_admin AS admin, u.password_hash IS NULL AS invited, u.version,
            COALESCE((SELECT array_agg(us.site_id ORDER BY us.site_id) FROM user_sites us WHERE us.user_id = u.id), '{}') AS "siteIds"
       FROM users u WHERE u.organisation_id = $1 AND u.role = 'customer' ORDER BY u.name, u.id`,
    { bind: [admin.organisationId], type: QueryTypes.SELECT },
  );
}

async function checkSites(organisationId: number, siteIds: number[]): Promise<void> {
  if (siteIds.length === 0) return;
  const [row] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM sites WHERE id = ANY($1::int[]) AND organisation_id = $2 AND kind = 'customer'`, {
    bind: [siteIds, organisationId],
    type: QueryTypes.SELECT,
  });
  if (row!.n !== siteIds.length) throw new AppError('not_found', 'There is no such site of yours.', [{ path: 'siteIds', message: 'Choose sites from the list.' }]);
}

async function writeSites(userId: number, siteIds: number[], transaction: import('sequelize').Transaction) {
  await sequelize.query('DELETE FROM user_sites WHERE user_id = $1', { bind: [userId], transaction });
  if (siteIds.length) {
    await sequelize.query('INSERT INTO user_sites (user_id, site_id) SELECT $1, unnest($2::int[])', { bind: [userId, siteIds], transaction });
  }
}

export async function inviteColleague(admin: Pick<SessionUser, 'role' | 'portalAdmin' | 'organisationId'>, input: InviteColleagueInput, inviter: Inviter): Promise<{ id: number }> {
  requirePortalAdmin(admin);
  await checkSites(admin.organisationId, input.siteIds);
  const { person } = await invitePerson(
    { name: input.name, email: input.email, role: 'customer', organisationId: admin.organisationId, homeSiteId: null, qualifiedInspector: false },
    inviter,
  );
  await sequelize.transaction(async (transaction) => {
    await writeSites(person.id, input.siteIds, transaction);
    if (input.admin) await User.update({ portalAdmin: true }, { where: { id: person.id }, transaction });
    await recordAudit(
      { actor: inviter, action: 'user.sites', entityType: 'user', entityId: person.id, after: { siteIds: input.siteIds, portalAdmin: input.admin } },
      { transaction },
    );
  });
  return { id: person.id };
}

/** Limits a colleague to these sites (none = every site). A customer admin does not limit themselves. */
export async function setColleagueSites(admin: Pick<SessionUser, 'id' | 'role' | 'portalAdmin' | 'organisationId'>, input: ColleagueSitesInput, actor: AuditActor): Promise<void> {
  requirePortalAdmin(admin);
  if (input.userId === admin.id) throw new AppError('unprocessable', 'You cannot limit your own account; ask another admin of your organisation.');
  const person = await User.findOne({ where: { id: input.userId, organisationId: admin.organisationId, role: 'customer' } });
  if (!person) throw new AppError('not_found', 'There is no such person in your organisation.');
  await checkSites(admin.organisationId, input.siteIds);
  await sequelize.transaction(async (transaction) => {
    const [before] = await sequelize.query<{ ids: number[] | null }>('SELECT array_agg(site_id ORDER BY site_id) AS ids FROM user_sites WHERE user_id = $1', {
      bind: [person.id],
      type: QueryTypes.SELECT,
      transaction,
    });
    await writeSites(person.id, input.siteIds, transaction);
    await recordAudit(
      { actor, action: 'user.sites', entityType: 'user', entityId: person.id, before: { siteIds: before?.ids ?? [] }, after: { siteIds: input.siteIds } },
      { transaction },
    );
  });
}
