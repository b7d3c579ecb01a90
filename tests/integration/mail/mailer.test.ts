import { describe, test, expect, beforeAll, afterAll } from 'vitest';
import { createServer, type AddressInfo } from 'node:net';
import { resetDatabase, sequelize } from '../support/db';
import { baseWorld } from '../support/fixtures';
import { startSmtpCapture } from '../support/smtp';
import { sendMail } from '@/lib/mail/mailer.server';
import { MailMessage } from '@/models';

let smtp: Awaited<ReturnType<typeof startSmtpCapture>>;
beforeAll(async () => {
  await resetDatabase();
  await baseWorld();
  smtp = await startSmtpCapture();
});
afterAll(async () => {
  await smtp?.stop();
  await sequelize.close();
});

async function closedPort(): Promise<number> {
  const srv = createServer();
  await new Promise<void>((r) => srv.listen(0, '127.0.0.1', r));
  const { port } = srv.address() as AddressInfo;
  await new Promise<void>((r) => srv.close(() => r()));
  return port;
}

describe('sending mail', () => {
  test('a message reaches the SMTP server from the configured sender and is recorded as sent', async () => {
    const outcome = await sendMail({ to: 'someone@test.example', subject: 'Hello', text: 'Line one\nhttps://x.example/a', html: '<p>Line one</p>', kind: 'invite' });
    expect(outcome.status).toBe('sent');
    expect(outcome.error).toBeNull();
    const got = smtp.lastTo('someone@test.example')!;
    expect(got.from).toBe('pool@test.example');
    expect(got.parsed.subject).toBe('Hello');
    expect(got.parsed.text?.trim()).toBe('Line one\nhttps://x.example/a');
    expect(got.parsed.html).toContain('<p>Line one</p>');
    const row = await MailMessage.findByPk(outcome.id);
    expect(row).toMatchObject({ status: 'sent', toAddress: 'someone@test.example', kind: 'invite', textBody: 'Line one\nhttps://x.example/a' });
    expect(row!.messageId).toBe(outcome.messageId);
    expect(got.parsed.messageId).toBe(outcome.messageId);
    expect(row!.sentAt).toBeInstanceOf(Date);
  });

  test('secrets reach the recipient but the outbox keeps them masked', async () => {
    const token = 'abcdefghijklmnopqrstuvwxyz0123456789-_ABCDE';
    const text = `Your link:\nhttp://x.example/account/invite?token=${token}\n`;
    const outcome = await sendMail({ to: 'secret@test.example', subject: 'Link', text, kind: 'invite', secrets: [token] });
    expect(smtp.lastTo('secret@test.example')!.parsed.text).toContain(token);
    const row = await MailMessage.findByPk(outcome.id);
    expect(row!.textBody).toBe('Your link:\nhttp://x.example/account/invite?token=•••\n');
  });

  test('a server that does not answer: no exception, the row says failed with the reason', async () => {
    const port = await closedPort();
    const saved = process.env.SMTP_PORT;
    process.env.SMTP_PORT = String(port);
    try {
      const outcome = await sendMail({ to: 'nobody@test.example', subject: 'Lost', text: 'x', kind: 'password_reset' });
      expect(outcome.status).toBe('failed');
      expect(outcome.error).toMatch(/ECONNREFUSED/);
      const row = await MailMessage.findByPk(outcome.id);
      expect(row).toMatchObject({ status: 'failed', sentAt: null });
      expect(row!.error).toMatch(/ECONNREFUSED/);
    } finally {
      process.env.SMTP_PORT = saved;
    }
  });

  test('mail not configured at all: recorded as failed, says what is missing', async () => {
    const saved = process.env.SMTP_HOST;
    delete process.env.SMTP_HOST;
    try {
      const outcome = await sendMail({ to: 'x@test.example', subject: 'S', text: 't', kind: 'invite' });
      expect(outcome).toMatchObject({ status: 'failed', messageId: null });
      expect(outcome.error).toMatch(/SMTP_HOST/);
    } finally {
      process.env.SMTP_HOST = saved;
    }
  });
});
