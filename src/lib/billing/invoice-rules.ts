/**
 * Invoices and what is left to pay on them. Pure.
 *
 *   PAYMENT_TERMS_DAYS                          → days from the issue date to the due date (printed on the invoice)
 *   dueOn(issuedOn)                             → the due date
 *   creditAmounts(netMinor, tax)                → net, tax and gross of a credit note, by the invoice's tax treatment
 *   balanceOf({ grossMinor, credits, payments }) → credited, paid and outstanding, in minor units
 *   invoiceState(balance, dueOn, today)          → open · part_paid · paid · overdue · credited, with its look
 *   paymentProblem(amount, balance, currency)   → why a payment cannot be recorded, or null
 *   creditProblem(netMinor, reason, balance, tax) → why a credit note cannot be issued, or null
 *
 * Common practice (no single published source): an invoice is paid when payments and credit notes together reach
 * its total; a payment larger than what is outstanding is refused rather than kept as a balance (the operator
 * refunds by credit note); a credit note never exceeds what the invoice still carries.
 */
import { addDays, type LocalDate } from '@/lib/calendar';
import type { TaxTreatment } from './hire-billing';
import { applyRate, formatMoney, isMinorAmount } from './money';
import type { Tone } from '@/lib/status-look';

export const PAYMENT_TERMS_DAYS = 30;

export function dueOn(issuedOn: LocalDate, days: number = PAYMENT_TERMS_DAYS): LocalDate {
  return addDays(issuedOn, days);
}

/** A credit note's amounts: the net the admin gives, tax by the invoice's treatment (the one rounding rule). */
export function creditAmounts(netMinor: number, tax: TaxTreatment): { netMinor: number; taxMinor: number; grossMinor: number } {
  const taxMinor = tax.kind === 'rate' ? applyRate(netMinor, tax.rateBasisPoints) : 0;
  return { netMinor, taxMinor, grossMinor: netMinor + taxMinor };
}

export interface Balance {
  grossMinor: number;
  creditedMinor: number;
  paidMinor: number;
  outstandingMinor: number;
}

export function balanceOf(i: { grossMinor: number; credits: readonly number[]; payments: readonly number[] }): Balance {
  const creditedMinor = i.credits.reduce((n, c) => n + c, 0);
  const paidMinor = i.payments.reduce((n, p) => n + p, 0);
  return { grossMinor: i.grossMinor, creditedMinor, paidMinor, outstandingMinor: i.grossMinor - creditedMinor - paidMinor };
}

export type InvoiceState = 'open' | 'part_paid' | 'paid' | 'overdue' | 'credited';

export const INVOICE_STATE_LOOK: Readonly<Record<InvoiceState, { label: string; tone: Tone }>> = Object.freeze({
  open: { label: 'To pay', tone: 'info' },
  part_paid: { label: 'Partly paid', tone: 'attention' },
  paid: { label: 'Settled', tone: 'good' },
  overdue: { label: 'Past due', tone: 'fault' },
  credited: { label: 'Credited in full', tone: 'good' },
});

/** Settled once nothing is outstanding; past due after the due date while something is; partly paid before it. */
export function invoiceState(b: Balance, due: LocalDate, today: LocalDate): InvoiceState {
  if (b.outstandingMinor <= 0) return b.paidMinor === 0 && b.creditedMinor > 0 ? 'credited' : 'paid';
  if (today > due) return 'overdue';
  return b.paidMinor > 0 || b.creditedMinor > 0 ? 'part_paid' : 'open';
}

export function paymentProblem(amountMinor: number, b: Balance, currency: string): string | null {
  if (!isMinorAmount(amountMinor) || amountMinor <= 0) return 'A payment is a positive amount.';
  if (b.outstandingMinor <= 0) return 'Nothing is outstanding on this invoice.';
  if (amountMinor > b.outstandingMinor) {
    return `The payment is more than the ${formatMoney(b.outstandingMinor, currency)} outstanding: record what was paid, and refund any excess by credit note.`;
  }
  return null;
}

export function creditProblem(netMinor: number, reason: string, b: Balance, tax: TaxTreatment): string | null {
  if (!isMinorAmount(netMinor) || netMinor <= 0) return 'A credit note is a positive net amount.';
  if (reason.trim().length < 3) return 'Say why the invoice is corrected (at least 3 characters).';
  const { grossMinor } = creditAmounts(netMinor, tax);
  if (grossMinor > b.grossMinor - b.creditedMinor) return 'A credit note cannot exceed what the invoice still carries after earlier credit notes.';
  return null;
}

/** Days between two payment reminders of the same invoice. */
export const PAYMENT_REMINDER_INTERVAL_DAYS = 7;

export interface ReminderCandidate {
  invoiceId: number;
  customerId: number;
  dueOn: LocalDate;
  outstandingMinor: number;
  /** The day the last reminder about this invoice went out, or null. */
  lastRemindedOn: LocalDate | null;
}

/**
 * The invoices to remind about today, per customer: still open at least `days` after their due date, and not
 * reminded in the last week. One mail per customer lists them all.
 */
export function paymentRemindersDue(invoices: readonly ReminderCandidate[], today: LocalDate, days: number): Map<number, ReminderCandidate[]> {
  const out = new Map<number, ReminderCandidate[]>();
  for (const i of invoices) {
    if (i.outstandingMinor <= 0 || today < addDays(i.dueOn, days)) continue;
    if (i.lastRemindedOn !== null && today < addDays(i.lastRemindedOn, PAYMENT_REMINDER_INTERVAL_DAYS)) continue;
    out.set(i.customerId, [...(out.get(i.customerId) ?? []), i]);
  }
  return out;
}
