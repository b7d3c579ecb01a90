import { createHash, randomBytes } from 'node:crypto';
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { linkLifetimeMs, TOKEN_PATTERN, type LinkPurpose, type LinkState } from './account-rules';

// One-time links. The raw token exists only in the e-mail; the table keeps its
// SHA-256, so someone who reads the database cannot use a pending link.

function hashToken(raw: string): string {
  return createHash('sha256').update(raw, 'utf8').digest('hex');
}

/**
 * Creates a fresh link for the user and deletes their older unused links of
 * the same purpose, so only the newest e-mail works.
 */
export async function issueToken(userId: number, purpose: LinkPurpose, transaction?: Transaction): Promise<{ token: string; expiresAt: Date }> {
  const token = randomBytes(32).toString('base64url');
  const expiresAt = new Date(Date.now() + linkLifetimeMs(purpose));
  await sequelize.query('DELETE FROM user_tokens WHERE user_id = $1 AND purpose = $2 AND used_at IS NULL', {
    bind: [userId, purpose],
    transaction,
  });
  await sequelize.query('INSERT INTO user_tokens (user_id, purpose, token_hash, expires_at) VALUES ($1, $2, $3, $4)', {
    bind: [userId, purpose, hashToken(token), expiresAt],
    transaction,
  });
  return { token, expiresAt };
}

interface TokenRow {
  id: number;
  user_id: number;
  purpose: LinkPurpose;
  expires_at: Date;
  used_at: Date | null;
  name: string;
  email: string;
  active: boolean;
}

/** What a link is good for right now (read-only: the page shows the form or the reason). */
export async function inspectToken(raw: string, transaction?: Transaction): Promise<LinkState> {
  if (!TOKEN_PATTERN.test(raw)) return { status: 'unknown' };
  const rows = await sequelize.query<TokenRow>(
    `SELECT t.id, t.user_id, t.purpose, t.expires_at, t.used_at, u.name, u.email, u.active
       FROM user_tokens t JOIN users u ON u.id = t.user_id
      WHERE t.token_hash = $1`,
    { bind: [hashToken(raw)], type: QueryTypes.SELECT, transaction },
  );
  const row = rows[0];
  if (!row) return { status: 'unknown' };
  if (row.used_at) return { status: 'used', purpose: row.purpose };
  if (new Date(row.expires_at).getTime() <= Date.now()) return { status: 'expired', purpose: row.purpose };
  if (!row.active) return { status: 'inactive', purpose: row.purpose };
  return { status: 'valid', purpose: row.purpose, name: row.name, email: row.email, expiresAt: new Date(row.expires_at) };
}

/**
 * Marks the link used, atomically: of two requests racing with the same link
 * only one gets the user id back. Returns null when the link is not usable
 * (call inspectToken for the reason).
 */
export async function claimToken(raw: string, transaction: Transaction): Promise<{ userId: number; purpose: LinkPurpose } | null> {
  if (!TOKEN_PATTERN.test(raw)) return null;
  const rows = await sequelize.query<{ user_id: number; purpose: LinkPurpose }>(
    `UPDATE user_tokens SET used_at = now()
      WHERE token_hash = $1 AND used_at IS NULL AND expires_at > $2
      RETURNING user_id, purpose`,
    { bind: [hashToken(raw), new Date()], type: QueryTypes.SELECT, transaction },
  );
  const row = rows[0];
  return row ? { userId: row.user_id, purpose: row.purpose } : null;
}

/** Removes every unused link of the user (after a password is set, or on deactivation). */
export async function dropUnusedTokens(userId: number, transaction?: Transaction): Promise<void> {
  await sequelize.query('DELETE FROM user_tokens WHERE user_id = $1 AND used_at IS NULL', { bind: [userId], transaction });
}
