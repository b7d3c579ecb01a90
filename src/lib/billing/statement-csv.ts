/**
 * The two CSV layouts of billing, written once here (pure) and documented in this folder's README:
 *
 *   statementLinesCsv(statement)  → one row per line, for a customer to check against their own records
 *   accountingCsv(statements)     → one row per statement, for the operator's bookkeeping
 *
 * Amounts are numbers in the currency's main unit with a dot ("12.50", "-7.50"), never formatted text, so a
 * spreadsheet sums them; the currency is its own column.
 */
import { csvTable } from '@/lib/csv';
import type { BillingPeriod, LineKind, StatementLine } from './hire-billing';
import { minorDigits, minorUnitsToDecimal } from './money';

/** 1250 EUR → "12.50"; -750 → "-7.50"; 5 JPY → "5". */
export function minorToDecimal(minor: number, currency: string): string {
  return minorUnitsToDecimal(minor, minorDigits(currency));
}

export const LINE_KIND_LABEL: Readonly<Record<LineKind, string>> = Object.freeze({
  free_days: 'Free days',
  hire: 'Hire days',
  trip_fee: 'Trip fee',
  liners: 'Liners',
  transport: 'Collection stop',
  damage: 'Damage charge-back',
  lost_bin: 'Lost-bin fee',
  lost_bin_credit: 'Lost-bin credit',
  adjustment: 'Correction',
});

export const STATEMENT_LINE_FIELDS = [
  'statement',
  'line',
  'kind',
  'bin',
  'trip',
  'reference',
  'from',
  'to',
  'trip_day_first',
  'trip_day_last',
  'quantity',
  'unit_price',
  'amount',
  'currency',
  'estimated',
  'text',
] as const;

export interface CsvStatement {
  id: number;
  currency: string;
  lines: Array<StatementLine & { position: number }>;
}

export function statementLinesCsv(s: CsvStatement): string {
  return csvTable(
    STATEMENT_LINE_FIELDS,
    s.lines.map((l) => [
      s.id,
      l.position,
      l.kind,
      l.binId,
      l.tripId,
      l.reference,
      l.from,
      l.to,
      l.tripDays?.first ?? null,
      l.tripDays?.last ?? null,
      l.quantity,
      minorToDecimal(l.unitMinor, s.currency),
      minorToDecimal(l.amountMinor, s.currency),
      s.currency,
      l.estimated,
      l.text,
    ]),
  );
}

export const ACCOUNTING_FIELDS = [
  'statement',
  'customer_id',
  'customer',
  'period_from',
  'period_to',
  'net',
  'tax',
  'gross',
  'currency',
  'tax_note',
  'customer_vat_id',
  'issued_on',
] as const;

/** What an issued statement is, in one line: the bookkeeping row and the head of every statement view. */
export interface StatementSummary {
  id: number;
  customerId: number;
  customer: string;
  period: BillingPeriod;
  currency: string;
  netMinor: number;
  taxMinor: number;
  grossMinor: number;
  taxNote: string;
  customerVatId: string | null;
}

export interface AccountingRow extends StatementSummary {
  /** The local date the statement was issued on. */
  issuedOn: string;
}

export function accountingCsv(rows: readonly AccountingRow[]): string {
  return csvTable(
    ACCOUNTING_FIELDS,
    rows.map((r) => [
      r.id,
      r.customerId,
      r.customer,
      r.period.from,
      r.period.to,
      minorToDecimal(r.netMinor, r.currency),
      minorToDecimal(r.taxMinor, r.currency),
      minorToDecimal(r.grossMinor, r.currency),
      r.currency,
      r.taxNote,
      r.customerVatId,
      r.issuedOn,
    ]),
  );
}
