// A throw-away SMTP server inside the test process, so integration tests see
// exactly what the app handed over (the same smtp-server the local mailbox uses).
import { SMTPServer } from 'smtp-server';
import { simpleParser, type ParsedMail } from 'mailparser';
import type { AddressInfo } from 'node:net';

export interface CapturedMail {
  to: string[];
  from: string | null;
  parsed: ParsedMail;
}

export async function startSmtpCapture() {
  const received: CapturedMail[] = [];
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          received.push({
            to: session.envelope.rcptTo.map((r) => r.address),
            from: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
            parsed,
          });
          callback();
        })
        .catch(callback);
    },
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const port = (server.server.address() as AddressInfo).port;
  const saved = { SMTP_HOST: process.env.SMTP_HOST, SMTP_PORT: process.env.SMTP_PORT, MAIL_DEV_INBOX: process.env.MAIL_DEV_INBOX };
  Object.assign(process.env, { SMTP_HOST: '127.0.0.1', SMTP_PORT: String(port), MAIL_DEV_INBOX: '1' });
  return {
    port,
    received,
    /** The newest message to this address (or undefined). */
    lastTo(address: string) {
      return [...received].reverse().find((m) => m.to.includes(address));
    },
    async stop() {
      for (const [k, v] of Object.entries(saved)) {
        if (v === undefined) delete process.env[k];
        else process.env[k] = v;
      }
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}
