// People who sign in, as the admin "People" page and its API see them: the row
// shape, what their status is, and which combinations of role, organisation,
// home depot and inspector flag make sense. Pure and free of zod, so the
// island that shows people stays small; input schemas are in people-schemas.ts.
import type { Role } from '@/lib/permissions';

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Administrator',
  planner: 'Fleet planner',
  yard: 'Yard',
  customer: 'Customer',
};

/** Staff work for the operator; customers for a customer organisation. */
export function isStaffRole(role: Role): boolean {
  return role !== 'customer';
}

export interface PersonRow {
  id: number;
  name: string;
  email: string;
  role: Role;
  organisationId: number;
  organisationName: string;
  organisationKind: 'operator' | 'customer';
  homeSiteId: number | null;
  homeSiteName: string | null;
  qualifiedInspector: boolean;
  active: boolean;
  hasPassword: boolean;
  /** Expiry of the newest unused invitation link (ISO), if any. */
  inviteExpiresAt: string | null;
  lastSignInAt: string | null;
  version: number;
}

export type PersonStatus = 'active' | 'invited' | 'invite_lapsed' | 'deactivated';

export const STATUS_LABELS: Record<PersonStatus, string> = {
  active: 'Active',
  invited: 'Invited',
  invite_lapsed: 'Invitation expired',
  deactivated: 'Deactivated',
};

export function personStatus(p: Pick<PersonRow, 'active' | 'hasPassword' | 'inviteExpiresAt'>, now: Date = new Date()): PersonStatus {
  if (!p.active) return 'deactivated';
  if (p.hasPassword) return 'active';
  if (p.inviteExpiresAt && new Date(p.inviteExpiresAt).getTime() > now.getTime()) return 'invited';
  return 'invite_lapsed';
}

/** What the rules need to know about an assignment. */
export interface Assignment {
  role: Role;
  organisationKind: 'operator' | 'customer' | null;
  homeSite: { kind: string; operatorOwned: boolean } | null;
  qualifiedInspector: boolean;
}

export interface FieldProblem {
  path: string;
  message: string;
}

/** Every reason this combination is refused (empty when it is fine). */
export function assignmentProblems(a: Assignment): FieldProblem[] {
  const out: FieldProblem[] = [];
  const staff = isStaffRole(a.role);
  if (a.organisationKind === null) out.push({ path: 'organisationId', message: 'Choose an organisation.' });
  else if (staff && a.organisationKind !== 'operator') {
    out.push({ path: 'organisationId', message: `${ROLE_LABELS[a.role]} accounts belong to the operator, not to a customer.` });
  } else if (!staff && a.organisationKind !== 'customer') {
    out.push({ path: 'organisationId', message: 'Customer accounts belong to a customer organisation.' });
  }
  if (a.homeSite) {
    if (!staff) out.push({ path: 'homeSiteId', message: 'Customers have no home depot.' });
    else if (a.homeSite.kind !== 'depot' || !a.homeSite.operatorOwned) out.push({ path: 'homeSiteId', message: 'A home depot must be one of the operator’s depots.' });
  } else if (a.role === 'yard') {
    out.push({ path: 'homeSiteId', message: 'Yard staff need a home depot: it decides which bins and work they see first.' });
  }
  if (a.qualifiedInspector && !staff) out.push({ path: 'qualifiedInspector', message: 'Only operator staff can be qualified inspectors.' });
  return out;
}

/** The choices the invite and edit forms offer. */
export interface PeopleChoices {
  operator: { id: number; name: string };
  customers: Array<{ id: number; name: string }>;
  depots: Array<{ id: number; name: string; code: string }>;
}
