// The local stand-in for a hosted mail service: a real SMTP server on
// loopback (smtp-server) that keeps every message it receives in the
// dev_mailbox table, where admins read it in the app and tests assert on it.
// The app talks plain SMTP to it through nodemailer and cannot tell.
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';
import pg from 'pg';

const port = Number(process.env.LOOPFOLD_SMTP_PORT ?? 2525);
const url = process.env.MAILBOX_DATABASE_URL ?? process.env.DATABASE_URL;
if (!url) {
  console.error('[mail] MAILBOX_DATABASE_URL or DATABASE_URL must be set');
  process.exit(1);
}
const pool = new pg.Pool({ connectionString: url, max: 2 });

await pool.query(`
  CREATE TABLE IF NOT EXISTS dev_mailbox (
    id          SERIAL PRIMARY KEY,
    envelope_from VARCHAR(254),
    envelope_to TEXT[] NOT NULL,
    subject     TEXT,
    text_body   TEXT,
    html_body   TEXT,
    raw         TEXT NOT NULL,
    received_at TIMESTAMPTZ NOT NULL DEFAULT now()
  )`);

const server = new SMTPServer({
  authOptional: true,
  disabledCommands: ['STARTTLS'],
  size: 25 * 1024 * 1024,
  banner: 'Loopfold local mailbox',
  onData(stream, session, callback) {
    const chunks = [];
    stream.on('data', (c) => chunks.push(c));
    stream.on('end', async () => {
      try {
        const raw = Buffer.concat(chunks).toString('utf8');
        const mail = await simpleParser(raw);
        await pool.query('INSERT INTO dev_mailbox (envelope_from, envelope_to, subject, text_body, html_body, raw) VALUES ($1, $2, $3, $4, $5, $6)', [
          session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
          session.envelope.rcptTo.map((r) => r.address),
          mail.subject ?? '',
          mail.text ?? '',
          typeof mail.html === 'string' ? mail.html : null,
          raw,
        ]);
        callback();
      } catch (err) {
        console.error('[mail] could not store message', err);
        callback(new Error('storage failed'));
      }
    });
  },
});

server.on('error', (err) => console.error('[mail]', err.message));
server.listen(port, '127.0.0.1', () => console.log(`[mail] local SMTP server on 127.0.0.1:${port}`));

for (const sig of ['SIGINT', 'SIGTERM']) {
  process.on(sig, () => server.close(() => pool.end().then(() => process.exit(0))));
}
