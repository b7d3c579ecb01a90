import type { Transaction } from 'sequelize';
import { AuditEntry } from '@/models';
import { changedFields, type Snapshot } from './audit-diff';

// The one way to write the audit trail ("who changed what, when, from where")
// for admin and planner edits. Call it inside the transaction of the change, so
// the entry and the change are committed together or not at all.

export interface AuditActor {
  /** The signed-in user, or null for changes nobody signed in made (e.g. a link used). */
  userId: number | null;
  /** Astro.locals.clientAddress of the request. */
  ip: string | null;
}

export interface AuditInput {
  actor: AuditActor;
  /** 'user.invite', 'user.update', 'settings.update', … (entity.verb) */
  action: string;
  entityType: string;
  entityId: string | number | null;
  /** Snapshots of the record; when both are given only changed fields are kept. */
  before?: Snapshot | null;
  after?: Snapshot | null;
}

/**
 * Records one entry. With both snapshots and nothing changed, nothing is
 * recorded and false is returned.
 */
export async function recordAudit(input: AuditInput, options: { transaction?: Transaction } = {}): Promise<boolean> {
  let before = input.before ?? null;
  let after = input.after ?? null;
  if (before && after) {
    const diff = changedFields(before, after);
    if (!diff) return false;
    ({ before, after } = diff);
  }
  await AuditEntry.create(
    {
      userId: input.actor.userId,
      action: input.action,
      entityType: input.entityType,
      entityId: input.entityId === null ? null : String(input.entityId),
      before,
      after,
      ip: input.actor.ip?.slice(0, 64) ?? null,
    },
    { transaction: options.transaction },
  );
  return true;
}

/** The signed-in caller of a request as an audit actor (with the name mail and messages use). */
export function actorFrom(locals: App.Locals): AuditActor & { name: string } {
  const user = locals.user;
  return { userId: user?.id ?? null, name: user?.name ?? 'Loopfold', ip: locals.clientAddress ?? null };
}
