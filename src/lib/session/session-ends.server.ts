// Ending sessions on the server. Sessions are encrypted cookies, so what ends
// one is a note the per-request check reads (src/lib/accounts/session-user.server.ts):
// an ended session id (sign-out on one device) or a newer session epoch on the
// user row (end all of a person's sessions at once).
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { recordAudit, type AuditActor } from '@/lib/audit.server';
import { AppError } from '@/lib/api-errors';
import { SESSION_MAX_AGE_S, sessionClaims } from './session-cookie';

/**
 * Ends the one session a signed-out token belongs to (Auth.js's signOut event
 * hands us the decoded token). Kept until any copy of the cookie would have
 * expired: the last renewal was at most now, so now + maxAge bounds them all.
 * The person's other sessions (a yard phone with queued scans) keep working.
 */
export async function endSession(token: Record<string, unknown> | null | undefined, now = new Date()): Promise<boolean> {
  const claims = sessionClaims(token);
  if (!claims) return false;
  const expires = new Date(now.getTime() + SESSION_MAX_AGE_S * 1000);
  await sequelize.query(
    `INSERT INTO ended_sessions (session_id, user_id, ended_at, expires_at)
     SELECT $1::uuid, u.id, $3, $4 FROM (SELECT $2::int AS id) x LEFT JOIN users u ON u.id = x.id
     ON CONFLICT (session_id) DO NOTHING`,
    { bind: [claims.sid, claims.uid, now, expires] },
  );
  return true;
}

/**
 * Ends every session of a person, on every device, by counting up their
 * session epoch. Audited as `user.sessions_ended`. Does not touch `version`
 * (it is not an edit of the person's details, and must not make an open edit
 * form fail as "changed meanwhile").
 */
export async function endAllSessions(userId: number, actor: AuditActor): Promise<{ sessionEpoch: number }> {
  return sequelize.transaction(async (transaction) => {
    const rows = await sequelize.query<{ session_epoch: number }>('UPDATE users SET session_epoch = session_epoch + 1 WHERE id = $1 RETURNING session_epoch', {
      bind: [userId],
      type: QueryTypes.SELECT,
      transaction,
    });
    const row = rows[0];
    if (!row) throw new AppError('not_found', 'There is no such person.');
    await recordAudit(
      { actor, action: 'user.sessions_ended', entityType: 'user', entityId: userId, before: { sessionEpoch: row.session_epoch - 1 }, after: { sessionEpoch: row.session_epoch } },
      { transaction },
    );
    return { sessionEpoch: row.session_epoch };
  });
}

/** The `ended-sessions-cleanup` job: notes whose cookies have all expired are no longer needed. */
export async function deleteExpiredSessionEnds({ now }: { now: Date }): Promise<{ deleted: number }> {
  const rows = await sequelize.query<{ n: number }>('WITH d AS (DELETE FROM ended_sessions WHERE expires_at < $1 RETURNING 1) SELECT count(*)::int AS n FROM d', {
    bind: [now],
    type: QueryTypes.SELECT,
  });
  return { deleted: rows[0]?.n ?? 0 };
}
