import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';

// What the "Sent mail" page reads: the app's own outbox, and — when the local
// SMTP stand-in is in use — what that stand-in received (table dev_mailbox,
// created by src/cli/mail-fake.mjs, so it may not exist).

const MAIL_PAGE_SIZE = 50;

export interface OutboxRow {
  id: number;
  toAddress: string;
  subject: string;
  textBody: string;
  kind: string;
  status: 'queued' | 'sent' | 'failed';
  messageId: string | null;
  error: string | null;
  createdAt: Date;
  sentAt: Date | null;
}

export interface LocalMailRow {
  id: number;
  from: string | null;
  to: string[];
  subject: string;
  textBody: string;
  receivedAt: Date;
}

export interface Page<T> {
  rows: T[];
  total: number;
  page: number;
  pages: number;
}

function paging(total: number, page: number) {
  const pages = Math.max(1, Math.ceil(total / MAIL_PAGE_SIZE));
  const p = Math.min(Math.max(1, page), pages);
  return { pages, page: p, offset: (p - 1) * MAIL_PAGE_SIZE };
}

export async function listOutbox(page = 1): Promise<Page<OutboxRow>> {
  const [{ n }] = await sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM mail_outbox', { type: QueryTypes.SELECT });
  const p = paging(n ?? 0, page);
  const rows = await sequelize.query<OutboxRow>(
    `SELECT id, to_address AS "toAddress", subject, text_body AS "textBody", kind, status, message_id AS "messageId",
            error, created_at AS "createdAt", sent_at AS "sentAt"
       FROM mail_outbox ORDER BY created_at DESC, id DESC LIMIT $1 OFFSET $2`,
    { bind: [MAIL_PAGE_SIZE, p.offset], type: QueryTypes.SELECT },
  );
  return { rows, total: n ?? 0, page: p.page, pages: p.pages };
}

/** True when the local mailbox is in use (MAIL_DEV_INBOX=1) and its table exists. */
export async function localMailboxAvailable(): Promise<boolean> {
  if (process.env.MAIL_DEV_INBOX !== '1') return false;
  const [row] = await sequelize.query<{ present: boolean }>("SELECT to_regclass('public.dev_mailbox') IS NOT NULL AS present", { type: QueryTypes.SELECT });
  return Boolean(row?.present);
}

export async function listLocalMailbox(page = 1): Promise<Page<LocalMailRow>> {
  const [{ n }] = await sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM dev_mailbox', { type: QueryTypes.SELECT });
  const p = paging(n ?? 0, page);
  const rows = await sequelize.query<LocalMailRow>(
    `SELECT id, envelope_from AS "from", envelope_to AS "to", coalesce(subject, '') AS subject,
            coalesce(text_body, '') AS "textBody", received_at AS "receivedAt"
       FROM dev_mailbox ORDER BY received_at DESC, id DESC LIMIT $1 OFFSET $2`,
    { bind: [MAIL_PAGE_SIZE, p.offset], type: QueryTypes.SELECT },
  );
  return { rows, total: n ?? 0, page: p.page, pages: p.pages };
}
