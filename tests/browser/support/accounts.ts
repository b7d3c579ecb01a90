// Direct access to the e2e database for browser tests: read what the local
// SMTP server received (table dev_mailbox, filled by src/cli/mail-fake.mjs) and
// create fresh people, so tests never change the demo logins others rely on.
import pg from 'pg';
import bcrypt from 'bcryptjs';

let pool: pg.Pool | null = null;
function db(): pg.Pool {
  pool ??= new pg.Pool({ connectionString: process.env.DATABASE_URL, max: 2 });
  return pool;
}

export async function closeDb() {
  await pool?.end();
  pool = null;
}

export interface ReceivedMail {
  subject: string;
  text: string;
  to: string[];
  receivedAt: Date;
}

/** Waits until the local mailbox has a message to `to` (newest first), received after `since`. */
export async function waitForMail(
  to: string,
  { since = new Date(0), subject, timeoutMs = 15_000 }: { since?: Date; subject?: RegExp; timeoutMs?: number } = {},
): Promise<ReceivedMail> {
  const t0 = Date.now();
  while (Date.now() - t0 < timeoutMs) {
    const { rows } = await db().query<{ subject: string; text_body: string; envelope_to: string[]; received_at: Date }>(
      `SELECT subject, text_body, envelope_to, received_at FROM dev_mailbox
        WHERE $1 = ANY(envelope_to) AND received_at >= $2 ORDER BY received_at DESC, id DESC`,
      [to, since],
    );
    const hit = rows.find((r) => !subject || subject.test(r.subject));
    if (hit) return { subject: hit.subject, text: hit.text_body, to: hit.envelope_to, receivedAt: hit.received_at };
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`no mail to ${to} arrived in the local mailbox within ${timeoutMs} ms`);
}

/** The first link to `path` in a message body. */
export function linkIn(text: string, path: string): string {
  const m = new RegExp(`https?://\\S+${path.replace(/[/?]/g, '\\$&')}\\?token=[A-Za-z0-9_-]+`).exec(text);
  if (!m) throw new Error(`no ${path} link in:\n${text}`);
  return m[0];
}

/** A unique address per call, so reruns against the same database never collide. */
export function freshEmail(label: string): string {
  return `${label}-${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}@e2e.example`;
}

/** A staff member of the operator who can sign in at once. */
export async function createStaff(email: string, name: string, password: string, role: 'planner' | 'admin' = 'planner'): Promise<number> {
  const hash = await bcrypt.hash(password, 4);
  const { rows } = await db().query<{ id: number }>(
    `INSERT INTO users (email, name, password_hash, role, organisation_id)
     VALUES ($1, $2, $3, $4, (SELECT id FROM organisations WHERE kind = 'operator')) RETURNING id`,
    [email, name, hash, role],
  );
  return rows[0]!.id;
}
