// The planner's queue of flagged scans: which flags there are and how they read, the queue's filters (depot, kind
// of flag, age) from the query string, and the body of a bulk decision (confirm or void many at once; each scan is
// still recorded on its own). Pure.
import { z } from 'zod';
import { text } from '@/lib/text-input';

/** Why a scan waits for a planner, in words. */
export const FLAG_KINDS = {
  inferred_steps: 'missed steps inferred',
  seal_mismatch: 'seal numbers did not match',
  inspection_lapsed: 'left after its test lapsed',
  fit_from_stopped_lot: 'liner fitted offline from a lot already on hold or recalled',
} as const;
export type FlagKind = keyof typeof FLAG_KINDS;

export const flagWords = (flag: string): string => FLAG_KINDS[flag as FlagKind] ?? flag;

/** How old a flagged scan is, by whole days since it happened: [at least, less than) days. */
export const AGE_BANDS = {
  today: { label: 'Less than a day', fromDays: 0, toDays: 1 },
  week: { label: '1 to 7 days', fromDays: 1, toDays: 7 },
  month: { label: '7 to 30 days', fromDays: 7, toDays: 30 },
  older: { label: '30 days or more', fromDays: 30, toDays: null },
} as const;
export type AgeBand = keyof typeof AGE_BANDS;

export const FLAGS_PER_PAGE = 50;

export interface FlagFilter {
  depotId: number | null;
  kind: FlagKind | null;
  age: AgeBand | null;
  page: number;
}

const isKey = <T extends object>(o: T, k: string | null): k is Extract<keyof T, string> => k !== null && Object.hasOwn(o, k);

/**
 * The queue's filters from the address (`?depot=3&kind=seal_mismatch&age=week&page=2`). Anything unknown is
 * dropped rather than refused: the page then shows the whole queue, which is what a stale link should do.
 */
export function parseFlagFilter(params: URLSearchParams): FlagFilter {
  const whole = (v: string | null) => (v && /^\d{1,9}$/.test(v) ? Number(v) : null);
  const kind = params.get('kind');
  const age = params.get('age');
  const depot = whole(params.get('depot'));
  return {
    depotId: depot && depot > 0 ? depot : null,
    kind: isKey(FLAG_KINDS, kind) ? kind : null,
    age: isKey(AGE_BANDS, age) ? age : null,
    page: Math.max(1, whole(params.get('page')) ?? 1),
  };
}

/** The instants an age band covers, counted back from `now`: occurred in (before, notBefore]. */
export function ageWindow(age: AgeBand, now: Date): { notBefore: Date | null; before: Date } {
  const band = AGE_BANDS[age];
  const day = 86_400_000;
  return {
    before: new Date(now.getTime() - band.fromDays * day),
    notBefore: band.toDays === null ? null : new Date(now.getTime() - band.toDays * day),
  };
}

export const MAX_BULK_REVIEW = FLAGS_PER_PAGE;

/** Confirm or void the scans ticked on the page; a void needs its reason (the same reason for each). */
export const bulkReview = z
  .object({
    ids: z
      .array(z.number().int().positive(), { invalid_type_error: 'Tick the scans to decide on.' })
      .min(1, 'Tick at least one scan.')
      .max(MAX_BULK_REVIEW, `At most ${MAX_BULK_REVIEW} scans at once (one page).`)
      .refine((ids) => new Set(ids).size === ids.length, 'A scan is ticked twice.'),
    decision: z.enum(['confirm', 'void'], { errorMap: () => ({ message: 'Choose confirm or void.' }) }),
    reason: text().trim().max(500, 'At most 500 characters.').optional(),
  })
  .strict()
  .superRefine((v, ctx) => {
    if (v.decision === 'void' && (v.reason ?? '').length < 3) {
      ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['reason'], message: 'Say why these scans are wrong (at least 3 characters); it is kept with each.' });
    }
  });
export type BulkReview = z.output<typeof bulkReview>;

export interface BulkOutcome {
  id: number;
  ok: boolean;
  /** The refusal's words for a scan that could not be decided (already reviewed, voided meanwhile …). */
  message?: string;
}

/** One line for the planner after a bulk decision. */
export function bulkSummary(decision: BulkReview['decision'], outcomes: readonly BulkOutcome[]): string {
  const done = outcomes.filter((o) => o.ok).length;
  const refused = outcomes.length - done;
  const verb = decision === 'confirm' ? 'confirmed' : 'voided';
  const scans = (n: number) => `${n} scan${n === 1 ? '' : 's'}`;
  return refused === 0 ? `${scans(done)} ${verb}.` : `${scans(done)} ${verb}; ${scans(refused)} could not be: see each row.`;
}
