// Invoices against the real database: an issued statement becomes invoice INV-2026-00001 (once), a credit note
// takes its own series and the invoice's tax treatment, bank transfers settle it part by part, an overpayment is
// refused, a payment with a provider reference already recorded is a replay that records nothing, and a customer
// reads only their own. Amounts worked by hand in the comments.
import { describe, test, expect, beforeAll } from 'vitest';
import { usePoolWorld, appErrorOf, addSecondCustomer } from '../support/fixtures';
import { oneBinMonth } from '../support/billing';
import { sqlRows } from '../support/hand-made';
import { issueInvoice, issueCreditNote, recordPayment, recordBankTransfer, invoiceView, listInvoices } from '@/lib/billing/invoices.server';

const w = usePoolWorld();
const admin = () => ({ userId: w.planner.id, ip: '127.0.0.1' });
let statementId = 0;
let invoiceId = 0;

beforeAll(async () => {
  // October 2026 (oneBinMonth): 30 days × 2.00 = 60.00 net; VAT 21 % = 12.60; total 72.60.
  statementId = (await oneBinMonth(w, '2026-10')).statementId;
});

describe('an invoice from a statement', () => {
  test('numbered, due after 30 days, the statement total; once only; mailed to the customer', async () => {
    const inv = await issueInvoice(statementId, admin(), { now: new Date('2026-11-02T10:00:00Z') });
    invoiceId = inv.id;
    expect(inv.number).toBe('INV-2026-00001');
    const v = await invoiceView(inv.id, { kind: 'operator' });
    expect([v.netMinor, v.taxMinor, v.grossMinor, v.dueOn, v.issuedOn]).toEqual([6000, 1260, 7260, '2026-12-02', '2026-11-02']);
    expect(v.summary).toEqual([{ kind: 'hire', lines: 1, amountMinor: 6000 }]);
    expect(v.state).toBe('overdue'); // due 2 Dec, nothing paid, and the test runs after it
    expect((await appErrorOf(issueInvoice(statementId, admin()))).code).toBe('duplicate');
    expect((await appErrorOf(issueInvoice(999_999, admin()))).code).toBe('not_found');
    const mails = await sqlRows<{ to_address: string; subject: string }>(`SELECT to_address, subject FROM mail_outbox WHERE kind = 'invoice_issued'`);
    expect(mails).toEqual([{ to_address: 'c@test.example', subject: 'Invoice INV-2026-00001: 72.60 EUR, due 2026-12-02' }]);
  });

  test('a credit note: its own series, tax as on the invoice, never more than the invoice carries', async () => {
    // Net 10.00 at 21 % = 12.10 gross.
    const crn = await issueCreditNote(invoiceId, { netMinor: 1000, reason: 'Two days charged twice on bin T00001' }, admin());
    expect(crn.number).toMatch(/^CRN-\d{4}-00001$/);
    const c = await invoiceView(crn.id, { kind: 'operator' });
    expect([c.series, c.netMinor, c.taxMinor, c.grossMinor, c.correctsNumber]).toEqual(['credit_note', 1000, 210, 1210, 'INV-2026-00001']);
    // 72.60 − 12.10 = 60.50 left on the invoice: a credit of 50.01 net (60.51 gross) is too much.
    expect((await appErrorOf(issueCreditNote(invoiceId, { netMinor: 5001, reason: 'Too much' }, admin()))).code).toBe('unprocessable');
    expect((await appErrorOf(issueCreditNote(crn.id, { netMinor: 100, reason: 'A credit of a credit' }, admin()))).code).toBe('not_found');
    expect((await invoiceView(invoiceId, { kind: 'operator' })).balance).toEqual({ grossMinor: 7260, creditedMinor: 1210, paidMinor: 0, outstandingMinor: 6050 });
  });

  test('bank transfers part by part, an overpayment refused, a provider replay recording nothing', async () => {
    await recordBankTransfer(invoiceId, { amount: '50.00', paidOn: '2026-11-20', note: 'Ref 4471' }, admin());
    expect((await invoiceView(invoiceId, { kind: 'operator' })).state).toBe('overdue'); // 10.50 still open after the due date
    const over = await appErrorOf(recordBankTransfer(invoiceId, { amount: '10.51', paidOn: '2026-11-21' }, admin()));
    expect([over.code, over.message]).toEqual(['unprocessable', expect.stringMatching(/more than the 10\.50 EUR outstanding/)]);
    expect((await appErrorOf(recordBankTransfer(invoiceId, { amount: '1.005', paidOn: '2026-11-21' }, admin()))).code).toBe('validation_failed');
    expect((await appErrorOf(recordBankTransfer(invoiceId, { amount: '1.00', paidOn: '2099-01-01' }, admin()))).code).toBe('validation_failed');
    const first = await recordPayment(invoiceId, { amountMinor: 1050, method: 'card', paidOn: '2026-11-22', providerRef: 'pi_test_1' }, admin());
    const again = await recordPayment(invoiceId, { amountMinor: 1050, method: 'card', paidOn: '2026-11-22', providerRef: 'pi_test_1' }, admin());
    expect(again).toEqual({ id: first.id, replay: true });
    const v = await invoiceView(invoiceId, { kind: 'operator' });
    expect([v.balance.paidMinor, v.balance.outstandingMinor, v.state]).toEqual([6050, 0, 'paid']);
    expect(v.payments.map((p) => [p.method, p.amountMinor])).toEqual([
      ['bank_transfer', 5000],
      ['card', 1050],
    ]);
    const mails = await sqlRows<{ n: number }>(`SELECT count(*)::int AS n FROM mail_outbox WHERE kind = 'payment_received'`);
    expect(mails[0]!.n).toBe(2); // the replay sent nothing
    const audit = await sqlRows<{ n: number }>(`SELECT count(*)::int AS n FROM audit_entries WHERE action = 'payment.record' AND entity_id = $1`, [String(invoiceId)]);
    expect(audit[0]!.n).toBe(2);
  });

  test('the list shows the same balance as the invoice; another organisation and a site-limited user see none', async () => {
    const [row] = (await listInvoices({ kind: 'operator' })).filter((v) => v.id === invoiceId);
    expect(row!.balance).toEqual((await invoiceView(invoiceId, { kind: 'operator' })).balance);
    const other = await addSecondCustomer(w);
    const otherScope = { kind: 'customer' as const, organisationId: other.customer.id, siteIds: null };
    expect(await listInvoices(otherScope)).toEqual([]);
    expect((await appErrorOf(invoiceView(invoiceId, otherScope))).code).toBe('not_found');
    const limited = { kind: 'customer' as const, organisationId: w.customer.id, siteIds: [w.customerSite.id] };
    expect(await listInvoices(limited)).toEqual([]);
    const own = { kind: 'customer' as const, organisationId: w.customer.id, siteIds: null };
    expect((await listInvoices(own)).map((v) => v.series).sort()).toEqual(['credit_note', 'invoice']);
  });
});
