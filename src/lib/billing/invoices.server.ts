// Invoices from issued statements, credit notes against invoices, and payments recorded by hand (a bank
// transfer) or from the payment provider's verified events (payments.server.ts). Numbers come from the counter
// row locked in the issuing transaction (gap-free per series and year); each invoice is locked FOR UPDATE while a
// payment or credit note is added, so two at once cannot both pass the "not more than outstanding" check.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { AppError } from '@/lib/api-errors';
import { recordAudit, type AuditActor } from '@/lib/audit.server';
import { localDate, type LocalDate } from '@/lib/calendar';
import { getSettings } from '@/lib/settings/settings.server';
import { appUrl } from '@/lib/app-url.server';
import { sendMail } from '@/lib/mail/mailer.server';
import { invoiceIssuedMail, paymentReceivedMail } from '@/lib/mail/mail-templates';
import type { LineKind, TaxTreatment } from './hire-billing';
import { numberingYear } from './document-number';
import { takeDocumentNumber } from './document-number.server';
import { balanceOf, creditAmounts, creditProblem, dueOn, invoiceState, paymentProblem, type Balance, type InvoiceState } from './invoice-rules';
import { decimalToMinorUnits, formatMoney, minorDigits } from './money';
import type { CreditNoteBody, PaymentBody } from './billing-forms';
import type { StatementScope } from './statement-views.server';
import { customerScopeSql } from './statement-scope.server';

export interface InvoiceHead {
  id: number;
  series: 'invoice' | 'credit_note';
  number: string;
  customerId: number;
  customer: string;
  statementId: number | null;
  correctsInvoiceId: number | null;
  correctsNumber: string | null;
  currency: string;
  netMinor: number;
  taxMinor: number;
  grossMinor: number;
  reason: string | null;
  issuedAt: Date;
  issuedOn: LocalDate;
  dueOn: LocalDate | null;
  periodFrom: LocalDate | null;
  periodTo: LocalDate | null;
  taxNote: string;
  customerVatId: string | null;
}

export interface InvoiceView extends InvoiceHead {
  balance: Balance;
  state: InvoiceState;
  payments: Array<{ id: number; amountMinor: number; method: 'card' | 'bank_transfer'; paidOn: LocalDate; note: string | null; providerRef: string | null }>;
  creditNotes: Array<{ id: number; number: string; grossMinor: number; reason: string; issuedOn: LocalDate }>;
  /** The statement's lines by kind (an invoice carries its statement; the statement has every line). */
  summary: Array<{ kind: LineKind; lines: number; amountMinor: number }>;
}

const HEAD_SQL = `SELECT i.id, i.series, i.number, i.customer_id AS "customerId", o.name AS customer, i.statement_id AS "statementId",
       i.corrects_invoice_id AS "correctsInvoiceId", c.number AS "correctsNumber", i.currency,
       i.net_minor AS "netMinor", i.tax_minor AS "taxMinor", i.gross_minor AS "grossMinor", i.reason, i.issued_at AS "issuedAt",
       to_char(i.issued_at AT TIME ZONE $1, 'YYYY-MM-DD') AS "issuedOn", to_char(i.due_on, 'YYYY-MM-DD') AS "dueOn",
       to_char(s.period_from, 'YYYY-MM-DD') AS "periodFrom", to_char(s.period_to, 'YYYY-MM-DD') AS "periodTo",
       coalesce(s.tax_note, cs.tax_note) AS "taxNote", coalesce(s.customer_vat_id, cs.customer_vat_id) AS "customerVatId"
  FROM invoices i JOIN organisations o ON o.id = i.customer_id
  LEFT JOIN statements s ON s.id = i.statement_id
  LEFT JOIN invoices c ON c.id = i.corrects_invoice_id
  LEFT JOIN statements cs ON cs.id = c.statement_id`;

type HeadRow = Omit<InvoiceHead, 'netMinor' | 'taxMinor' | 'grossMinor'> & { netMinor: string; taxMinor: string; grossMinor: string };
const head = (r: HeadRow): InvoiceHead => ({ ...r, netMinor: Number(r.netMinor), taxMinor: Number(r.taxMinor), grossMinor: Number(r.grossMinor) });

/** The caller's transaction (the demo seed's), or one of our own. */
function inTransaction<T>(transaction: Transaction | undefined, fn: (t: Transaction) => Promise<T>): Promise<T> {
  return transaction ? fn(transaction) : sequelize.transaction(fn);
}

async function taxOfStatement(statementId: number, transaction?: Transaction): Promise<TaxTreatment> {
  const [s] = await sequelize.query<{ tax_kind: 'rate' | 'reverse_charge'; tax_rate_bp: number | null; customer_vat_id: string | null }>(
    `SELECT tax_kind, tax_rate_bp, customer_vat_id FROM statements WHERE id = $1`,
    { bind: [statementId], type: QueryTypes.SELECT, transaction },
  );
  if (!s) throw new AppError('not_found', 'There is no such statement.');
  return s.tax_kind === 'rate' ? { kind: 'rate', rateBasisPoints: s.tax_rate_bp! } : { kind: 'reverse_charge', customerVatId: s.customer_vat_id ?? '' };
}

async function balanceIn(invoiceId: number, grossMinor: number, transaction?: Transaction): Promise<Balance> {
  const [credits, payments] = await Promise.all([
    sequelize.query<{ gross_minor: string }>(`SELECT gross_minor FROM invoices WHERE corrects_invoice_id = $1`, { bind: [invoiceId], type: QueryTypes.SELECT, transaction }),
    sequelize.query<{ amount_minor: string }>(`SELECT amount_minor FROM invoice_payments WHERE invoice_id = $1`, { bind: [invoiceId], type: QueryTypes.SELECT, transaction }),
  ]);
  return balanceOf({ grossMinor, credits: credits.map((c) => Number(c.gross_minor)), payments: payments.map((p) => Number(p.amount_minor)) });
}

/** An invoice's state by the balance rule; a credit note has none of its own (it settles what it corrects). */
function stateOf(h: InvoiceHead, balance: Balance, today: LocalDate): InvoiceState {
  return h.series === 'invoice' && h.dueOn ? invoiceState(balance, h.dueOn, today) : 'paid';
}

export async function invoiceView(id: number, scope: StatementScope): Promise<InvoiceView> {
  const { timeZone } = await getSettings();
  const where = customerScopeSql(scope, 'i.customer_id', 3);
  const [row] = await sequelize.query<HeadRow>(`${HEAD_SQL} WHERE i.id = $2 AND ${where.sql}`, { bind: [timeZone, id, ...where.bind], type: QueryTypes.SELECT });
  if (!row) throw new AppError('not_found', 'There is no such invoice.');
  const h = head(row);
  const balance = await balanceIn(h.id, h.grossMinor);
  const [payments, creditNotes, summary] = await Promise.all([
    sequelize.query<InvoiceView['payments'][number] & { amountMinor: string }>(
      `SELECT id, amount_minor AS "amountMinor", method, to_char(paid_on, 'YYYY-MM-DD') AS "paidOn", note, provider_ref AS "providerRef"
         FROM invoice_payments WHERE invoice_id = $1 ORDER BY paid_on, id`,
      { bind: [h.id], type: QueryTypes.SELECT },
    ),
    sequelize.query<InvoiceView['creditNotes'][number] & { grossMinor: string }>(
      `SELECT id, number, gross_minor AS "grossMinor", reason, to_char(issued_at AT TIME ZONE $2, 'YYYY-MM-DD') AS "issuedOn"
         FROM invoices WHERE corrects_invoice_id = $1 ORDER BY id`,
      { bind: [h.id, timeZone], type: QueryTypes.SELECT },
    ),
    sequelize.query<{ kind: LineKind; lines: number; amountMinor: string }>(
      `SELECT kind, count(*)::int AS lines, sum(amount_minor)::text AS "amountMinor" FROM statement_lines WHERE statement_id = $1 GROUP BY kind ORDER BY min(position)`,
      { bind: [h.statementId ?? 0], type: QueryTypes.SELECT },
    ),
  ]);
  const today = localDate(new Date(), timeZone);
  return {
    ...h,
    balance,
    state: stateOf(h, balance, today),
    payments: payments.map((p) => ({ ...p, amountMinor: Number(p.amountMinor) })),
    creditNotes: creditNotes.map((c) => ({ ...c, grossMinor: Number(c.grossMinor) })),
    summary: summary.map((k) => ({ ...k, amountMinor: Number(k.amountMinor) })),
  };
}

export interface InvoiceListRow extends InvoiceHead {
  balance: Balance;
  state: InvoiceState;
}

/** Invoices and credit notes, newest first, with what is outstanding on each invoice (one query). */
export async function listInvoices(scope: StatementScope, filter: { customerId?: number; statementId?: number } = {}): Promise<InvoiceListRow[]> {
  const { timeZone } = await getSettings();
  const where = customerScopeSql(scope, 'i.customer_id', 2);
  const bind: unknown[] = [timeZone, ...where.bind];
  const extra: string[] = [];
  if (filter.customerId !== undefined) extra.push(`i.customer_id = $${bind.push(filter.customerId)}`);
  if (filter.statementId !== undefined) extra.push(`i.statement_id = $${bind.push(filter.statementId)}`);
  const rows = await sequelize.query<HeadRow & { credited: string; paid: string }>(
    `SELECT h.*, (SELECT coalesce(sum(gross_minor), 0) FROM invoices x WHERE x.corrects_invoice_id = h.id)::text AS credited,
            (SELECT coalesce(sum(amount_minor), 0) FROM invoice_payments p WHERE p.invoice_id = h.id)::text AS paid
       FROM (${HEAD_SQL} WHERE ${[where.sql, ...extra].join(' AND ')}) h ORDER BY h."issuedAt" DESC, h.id DESC LIMIT 500`,
    { bind, type: QueryTypes.SELECT },
  );
  const today = localDate(new Date(), timeZone);
  return rows.map((r) => {
    const h = head(r);
    const balance = balanceOf({ grossMinor: h.grossMinor, credits: [Number(r.credited)], payments: [Number(r.paid)] });
    return { ...h, balance, state: stateOf(h, balance, today) };
  });
}

/** The address billing mail goes to: the customer's contact address (and its name for the greeting). */
export async function customerContact(customerId: number): Promise<{ name: string; email: string | null }> {
  const [row] = await sequelize.query<{ name: string; email: string | null }>(`SELECT name, contact_email AS email FROM organisations WHERE id = $1`, {
    bind: [customerId],
    type: QueryTypes.SELECT,
  });
  return row ?? { name: '', email: null };
}

/**
 * An issued statement becomes an invoice (once): the next number of the year's series, due after the payment
 * terms, the statement's totals. A statement that comes to nothing or to a credit is not invoiced.
 */
export async function issueInvoice(
  statementId: number,
  actor: AuditActor,
  opts: { now?: Date; mail?: boolean; transaction?: Transaction } = {},
): Promise<{ id: number; number: string }> {
  const settings = await getSettings();
  const now = opts.now ?? new Date();
  const created = await inTransaction(opts.transaction, async (transaction) => {
    const [s] = await sequelize.query<{ id: number; customer_id: number; currency: string; net_minor: string; tax_minor: string; gross_minor: string }>(
      `SELECT id, customer_id, currency, net_minor, tax_minor, gross_minor FROM statements WHERE id = $1 FOR UPDATE`,
      { bind: [statementId], type: QueryTypes.SELECT, transaction },
    );
    if (!s) throw new AppError('not_found', 'There is no such statement.');
    const [already] = await sequelize.query<{ number: string }>(`SELECT number FROM invoices WHERE statement_id = $1`, {
      bind: [statementId],
      type: QueryTypes.SELECT,
      transaction,
    });
    if (already) throw new AppError('duplicate', `This statement is invoiced already (${already.number}).`);
    if (Number(s.gross_minor) <= 0)
      throw new AppError('unprocessable', 'This statement comes to nothing or to a credit: there is nothing to invoice. Correct an earlier invoice with a credit note instead.');
    const taken = await takeDocumentNumber(transaction, 'invoice', numberingYear(now, settings.timeZone));
    const [row] = await sequelize.query<{ id: number }>(
      `INSERT INTO invoices (series, number, customer_id, statement_id, currency, net_minor, tax_minor, gross_minor, issued_at, due_on, issued_by)
       VALUES ('invoice', $1, $2, $3, $4, $5, $6, $7, $8, $9, $10) RETURNING id`,
      {
        bind: [taken.number, s.customer_id, s.id, s.currency, s.net_minor, s.tax_minor, s.gross_minor, now, dueOn(localDate(now, settings.timeZone)), actor.userId],
        type: QueryTypes.SELECT,
        transaction,
      },
    );
    await recordAudit(
      { actor, action: 'invoice.issue', entityType: 'invoice', entityId: row!.id, after: { number: taken.number, statementId, grossMinor: Number(s.gross_minor) } },
      { transaction },
    );
    return { id: row!.id, number: taken.number, customerId: s.customer_id, grossMinor: Number(s.gross_minor), currency: s.currency };
  });
  if (opts.mail !== false) await mailInvoiceIssued(created.id);
  return { id: created.id, number: created.number };
}

async function mailInvoiceIssued(invoiceId: number): Promise<void> {
  const settings = await getSettings();
  const inv = await invoiceView(invoiceId, { kind: 'operator' });
  const to = await customerContact(inv.customerId);
  if (!to.email) return;
  const content = invoiceIssuedMail({
    customer: to.name,
    operatorName: settings.operatorName,
    number: inv.number,
    amount: formatMoney(inv.grossMinor, inv.currency),
    dueOn: inv.dueOn!,
    link: `${appUrl()}/portal/invoices/${inv.id}`,
  });
  await sendMail({ to: to.email, kind: 'invoice_issued', ...content });
}

/** Lock an invoice (not a credit note) of the scope for a change; "no such invoice" alike for any other. */
async function lockInvoice(id: number, transaction: Transaction) {
  const [inv] = await sequelize.query<{ id: number; series: string; number: string; customer_id: number; statement_id: number | null; currency: string; gross_minor: string }>(
    `SELECT id, series, number, customer_id, statement_id, currency, gross_minor FROM invoices WHERE id = $1 FOR UPDATE`,
    { bind: [id], type: QueryTypes.SELECT, transaction },
  );
  if (!inv || inv.series !== 'invoice') throw new AppError('not_found', 'There is no such invoice.');
  return { ...inv, grossMinor: Number(inv.gross_minor) };
}

/** A credit note against an invoice: the next number of its own series, the invoice's tax treatment. */
export async function issueCreditNote(invoiceId: number, input: { netMinor: number; reason: string }, actor: AuditActor): Promise<{ id: number; number: string }> {
  const settings = await getSettings();
  const now = new Date();
  return sequelize.transaction(async (transaction) => {
    const inv = await lockInvoice(invoiceId, transaction);
    const tax = await taxOfStatement(inv.statement_id!, transaction);
    const balance = await balanceIn(inv.id, inv.grossMinor, transaction);
    const problem = creditProblem(input.netMinor, input.reason, balance, tax);
    if (problem) throw new AppError('unprocessable', problem);
    const amounts = creditAmounts(input.netMinor, tax);
    const taken = await takeDocumentNumber(transaction, 'credit_note', numberingYear(now, settings.timeZone));
    const [row] = await sequelize.query<{ id: number }>(
      `INSERT INTO invoices (series, number, customer_id, corrects_invoice_id, currency, net_minor, tax_minor, gross_minor, reason, issued_at, issued_by)
       VALUES ('credit_note', $1, $2, $3, $4, $5, $6, $7, $8, $9, $10) RETURNING id`,
      {
        bind: [taken.number, inv.customer_id, inv.id, inv.currency, amounts.netMinor, amounts.taxMinor, amounts.grossMinor, input.reason.trim(), now, actor.userId],
        type: QueryTypes.SELECT,
        transaction,
      },
    );
    await recordAudit(
      {
        actor,
        action: 'credit_note.issue',
        entityType: 'invoice',
        entityId: row!.id,
        after: { number: taken.number, corrects: inv.number, grossMinor: amounts.grossMinor, reason: input.reason.trim() },
      },
      { transaction },
    );
    return { id: row!.id, number: taken.number };
  });
}

export interface PaymentInput {
  amountMinor: number;
  method: 'card' | 'bank_transfer';
  paidOn: LocalDate;
  note?: string | null;
  /** The provider's id for the payment: a second event with it records nothing. */
  providerRef?: string | null;
}

/**
 * A payment on an invoice, never more than is outstanding. With a provider reference already recorded, nothing
 * happens (a replayed event) and the earlier payment is answered.
 */
export async function recordPayment(
  invoiceId: number,
  input: PaymentInput,
  actor: AuditActor,
  opts: { mail?: boolean; transaction?: Transaction } = {},
): Promise<{ id: number; replay: boolean }> {
  const out = await inTransaction(opts.transaction, async (transaction) => {
    const inv = await lockInvoice(invoiceId, transaction);
    if (input.providerRef) {
      const [seen] = await sequelize.query<{ id: number }>(`SELECT id FROM invoice_payments WHERE provider_ref = $1`, {
        bind: [input.providerRef],
        type: QueryTypes.SELECT,
        transaction,
      });
      if (seen) return { id: seen.id, replay: true, invoice: inv };
    }
    const balance = await balanceIn(inv.id, inv.grossMinor, transaction);
    const problem = paymentProblem(input.amountMinor, balance, inv.currency);
    if (problem) throw new AppError('unprocessable', problem);
    const [row] = await sequelize.query<{ id: number }>(
      `INSERT INTO invoice_payments (invoice_id, amount_minor, method, provider_ref, paid_on, note, recorded_by) VALUES ($1, $2, $3, $4, $5, $6, $7) RETURNING id`,
      { bind: [inv.id, input.amountMinor, input.method, input.providerRef ?? null, input.paidOn, input.note?.trim() || null, actor.userId], type: QueryTypes.SELECT, transaction },
    );
    await recordAudit(
      {
        actor,
        action: 'payment.record',
        entityType: 'invoice',
        entityId: inv.id,
        after: { payment: row!.id, amountMinor: input.amountMinor, method: input.method, providerRef: input.providerRef ?? null },
      },
      { transaction },
    );
    return { id: row!.id, replay: false, invoice: inv };
  });
  if (!out.replay && opts.mail !== false) await mailPaymentReceived(invoiceId, input.amountMinor);
  return { id: out.id, replay: out.replay };
}

/** The customer's receipt for a payment (bank transfer or online), with what is still open. */
export async function mailPaymentReceived(invoiceId: number, amountMinor: number): Promise<void> {
  const settings = await getSettings();
  const inv = await invoiceView(invoiceId, { kind: 'operator' });
  const to = await customerContact(inv.customerId);
  if (!to.email) return;
  const content = paymentReceivedMail({
    customer: to.name,
    operatorName: settings.operatorName,
    number: inv.number,
    amount: formatMoney(amountMinor, inv.currency),
    outstanding: inv.balance.outstandingMinor > 0 ? formatMoney(inv.balance.outstandingMinor, inv.currency) : null,
    link: `${appUrl()}/portal/invoices/${inv.id}`,
  });
  await sendMail({ to: to.email, kind: 'payment_received', ...content });
}

/** An amount as the admin or the customer typed it ("250.00"), in the invoice's currency's minor units. */
export function typedAmount(amount: string, currency: string): number {
  const minor = decimalToMinorUnits(amount, minorDigits(currency));
  if (minor === null) throw new AppError('validation_failed', `Give the amount in ${currency} with at most ${minorDigits(currency)} decimals.`);
  return minor;
}

async function minorOf(invoiceId: number, amount: string): Promise<number> {
  const [row] = await sequelize.query<{ currency: string }>(`SELECT currency FROM invoices WHERE id = $1`, { bind: [invoiceId], type: QueryTypes.SELECT });
  if (!row) throw new AppError('not_found', 'There is no such invoice.');
  return typedAmount(amount, row.currency);
}

/** The admin's form: a bank transfer as typed ("250.00" on a day). */
export async function recordBankTransfer(invoiceId: number, body: PaymentBody, actor: AuditActor): Promise<{ id: number; replay: boolean }> {
  const { timeZone } = await getSettings();
  if (body.paidOn > localDate(new Date(), timeZone)) throw new AppError('validation_failed', 'A payment cannot be received in the future.');
  return recordPayment(
    invoiceId,
    { amountMinor: await minorOf(invoiceId, body.amount), method: 'bank_transfer', paidOn: body.paidOn as LocalDate, note: body.note ?? null },
    actor,
  );
}

/** The admin's form: a credit note as typed (the net amount and why). */
export async function creditInvoice(invoiceId: number, body: CreditNoteBody, actor: AuditActor): Promise<{ id: number; number: string }> {
  return issueCreditNote(invoiceId, { netMinor: await minorOf(invoiceId, body.amount), reason: body.reason }, actor);
}
