// The one way the pool set-up pages change a row: lock it, refuse a stale copy
// (409 changed_meanwhile), apply the change, save through Sequelize's version
// check, and write the audit entry with only the changed fields — all in one
// transaction, so the change and its audit entry commit together or not at all.
import type { Model, ModelStatic, Transaction } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { AppError } from '@/lib/api-errors';
import { recordAudit, type AuditActor } from '@/lib/audit.server';
import { changedFields, type Snapshot } from '@/lib/audit-diff';

export interface VersionedEdit<M extends Model> {
  model: ModelStatic<M>;
  id: number;
  /** The version of the copy the caller edited. */
  version: number;
  /** 'customer', 'site', 'bin_type' — the audit's entity type and the action's prefix. */
  entityType: string;
  /** "the site DEP-NORTH": named in the stale-copy message. */
  describe: (row: M) => string;
  notFound: string;
  snapshot: (row: M) => Snapshot;
  /** Checks and sets the new values on the row; throws AppError to refuse. */
  apply: (row: M, transaction: Transaction) => Promise<void> | void;
  actor: AuditActor;
}

export async function editVersioned<M extends Model & { version: number; active: boolean }>(edit: VersionedEdit<M>): Promise<M> {
  return sequelize.transaction(async (transaction) => {
    const row = await edit.model.findByPk(edit.id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw new AppError('not_found', edit.notFound);
    if (row.version !== edit.version) {
      throw new AppError('changed_meanwhile', `Someone else changed ${edit.describe(row)} meanwhile. Reload and make your change again.`);
    }
    const before = edit.snapshot(row);
    const wasActive = row.active;
    await edit.apply(row, transaction);
    const after = edit.snapshot(row);
    if (!changedFields(before, after)) return row; // nothing changed: no new version, no entry
    await row.save({ transaction });
    const action = wasActive === row.active ? 'update' : row.active ? 'reactivate' : 'deactivate';
    await recordAudit({ actor: edit.actor, action: `${edit.entityType}.${action}`, entityType: edit.entityType, entityId: edit.id, before, after }, { transaction });
    return row;
  });
}

/** Creates a row and its audit entry in one transaction. */
export async function createAudited<T>(
  entityType: string,
  actor: AuditActor,
  create: (transaction: Transaction) => Promise<{ id: number; snapshot: Snapshot; result: T }>,
): Promise<T> {
  return sequelize.transaction(async (transaction) => {
    const { id, snapshot, result } = await create(transaction);
    await recordAudit({ actor, action: `${entityType}.create`, entityType, entityId: id, after: snapshot }, { transaction });
    return result;
  });
}
