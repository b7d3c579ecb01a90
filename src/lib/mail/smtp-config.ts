// How Loopfold reaches its SMTP server, read from the environment:
//   SMTP_HOST, SMTP_PORT, SMTP_SECURE (1/true = TLS from the first byte, usually
//   port 465), SMTP_USER, SMTP_PASSWORD; MAIL_DEV_INBOX=1 when the local
//   mailbox (src/cli/mail-fake.mjs) stands in for a real server.
// Kept pure so the rules are tested without a network.

export interface SmtpOptions {
  host: string;
  port: number;
  secure: boolean;
  ignoreTLS?: boolean;
  auth?: { user: string; pass: string };
  connectionTimeout: number;
  greetingTimeout: number;
  socketTimeout: number;
}

export type SmtpConfig = { ok: true; options: SmtpOptions } | { ok: false; problem: string };

type Env = Record<string, string | undefined>;

const truthy = (v: string | undefined) => v === '1' || v?.toLowerCase() === 'true';

export function smtpConfigFromEnv(env: Env): SmtpConfig {
  const host = env.SMTP_HOST?.trim();
  if (!host) return { ok: false, problem: 'Mail is not set up: SMTP_HOST is not set.' };
  const secure = truthy(env.SMTP_SECURE);
  const port = env.SMTP_PORT ? Number(env.SMTP_PORT) : secure ? 465 : 587;
  if (!Number.isInteger(port) || port < 1 || port > 65535) return { ok: false, problem: `SMTP_PORT is not a port number: ${env.SMTP_PORT}` };
  // A request waits for the server's answer: bounded, so a dead server costs
  // the person seconds, not minutes.
  const timeouts = { connectionTimeout: 10_000, greetingTimeout: 10_000, socketTimeout: 20_000 };
  if (truthy(env.MAIL_DEV_INBOX)) {
    // The local mailbox speaks plain SMTP on loopback and offers no STARTTLS.
    return { ok: true, options: { host, port, secure: false, ignoreTLS: true, ...timeouts } };
  }
  const options: SmtpOptions = { host, port, secure, ...timeouts };
  if (env.SMTP_USER) options.auth = { user: env.SMTP_USER, pass: env.SMTP_PASSWORD ?? '' };
  return { ok: true, options };
}
