// The statement scope of a signed-in customer user: their organisation, and whether they are limited to sites
// (then they see no statements: a statement is the whole organisation's).
import type { SessionUser } from '@/lib/accounts/session-user.server';
import { AppError } from '@/lib/api-errors';
import type { StatementScope } from './statement-views.server';

export function customerStatementScope(user: Pick<SessionUser, 'role' | 'organisationId' | 'siteIds'>): StatementScope {
  if (user.role !== 'customer') throw new AppError('forbidden', 'Statements here are for customers.');
  return { kind: 'customer', organisationId: user.organisationId, siteIds: user.siteIds ?? null };
}
