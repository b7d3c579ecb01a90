/**
 * Invoice and credit-note numbers: one gap-free series per kind and calendar year (in the operator's time zone).
 * Gap-free numbering of invoices is a common legal requirement in the EU (sequential numbering, VAT Directive
 * 2006/112/EC Art. 226(2) — from memory); separate series per year and per document kind are common practice.
 *
 *   DOCUMENT_SERIES                        → the series and their prefixes
 *   formatDocumentNumber(series, year, n)  → 'INV-2027-00042' / 'CRN-2027-00003'
 *   parseDocumentNumber(text)              → { series, year, sequence } or null
 *   numberingYear(issuedAt, timeZone)      → the year whose series a document issued at that instant joins
 *   firstGap(sequences)                    → the first missing number of a series (null when 1..n are all there)
 *
 * The number itself is taken by `takeDocumentNumber` (document-number.server.ts) from a counter row locked in
 * the issuing transaction, so a rolled-back issue gives its number back and concurrent issues queue.
 */
import { localDate, type LocalDate } from '@/lib/calendar';

export type DocumentSeries = 'invoice' | 'credit_note';

export const DOCUMENT_SERIES: Readonly<Record<DocumentSeries, { prefix: string; label: string }>> = Object.freeze({
  invoice: { prefix: 'INV', label: 'Invoice' },
  credit_note: { prefix: 'CRN', label: 'Credit note' },
});

/** Sequences are padded to this many digits and simply grow longer beyond 99 999. */
const SEQUENCE_DIGITS = 5;

const NUMBER_PATTERN = /^([A-Z]{3})-(\d{4})-(\d{5,})$/;

function requireSeries(series: string): asserts series is DocumentSeries {
  if (!Object.hasOwn(DOCUMENT_SERIES, series)) throw new RangeError(`Unknown document series: ${JSON.stringify(series)}`);
}

export function formatDocumentNumber(series: DocumentSeries, year: number, sequence: number): string {
  requireSeries(series);
  if (!Number.isInteger(year) || year < 2000 || year > 9999) throw new RangeError(`Year must be 2000–9999, got ${year}`);
  if (!Number.isSafeInteger(sequence) || sequence < 1) throw new RangeError(`Sequence must be a whole number ≥ 1, got ${sequence}`);
  return `${DOCUMENT_SERIES[series].prefix}-${year}-${String(sequence).padStart(SEQUENCE_DIGITS, '0')}`;
}

export function parseDocumentNumber(text: string): { series: DocumentSeries; year: number; sequence: number } | null {
  const match = NUMBER_PATTERN.exec(typeof text === 'string' ? text.trim() : '');
  if (!match) return null;
  const series = (Object.keys(DOCUMENT_SERIES) as DocumentSeries[]).find((s) => DOCUMENT_SERIES[s].prefix === match[1]);
  const sequence = Number(match[3]);
  // Only the canonical spelling parses: 'INV-2027-000042' (extra zero) is not the same document as '…-00042'.
  if (!series || sequence < 1 || !Number.isSafeInteger(sequence)) return null;
  if (formatDocumentNumber(series, Number(match[2]), sequence) !== match[0]) return null;
  return { series, year: Number(match[2]), sequence };
}

/** The operator's local year at the moment of issue: 31 Dec 23:30 UTC is already next year in Berlin. */
export function numberingYear(issuedAt: Date | string, timeZone: string): number {
  const date: LocalDate = localDate(issuedAt, timeZone);
  return Number(date.slice(0, 4));
}

/** The smallest number missing from 1..max of a series, or null when none is missing (duplicates are an error). */
export function firstGap(sequences: number[]): number | null {
  const seen = new Set<number>();
  for (const n of sequences) {
    if (!Number.isSafeInteger(n) || n < 1) throw new RangeError(`Not a sequence number: ${n}`);
    if (seen.has(n)) throw new RangeError(`Sequence number ${n} was issued twice`);
    seen.add(n);
  }
  for (let n = 1; n <= seen.size; n++) if (!seen.has(n)) return n;
  return null;
}
