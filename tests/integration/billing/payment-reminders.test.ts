// The payment reminder job at fixed clocks: an invoice due 4 Nov 2026 is reminded from 11 Nov (7 days past due,
// the default), not again within the week, again on 18 Nov, and never once paid; the mail goes to the customer's
// contact address and lists what is open.
import { describe, test, expect, beforeAll } from 'vitest';
import { usePoolWorld } from '../support/fixtures';
import { oneBinMonth } from '../support/billing';
import { sqlRows } from '../support/hand-made';
import { issueInvoice, recordPayment } from '@/lib/billing/invoices.server';
import { runJobNow } from '@/lib/jobs/registry.server';

const w = usePoolWorld();
let invoiceId = 0;
const at = (day: string) => ({ now: new Date(`${day}T08:45:00Z`) });
const reminders = async () =>
  (await sqlRows<{ subject: string; to_address: string }>(`SELECT subject, to_address FROM mail_outbox WHERE kind = 'payment_reminder' ORDER BY id`)).map((m) => m.subject);

beforeAll(async () => {
  const { statementId: id } = await oneBinMonth(w, '2026-09'); // 70.18 (oneBinMonth)
  // Issued 5 Oct → due 4 Nov.
  invoiceId = (await issueInvoice(id, { userId: null, ip: null }, { now: new Date('2026-10-05T10:00:00Z'), mail: false })).id;
});

describe('payment reminders', () => {
  test('from 7 days past due, weekly, never after payment', async () => {
    expect(await runJobNow('payment-reminders', at('2026-11-10'))).toMatchObject({ customers: 0 });
    expect(await runJobNow('payment-reminders', at('2026-11-11'))).toMatchObject({ customers: 1 });
    expect(await reminders()).toEqual(['Payment reminder: 1 invoice past due']);
    const [mail] = await sqlRows<{ to_address: string; text_body: string }>(`SELECT to_address, text_body FROM mail_outbox WHERE kind = 'payment_reminder'`);
    expect(mail!.to_address).toBe('c@test.example');
    // 2–30 Sep = 29 days × 2.00 = 58.00, VAT 21 % 12.18 → 70.18 open.
    expect(mail!.text_body).toMatch(/INV-2026-\d{5}: 70\.18 EUR open, due 4 Nov 2026/);
    await runJobNow('payment-reminders', at('2026-11-11')); // a second run the same day sends nothing
    await runJobNow('payment-reminders', at('2026-11-17'));
    expect(await reminders()).toHaveLength(1);
    await runJobNow('payment-reminders', at('2026-11-18'));
    expect(await reminders()).toHaveLength(2);
    await recordPayment(invoiceId, { amountMinor: 7018, method: 'bank_transfer', paidOn: '2026-11-19' }, { userId: null, ip: null }, { mail: false });
    expect(await runJobNow('payment-reminders', at('2026-11-25'))).toMatchObject({ open: 0, customers: 0 });
    expect(await reminders()).toHaveLength(2);
  });
});
