// What is left to pay on an invoice, its state, and the refusals, as a literal table worked by hand. The rules
// (settled when payments and credit notes reach the total; no overpayment kept as a balance) are common practice,
// no single published source. Due dates checked against date-fns' addDays, which the code does not use.
import { describe, test, expect } from 'vitest';
import fc from 'fast-check';
import { addDays as fnsAddDays, format, parseISO } from 'date-fns';
import {
  balanceOf,
  creditAmounts,
  creditProblem,
  dueOn,
  invoiceState,
  paymentProblem,
  paymentRemindersDue,
  PAYMENT_TERMS_DAYS,
  type InvoiceState,
} from '@/lib/billing/invoice-rules';

const DUE = '2026-12-31';
const VAT21 = { kind: 'rate' as const, rateBasisPoints: 2100 };

describe('invoice state, literal table', () => {
  // gross, credits, payments, today → outstanding, state
  const rows: Array<[number, number[], number[], string, number, InvoiceState]> = [
    [10000, [], [], '2026-12-04', 10000, 'open'],
    [10000, [], [4000], '2026-12-04', 6000, 'part_paid'],
    [10000, [], [4000, 6000], '2026-12-04', 0, 'paid'],
    [10000, [2000], [8000], '2027-01-15', 0, 'paid'],
    [10000, [10000], [], '2026-12-04', 0, 'credited'],
    [10000, [], [], '2026-12-31', 10000, 'open'], // the due date itself is still in time
    [10000, [], [], '2027-01-01', 10000, 'overdue'],
    [10000, [], [9999], '2027-01-01', 1, 'overdue'],
    [10000, [2500], [], '2026-12-10', 7500, 'part_paid'],
  ];
  test.each(rows)('gross %i, credits %j, payments %j on %s → %i outstanding, %s', (gross, credits, payments, today, outstanding, state) => {
    const b = balanceOf({ grossMinor: gross, credits, payments });
    expect(b.outstandingMinor).toBe(outstanding);
    expect(invoiceState(b, DUE, today)).toBe(state);
  });
});

describe('refusals', () => {
  const b = balanceOf({ grossMinor: 12100, credits: [], payments: [2100] });
  test('payments: positive, not more than outstanding (by hand: 121.00 − 21.00 = 100.00 open)', () => {
    expect(paymentProblem(10000, b, 'EUR')).toBeNull();
    expect(paymentProblem(10001, b, 'EUR')).toMatch(/more than the 100\.00 EUR outstanding/);
    expect(paymentProblem(0, b, 'EUR')).toMatch(/positive/);
    expect(paymentProblem(12.5, b, 'EUR')).toMatch(/positive/);
    expect(paymentProblem(100, balanceOf({ grossMinor: 100, credits: [100], payments: [] }), 'EUR')).toMatch(/Nothing is outstanding/);
  });
  test('credit notes: net 100.00 at 21 % is 121.00 gross (by hand), never more than the invoice still carries', () => {
    expect(creditAmounts(10000, VAT21)).toEqual({ netMinor: 10000, taxMinor: 2100, grossMinor: 12100 });
    expect(creditAmounts(10000, { kind: 'reverse_charge', customerVatId: 'DE287654310' })).toEqual({ netMinor: 10000, taxMinor: 0, grossMinor: 10000 });
    expect(creditAmounts(333, VAT21)).toEqual({ netMinor: 333, taxMinor: 70, grossMinor: 403 }); // 69.93 → 70, half away from zero
    expect(creditProblem(10000, 'Wrong days on bin 100027', b, VAT21)).toBeNull();
    expect(creditProblem(10001, 'Too much', b, VAT21)).toMatch(/cannot exceed/);
    expect(creditProblem(100, 'no', b, VAT21)).toMatch(/Say why/);
    expect(creditProblem(-5, 'Negative', b, VAT21)).toMatch(/positive/);
  });
});

describe('due dates', () => {
  test(`${PAYMENT_TERMS_DAYS} days after the issue day, across month and year ends`, () => {
    expect(dueOn('2026-12-04')).toBe('2027-01-03');
    fc.assert(
      fc.property(fc.date({ min: new Date('2000-01-01T00:00:00Z'), max: new Date('2099-12-31T00:00:00Z'), noInvalidDate: true }), (d) => {
        const day = d.toISOString().slice(0, 10);
        expect(dueOn(day)).toBe(format(fnsAddDays(parseISO(day), PAYMENT_TERMS_DAYS), 'yyyy-MM-dd'));
      }),
    );
  });
});

describe('payment reminders', () => {
  const inv = (invoiceId: number, customerId: number, dueOn: string, outstandingMinor: number, lastRemindedOn: string | null = null) => ({
    invoiceId,
    customerId,
    dueOn,
    outstandingMinor,
    lastRemindedOn,
  });
  test('7 days past due, then weekly, one list per customer (by hand)', () => {
    const list = [inv(1, 10, '2026-11-04', 500), inv(2, 10, '2026-11-01', 100, '2026-11-08'), inv(3, 11, '2026-11-04', 0), inv(4, 11, '2026-11-05', 900)];
    expect([...paymentRemindersDue(list, '2026-11-10', 7)]).toEqual([]); // 1: 6 days past due; 2: reminded 2 days ago; 3: paid; 4: 5 days
    expect([...paymentRemindersDue(list, '2026-11-11', 7)].map(([c, v]) => [c, v.map((x) => x.invoiceId)])).toEqual([[10, [1]]]);
    expect([...paymentRemindersDue(list, '2026-11-15', 7)].map(([c, v]) => [c, v.map((x) => x.invoiceId)])).toEqual([
      [10, [1, 2]],
      [11, [4]],
    ]);
    expect([...paymentRemindersDue(list, '2026-11-11', 30)]).toEqual([]);
  });
});
