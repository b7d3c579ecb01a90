/**
 * Which bins a label run prints, as read from a query string or a form:
 * a range of serials or GRAIs, a filter (site, status, bin type, never
 * printed), an explicit list of bin ids (`ids=1-26,30`) or a pasted list of
 * GRAIs. Every input is checked here with zod and turned into a clear
 * message; the server module (src/lib/labels/label-run.server.ts) runs the query.
 *
 * Pure: no I/O, no framework.
 */
import { z } from 'zod';
import { multilineText } from '@/lib/text-input';
import { isGs1Cs82Char, parseGrai } from '@/lib/gs1';
import { STATUSES, type Status } from '@/lib/scans/lifecycle';
import { DEFAULT_LABEL_STOCK, LABEL_STOCKS, LABEL_STOCK_IDS, labelsPerSheet, type LabelStockId } from './label-stock';

/** One sheet run prints at most this many labels (a long run is split by the user). */
export const MAX_LABELS_PER_RUN = 1200;
/** Longest pasted list accepted, in characters (1,200 Digital Links with room to spare). */
const MAX_PASTE_CHARS = 200_000;

export const STATUS_FILTERS = ['in_service', 'any', ...STATUSES] as const;
export type StatusFilter = (typeof STATUS_FILTERS)[number];

export type LabelSelection =
  | { by: 'range'; from: string; to: string }
  | { by: 'filter'; siteId: number | null; status: StatusFilter; binTypeId: number | null; neverPrinted: boolean }
  | { by: 'ids'; ids: number[] }
  | { by: 'list'; entries: string[] };

export interface SheetOptions {
  stock: LabelStockId;
  /** 1-based label position on the first sheet to print on (part-used sheets). */
  startAt: number;
}

export interface LabelQuery {
  /** null when the query names no bins yet (the form's first visit). */
  selection: LabelSelection | null;
  options: SheetOptions;
}

export interface InputIssue {
  field: string;
  message: string;
}

export type LabelQueryResult = { ok: true; query: LabelQuery } | { ok: false; issues: InputIssue[] };

const count = (n: number) => n.toLocaleString('en-GB');

// ---------------------------------------------------------------------------------------------------
// Compact id lists: `1-26,30,31` (order kept, so a list in label order stays in label order).

export type IdListResult = { ok: true; ids: number[] } | { ok: false; message: string };

/** Reads `3,1,7-9` into [3, 1, 7, 8, 9]; duplicates dropped (first one kept); at most `max` ids. */
export function parseIdList(text: string, max = MAX_LABELS_PER_RUN): IdListResult {
  const parts = text.split(/[\s,]+/).filter((p) => p !== '');
  if (parts.length === 0) return { ok: false, message: 'The list of bin ids is empty.' };
  const pieces: Array<[number, number]> = [];
  let total = 0;
  for (const part of parts) {
    const m = /^(\d{1,9})(?:-(\d{1,9}))?$/.exec(part);
    if (!m) return { ok: false, message: `“${part.slice(0, 40)}” is not a bin id or a range of ids like 12-40.` };
    const a = Number(m[1]);
    const b = m[2] === undefined ? a : Number(m[2]);
    if (a < 1 || b < 1) return { ok: false, message: 'Bin ids start at 1.' };
    if (b < a) return { ok: false, message: `The id range ${part} runs backwards; write it as ${b}-${a}.` };
    // Count before expanding, so `1-999999999` is refused without building it.
    total += b - a + 1;
    if (total > max) return { ok: false, message: `A sheet run holds at most ${count(max)} labels; this list names more bins than that. Split it into smaller runs.` };
    pieces.push([a, b]);
  }
  const seen = new Set<number>();
  const ids: number[] = [];
  for (const [a, b] of pieces) {
    for (let id = a; id <= b; id++) {
      if (!seen.has(id)) {
        seen.add(id);
        ids.push(id);
      }
    }
  }
  return { ok: true, ids };
}

/** Writes ids compactly, keeping their order: runs of three or more consecutive ids become `a-b`. */
export function formatIdList(ids: readonly number[]): string {
  const out: string[] = [];
  let i = 0;
  while (i < ids.length) {
    let j = i;
    while (j + 1 < ids.length && ids[j + 1] === (ids[j] ?? 0) + 1) j++;
    if (j - i >= 2) out.push(`${ids[i]}-${ids[j]}`);
    else for (let k = i; k <= j; k++) out.push(String(ids[k]));
    i = j + 1;
  }
  return out.join(',');
}

// ---------------------------------------------------------------------------------------------------
// Pasted lists.

/**
 * Splits a pasted list into entries: one per line, or separated by commas,
 * semicolons or tabs (spreadsheet cells). Spaces stay inside an entry, since
 * a GRAI copied from a label is written in groups.
 */
export function splitPastedList(text: string): string[] {
  return text
    .split(/[\r\n,;\t]+/)
    .map((s) => s.trim())
    .filter((s) => s !== '');
}

// ---------------------------------------------------------------------------------------------------
// Ranges.

export interface SerialRange {
  /** When a GRAI was given: the 14 fixed digits (filler, prefix, asset type, check digit) every bin must share. */
  fixedPart: string | null;
  low: string;
  high: string;
  /** Both ends are digits only: compare as numbers (so 99 < 100), and only digit-only serials match. */
  numeric: boolean;
  /** The ends were given high to low and were swapped. */
  swapped: boolean;
}

type RangeEnd = { fixedPart: string | null; serial: string };

function readRangeEnd(text: string, prefixLength: number): RangeEnd | { error: string } {
  const t = text.trim();
  if (t === '') return { error: 'empty' };
  const grai = parseGrai(t, { companyPrefixLength: prefixLength });
  if (grai.ok) {
    if (grai.grai.serial === '') return { error: `${t} is a GRAI without serial: it names a bin type, not a bin.` };
    return { fixedPart: grai.grai.value.slice(0, 14), serial: grai.grai.serial };
  }
  // Fourteen or more digits from a 0, or a link or an AI: meant as a GRAI, so its fault is the answer
  // (a mistyped check digit must not quietly turn it into a serial that matches nothing).
  if (/^(0[\d\s.\u00B7-]{13}|\(?8003\)?|https?:|urn:)/i.test(t)) return { error: grai.error.message };
  const chars = Array.from(t);
  if (chars.length <= 16 && chars.every(isGs1Cs82Char)) return { fixedPart: null, serial: t };
  return { error: `“${t.slice(0, 60)}” is neither a bin serial nor a GRAI (${grai.error.message}).` };
}

function compareSerials(a: string, b: string, numeric: boolean): number {
  if (numeric) {
    const x = BigInt(a);
    const y = BigInt(b);
    return x < y ? -1 : x > y ? 1 : 0;
  }
  // Code-unit order, the same as PostgreSQL's "C" collation used by the query.
  return a < b ? -1 : a > b ? 1 : 0;
}

/** Reads the two ends of a range (each a serial or a GRAI in any written form). */
export function resolveRange(from: string, to: string, prefixLength: number): { ok: true; range: SerialRange } | { ok: false; issues: InputIssue[] } {
  const ends = { from: readRangeEnd(from, prefixLength), to: readRangeEnd(to, prefixLength) };
  const issues: InputIssue[] = [];
  for (const key of ['from', 'to'] as const) {
    const end = ends[key];
    if ('error' in end) {
      issues.push({ field: key, message: end.error === 'empty' ? `Give the ${key === 'from' ? 'first' : 'last'} serial or GRAI of the range.` : end.error });
    }
  }
  if ('error' in ends.from || 'error' in ends.to) return { ok: false, issues };
  const a = ends.from;
  const b = ends.to;
  if (a.fixedPart && b.fixedPart && a.fixedPart !== b.fixedPart) {
    return {
      ok: false,
      issues: [{ field: 'to', message: 'Both ends of a GRAI range must share company prefix and asset type; give serials instead to span bin types.' }],
    };
  }
  const numeric = /^\d+$/.test(a.serial) && /^\d+$/.test(b.serial);
  const swapped = compareSerials(a.serial, b.serial, numeric) > 0;
  return {
    ok: true,
    range: {
      fixedPart: a.fixedPart ?? b.fixedPart,
      low: swapped ? b.serial : a.serial,
      high: swapped ? a.serial : b.serial,
      numeric,
      swapped,
    },
  };
}

// ---------------------------------------------------------------------------------------------------
// The query string / form.

/** Empty form fields mean "not given". */
const blank = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);
const optionalId = (what: string) =>
  z.preprocess(
    blank,
    z.coerce
      .number({ invalid_type_error: `Choose a ${what} from the list.` })
      .int(`Choose a ${what} from the list.`)
      .positive(`Choose a ${what} from the list.`)
      .max(2_147_483_647, `Choose a ${what} from the list.`)
      .optional(),
  );
const text = (max: number, what: string) => multilineText().max(max, `The ${what} is too long (at most ${count(max)} characters).`);

const querySchema = z
  .object({
    by: z.preprocess(
      blank,
      z.enum(['range', 'filter', 'ids', 'list'], { errorMap: () => ({ message: 'Choose how to pick bins: range, filter, id list or pasted list.' }) }).optional(),
    ),
    from: text(300, 'start of the range').optional(),
    to: text(300, 'end of the range').optional(),
    site: optionalId('site'),
    type: optionalId('bin type'),
    status: z.preprocess(blank, z.enum(STATUS_FILTERS, { errorMap: () => ({ message: 'Choose a status from the list.' }) }).optional()),
    unprinted: z.preprocess(blank, z.enum(['1', 'on', 'true', '0', 'false'], { errorMap: () => ({ message: '“Never printed” is on or off.' }) }).optional()),
    ids: text(20_000, 'list of bin ids').optional(),
    grais: text(MAX_PASTE_CHARS, 'pasted list').optional(),
    stock: z.preprocess(blank, z.enum(LABEL_STOCK_IDS as [LabelStockId, ...LabelStockId[]], { errorMap: () => ({ message: 'Choose a label stock from the list.' }) }).optional()),
    start: z.preprocess(blank, z.coerce.number({ invalid_type_error: 'Start at label: give a number.' }).int('Start at label: give a whole number.').optional()),
  })
  .passthrough();

function issuesOf(err: z.ZodError): InputIssue[] {
  return err.issues.map((i) => ({ field: i.path.join('.') || 'query', message: i.message }));
}

/**
 * Reads the label query (from a URL's search params or a posted form).
 * Unknown keys are ignored; every known key is checked.
 */
export function parseLabelQuery(input: Record<string, string | undefined>): LabelQueryResult {
  const parsed = querySchema.safeParse(input);
  if (!parsed.success) return { ok: false, issues: issuesOf(parsed.error) };
  const q = parsed.data;
  const issues: InputIssue[] = [];

  const stock = q.stock ?? DEFAULT_LABEL_STOCK;
  const perSheet = labelsPerSheet(LABEL_STOCKS[stock]);
  const startAt = q.start ?? 1;
  if (startAt < 1 || startAt > perSheet) {
    issues.push({ field: 'start', message: `Start at label: a ${LABEL_STOCKS[stock].name} sheet has labels 1 to ${perSheet}.` });
  }

  const by = q.by ?? (q.ids !== undefined ? 'ids' : undefined);
  let selection: LabelSelection | null = null;
  if (by === 'range') {
    const from = q.from?.trim() ?? '';
    const to = q.to?.trim() ?? '';
    if (from === '') issues.push({ field: 'from', message: 'Give the first serial or GRAI of the range.' });
    if (to === '') issues.push({ field: 'to', message: 'Give the last serial or GRAI of the range.' });
    selection = { by, from, to };
  } else if (by === 'filter') {
    selection = {
      by,
      siteId: q.site ?? null,
      status: q.status ?? 'in_service',
      binTypeId: q.type ?? null,
      neverPrinted: q.unprinted === '1' || q.unprinted === 'on' || q.unprinted === 'true',
    };
  } else if (by === 'ids') {
    const ids = parseIdList(q.ids ?? '');
    if (!ids.ok) issues.push({ field: 'ids', message: ids.message });
    else selection = { by, ids: ids.ids };
  } else if (by === 'list') {
    const entries = splitPastedList(q.grais ?? '');
    if (entries.length === 0) issues.push({ field: 'grais', message: 'Paste at least one GRAI or label link, one per line.' });
    else if (entries.length > MAX_LABELS_PER_RUN) {
      issues.push({
        field: 'grais',
        message: `A sheet run holds at most ${count(MAX_LABELS_PER_RUN)} labels; the pasted list has ${count(entries.length)} entries. Split it into smaller runs.`,
      });
    } else selection = { by, entries };
  }
  if (issues.length) return { ok: false, issues };
  return { ok: true, query: { selection, options: { stock, startAt } } };
}

/**
 * The query string that names a selection and its sheet options, for links
 * between the form and the sheet. A pasted list is not carried as text: the
 * server resolves it to ids first.
 */
export function labelQueryString(selection: Exclude<LabelSelection, { by: 'list' }>, options: SheetOptions): string {
  const p = new URLSearchParams();
  p.set('by', selection.by);
  if (selection.by === 'range') {
    p.set('from', selection.from);
    p.set('to', selection.to);
  } else if (selection.by === 'filter') {
    if (selection.siteId !== null) p.set('site', String(selection.siteId));
    p.set('status', selection.status);
    if (selection.binTypeId !== null) p.set('type', String(selection.binTypeId));
    if (selection.neverPrinted) p.set('unprinted', '1');
  } else {
    p.set('ids', formatIdList(selection.ids));
  }
  p.set('stock', options.stock);
  p.set('start', String(options.startAt));
  return p.toString();
}

/** Statuses a filter admits: "in service" leaves retired bins out; "any" takes all. */
export function statusesFor(filter: StatusFilter): readonly Status[] | null {
  if (filter === 'any') return null;
  if (filter === 'in_service') return STATUSES.filter((s) => s !== 'retired');
  return [filter];
}
