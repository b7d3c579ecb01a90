// The statement scope of a signed-in customer user: their organisation, and whether they are limited to sites
// (then they see no statements: a statement is the whole organisation's).
import type { SessionUser } from '@/lib/accounts/session-user.server';
import { AppError } from '@/lib/api-errors';
import type { StatementScope } from './statement-views.server';

export function customerStatementScope(user: Pick<SessionUser, 'role' | 'organisationId' | 'siteIds'>): StatementScope {
  if (user.role !== 'customer') throw new AppError('forbidden', 'Statements here are for customers.');
  return { kind: 'customer', organisationId: user.organisationId, siteIds: user.siteIds ?? null };
}

/**
 * The WHERE condition a scope puts on a table's customer column: everything for the operator, the organisation's
 * rows for a customer, and nothing at all for a user limited to some sites (the same "none" as another
 * organisation's). `at` is the number of the bind parameter it uses.
 */
export function customerScopeSql(scope: StatementScope, column: string, at: number): { sql: string; bind: unknown[] } {
  if (scope.kind === 'operator') return { sql: 'TRUE', bind: [] };
  if (scope.siteIds !== null) return { sql: 'FALSE', bind: [] };
  return { sql: `${column} = $${at}`, bind: [scope.organisationId] };
}
