import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { Organisation, Site, User } from '@/models';
import { AppError } from '@/lib/api-errors';
import { assignmentProblems, isStaffRole, type PeopleChoices, type PersonRow, type Assignment } from './people';
import type { PersonPatch } from './people-schemas';
import type { Role } from '@/lib/permissions';
import { recordAudit, type AuditActor } from '@/lib/audit.server';
import { dropUnusedTokens } from './user-tokens.server';

// The admin's view of everyone who signs in, and the edits an admin makes.
// Customers never reach this (users.manage is admin-only, checked by the route).

interface PersonSqlRow {
  id: number;
  name: string;
  email: string;
  role: Role;
  organisation_id: number;
  organisation_name: string;
  organisation_kind: 'operator' | 'customer';
  home_site_id: number | null;
  home_site_name: string | null;
  qualified_inspector: boolean;
  active: boolean;
  has_password: boolean;
  invite_expires_at: Date | null;
  last_sign_in_at: Date | null;
  version: number;
}

const PERSON_SQL = `
  SELECT u.id, u.name, u.email, u.role, u.organisation_id, o.name AS organisation_name, o.kind AS organisation_kind,
         u.home_site_id, s.name AS home_site_name, u.qualified_inspector, u.active,
         (u.password_hash IS NOT NULL) AS has_password, u.last_sign_in_at, u.version,
         (SELECT max(t.expires_at) FROM user_tokens t
           WHERE t.user_id = u.id AND t.purpose = 'invite' AND t.used_at IS NULL) AS invite_expires_at
    FROM users u
    JOIN organisations o ON o.id = u.organisation_id
    LEFT JOIN sites s ON s.id = u.home_site_id`;

function toRow(r: PersonSqlRow): PersonRow {
  return {
    id: r.id,
    name: r.name,
    email: r.email,
    role: r.role,
    organisationId: r.organisation_id,
    organisationName: r.organisation_name,
    organisationKind: r.organisation_kind,
    homeSiteId: r.home_site_id,
    homeSiteName: r.home_site_name,
    qualifiedInspector: r.qualified_inspector,
    active: r.active,
    hasPassword: r.has_password,
    inviteExpiresAt: r.invite_expires_at ? new Date(r.invite_expires_at).toISOString() : null,
    lastSignInAt: r.last_sign_in_at ? new Date(r.last_sign_in_at).toISOString() : null,
    version: r.version,
  };
}

/** Everyone, staff of the operator first, then by name. */
export async function listPeople(): Promise<PersonRow[]> {
  const rows = await sequelize.query<PersonSqlRow>(`${PERSON_SQL} ORDER BY (o.kind = 'operator') DESC, lower(u.name), u.id`, { type: QueryTypes.SELECT });
  return rows.map(toRow);
}

export async function personById(id: number, transaction?: Transaction): Promise<PersonRow> {
  const rows = await sequelize.query<PersonSqlRow>(`${PERSON_SQL} WHERE u.id = $1`, { bind: [id], type: QueryTypes.SELECT, transaction });
  if (!rows[0]) throw new AppError('not_found', 'There is no such person.');
  return toRow(rows[0]);
}

export async function peopleChoices(): Promise<PeopleChoices> {
  const operator = await Organisation.findOne({ where: { kind: 'operator' }, attributes: ['id', 'name'] });
  if (!operator) throw new AppError('unavailable', 'The operator organisation is missing; run the set-up first.');
  const customers = await Organisation.findAll({ where: { kind: 'customer', active: true }, attributes: ['id', 'name'], order: [['name', 'ASC']] });
  const depots = await Site.findAll({
    where: { kind: 'depot', organisationId: operator.id, active: true },
    attributes: ['id', 'name', 'code'],
    order: [['name', 'ASC']],
  });
  return {
    operator: { id: operator.id, name: operator.name },
    customers: customers.map((c) => ({ id: c.id, name: c.name })),
    depots: depots.map((d) => ({ id: d.id, name: d.name, code: d.code })),
  };
}

/** Looks up what the assignment rules need and refuses a bad combination with field messages. */
export async function checkAssignment(a: { role: Role; organisationId: number; homeSiteId: number | null; qualifiedInspector: boolean }, transaction?: Transaction): Promise<void> {
  const org = await Organisation.findByPk(a.organisationId, { attributes: ['kind'], transaction });
  let homeSite: Assignment['homeSite'] = null;
  if (a.homeSiteId !== null) {
    const site = await Site.findByPk(a.homeSiteId, { include: [{ model: Organisation, as: 'organisation', attributes: ['kind'] }], transaction });
    if (!site) throw new AppError('validation_failed', 'Some fields are not valid.', [{ path: 'homeSiteId', message: 'That depot does not exist.' }]);
    const owner = (site as Site & { organisation?: Organisation }).organisation;
    homeSite = { kind: site.kind, operatorOwned: owner?.kind === 'operator' };
  }
  const problems = assignmentProblems({ role: a.role, organisationKind: org?.kind ?? null, homeSite, qualifiedInspector: a.qualifiedInspector });
  if (problems.length) throw new AppError('validation_failed', problems[0]!.message, problems);
}

/** The fields of a user the audit trail follows. */
export function userSnapshot(u: User) {
  return {
    name: u.name,
    email: u.email,
    role: u.role,
    organisationId: u.organisationId,
    homeSiteId: u.homeSiteId,
    qualifiedInspector: u.qualifiedInspector,
    active: u.active,
  };
}

/**
 * Changes role, home depot, inspector flag or active flag. The caller's copy
 * must be current (`version`), an admin cannot deactivate or demote
 * themselves, and a role never crosses between staff and customer (that
 * would move the person to another organisation: invite a new account).
 */
export async function updatePerson(id: number, patch: PersonPatch, actor: AuditActor): Promise<PersonRow> {
  return sequelize.transaction(async (transaction) => {
    const user = await User.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw new AppError('not_found', 'There is no such person.');
    if (user.version !== patch.version) {
      throw new AppError('changed_meanwhile', `${user.name} was changed by someone else meanwhile. Reload the list and try again.`);
    }
    if (actor.userId === user.id) {
      if (patch.active === false) throw new AppError('unprocessable', 'You cannot deactivate your own account. Ask another administrator.');
      if (patch.role !== undefined && patch.role !== user.role) {
        throw new AppError('unprocessable', 'You cannot change your own role. Ask another administrator.');
      }
    }
    const role = patch.role ?? user.role;
    if (isStaffRole(role) !== isStaffRole(user.role)) {
      throw new AppError('unprocessable', 'A role cannot move between operator staff and customer: the account would change organisation. Invite a new account instead.');
    }
    const before = userSnapshot(user);
    const homeSiteId = patch.homeSiteId !== undefined ? patch.homeSiteId : user.homeSiteId;
    const qualifiedInspector = patch.qualifiedInspector ?? user.qualifiedInspector;
    await checkAssignment({ role, organisationId: user.organisationId, homeSiteId, qualifiedInspector }, transaction);

    user.role = role;
    user.homeSiteId = homeSiteId;
    user.qualifiedInspector = qualifiedInspector;
    if (patch.active !== undefined) user.active = patch.active;
    await user.save({ transaction });
    if (before.active && !user.active) await dropUnusedTokens(user.id, transaction);

    const action = before.active === user.active ? 'user.update' : user.active ? 'user.reactivate' : 'user.deactivate';
    await recordAudit({ actor, action, entityType: 'user', entityId: user.id, before, after: userSnapshot(user) }, { transaction });
    return personById(user.id, transaction);
  });
}
