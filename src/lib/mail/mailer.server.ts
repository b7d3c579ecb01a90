import nodemailer, { type Transporter } from 'nodemailer';
import { MailMessage, Setting } from '@/models';
import { smtpConfigFromEnv, type SmtpOptions } from './smtp-config';
import type { MailKind } from './mail-templates';

// Every message goes through here: it is written to mail_outbox first
// (queued), handed to the SMTP server, then marked sent (with its Message-ID)
// or failed (with the error). A dead mail server never breaks the request that
// wanted to send: the caller gets the outcome and decides what to tell people.
// Secrets in a message (one-time link tokens) go to the recipient only: the
// outbox keeps the text with them masked, so reading the table (or the "Sent
// mail" page) hands out no sign-ins.

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
  kind: MailKind;
  /** Strings to mask in the recorded copy (they are sent as they are). */
  secrets?: string[];
}

/** What a masked secret looks like in the outbox. */
export const MASKED_SECRET = '•••';

function maskSecrets(text: string, secrets: readonly string[] = []): string {
  return secrets.filter((s) => s.length >= 8).reduce((t, s) => t.split(s).join(MASKED_SECRET), text);
}

export interface MailOutcome {
  /** mail_outbox row id */
  id: number;
  status: 'sent' | 'failed';
  messageId: string | null;
  error: string | null;
}

const FALLBACK_SENDER = 'Loopfold <no-reply@localhost>';

let cached: { key: string; transport: Transporter } | null = null;
function transportFor(options: SmtpOptions): Transporter {
  const key = JSON.stringify(options);
  if (cached?.key !== key) {
    cached?.transport.close();
    cached = { key, transport: nodemailer.createTransport(options) };
  }
  return cached.transport;
}

async function sender(): Promise<string> {
  const setting = await Setting.findByPk(1, { attributes: ['mailSender'] });
  return setting?.mailSender ?? FALLBACK_SENDER;
}

function describe(err: unknown): string {
  const e = err as { message?: string; code?: string; responseCode?: number };
  const parts = [e.code, e.responseCode, e.message ?? String(err)].filter((p) => p !== undefined && p !== '');
  return parts.join(' · ').slice(0, 2000);
}

export async function sendMail(mail: OutgoingMail): Promise<MailOutcome> {
  const row = await MailMessage.create({
    toAddress: mail.to,
    subject: mail.subject.slice(0, 300),
    textBody: maskSecrets(mail.text, mail.secrets),
    kind: mail.kind,
    messageId: null,
    error: null,
    sentAt: null,
  });
  const fail = async (error: string): Promise<MailOutcome> => {
    await row.update({ status: 'failed', error });
    return { id: row.id, status: 'failed', messageId: null, error };
  };

  const config = smtpConfigFromEnv(process.env);
  if (!config.ok) return fail(config.problem);
  try {
    const info = await transportFor(config.options).sendMail({
      from: await sender(),
      to: mail.to,
      subject: mail.subject,
      text: mail.text,
      html: mail.html,
    });
    const messageId = String(info.messageId ?? '').slice(0, 300) || null;
    await row.update({ status: 'sent', messageId, sentAt: new Date() });
    return { id: row.id, status: 'sent', messageId, error: null };
  } catch (err) {
    console.error(`[mail] sending ${mail.kind} to ${mail.to} failed:`, describe(err));
    return fail(describe(err));
  }
}
