// The audit trail of admin and planner edits: who changed what, when, from
// where. Call it inside the transaction of the change, so the entry and the
// change are committed together or not at all.
import type { Transaction } from 'sequelize';
import { AuditEntry } from '../../models';

export interface AuditRecord {
  userId: number | null;
  /** entity.verb, e.g. 'bin.update', 'bins.import'. */
  action: string;
  entityType: string;
  entityId: string | number | null;
  before: unknown;
  after: unknown;
  /** Astro.locals.clientAddress of the request. */
  ip: string | null;
}

export async function recordAudit(entry: AuditRecord, transaction?: Transaction): Promise<void> {
  await AuditEntry.create(
    {
      userId: entry.userId,
      action: entry.action,
      entityType: entry.entityType,
      entityId: entry.entityId === null ? null : String(entry.entityId),
      before: entry.before ?? null,
      after: entry.after ?? null,
      ip: entry.ip?.slice(0, 64) ?? null,
    },
    { transaction },
  );
}
