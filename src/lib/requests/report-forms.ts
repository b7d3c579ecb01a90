// What people may send about a bin: "empty and ready for collection" and
// "report damage". Pure: the same rules check the public bin page's forms today
// and the customer portal's later. Form values arrive as strings; an empty
// field means "not given" (null). Limits match the columns of
// collection_requests and damage_reports.
import { z } from 'zod';
import { multilineText, text } from '@/lib/text-input';

/** A field no person fills (it is hidden); bots that fill every field give themselves away. */
export const HONEYPOT_FIELD = 'website';

export const MAX_BINS_PER_REQUEST = 500; // the column's CHECK (1–500); a full trailer of folded bins is far fewer
export const MAX_LOCATION_CHARS = 300;
export const MAX_NAME_CHARS = 120;
export const MAX_PHONE_CHARS = 40;
/** RFC 5321 §4.5.3.1.3: a path is at most 256 octets including the angle brackets, so an address at most 254. */
export const MAX_EMAIL_CHARS = 254;
export const MAX_NOTE_CHARS = 1000;
export const MIN_DESCRIPTION_CHARS = 3; // the column's CHECK
export const MAX_DESCRIPTION_CHARS = 2000;

/** A trimmed string; '' (or only spaces) becomes null. Line breaks only where the field is a text area. */
const optionalText = (max: number, tooLong: string, multiline = false) =>
  (multiline ? multilineText() : text())
    .trim()
    .max(max, tooLong)
    .optional()
    .transform((v) => (v ? v : null));

/**
 * ITU-T E.164 numbers have at most 15 digits; people also type spaces, dots,
 * dashes, brackets and a leading +. Six digits is the shortest number a haulier
 * could call back (common practice; short internal extensions are not enough).
 */
export function phoneProblem(phone: string): string | null {
  if (!/^\+?[0-9 ()./-]+$/.test(phone)) return 'Use digits, spaces and + ( ) - only for the phone number.';
  const digits = phone.replace(/\D/g, '').length;
  if (digits < 6) return 'That phone number is too short.';
  if (digits > 15) return 'That phone number has too many digits (at most 15).';
  return null;
}

const phoneField = optionalText(MAX_PHONE_CHARS, `Keep the phone number under ${MAX_PHONE_CHARS} characters.`).superRefine((v, ctx) => {
  const problem = v ? phoneProblem(v) : null;
  if (problem) ctx.addIssue({ code: z.ZodIssueCode.custom, message: problem });
});

const emailField = optionalText(MAX_EMAIL_CHARS, 'That e-mail address is too long.').superRefine((v, ctx) => {
  if (v && !text().email().safeParse(v).success) ctx.addIssue({ code: z.ZodIssueCode.custom, message: 'That does not look like an e-mail address.' });
});

export const collectionRequestFields = z
  .object({
    quantity: text({ required_error: 'Say how many folded bins are waiting.' })
      .trim()
      .min(1, 'Say how many folded bins are waiting.')
      .regex(/^\d+$/, 'Give the number of bins as a whole number, e.g. 6.')
      .transform(Number)
      .pipe(z.number().int().min(1, 'At least one bin must be waiting.').max(MAX_BINS_PER_REQUEST, `At most ${MAX_BINS_PER_REQUEST} bins per request; send another for the rest.`)),
    locationNote: optionalText(MAX_LOCATION_CHARS, `Keep "where exactly" under ${MAX_LOCATION_CHARS} characters.`, true),
    contactName: text({ required_error: 'Give your name, so the haulier knows whom to ask for.' })
      .trim()
      .min(2, 'Give your name, so the haulier knows whom to ask for.')
      .max(MAX_NAME_CHARS, `Keep the name under ${MAX_NAME_CHARS} characters.`),
    contactPhone: phoneField,
    contactEmail: emailField,
    note: optionalText(MAX_NOTE_CHARS, `Keep the note under ${MAX_NOTE_CHARS} characters.`, true),
  })
  .superRefine((v, ctx) => {
    if (!v.contactPhone && !v.contactEmail) {
      ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['contactPhone'], message: 'Give a phone number or an e-mail address, so we can reach you about the collection.' });
    }
  });

export type CollectionRequestFields = z.infer<typeof collectionRequestFields>;

export const damageReportFields = z.object({
  description: multilineText({ required_error: 'Say what is wrong with the bin.' })
    .trim()
    .min(MIN_DESCRIPTION_CHARS, 'Say what is wrong with the bin, in a few words.')
    .max(MAX_DESCRIPTION_CHARS, `Keep the description under ${MAX_DESCRIPTION_CHARS} characters.`),
  contactName: optionalText(MAX_NAME_CHARS, `Keep the name under ${MAX_NAME_CHARS} characters.`),
  contactEmail: emailField,
});

export type DamageReportFields = z.infer<typeof damageReportFields>;

export type ReportForm = 'collection' | 'damage';

const FORM_FIELDS: Record<ReportForm, readonly string[]> = {
  collection: ['quantity', 'locationNote', 'contactName', 'contactPhone', 'contactEmail', 'note'],
  damage: ['description', 'contactName', 'contactEmail'],
};

/** The text fields of a submitted form (files and unknown fields left out). */
export function textFields(form: ReportForm, entries: Iterable<[string, unknown]>): Record<string, string> {
  return pickTextFields(FORM_FIELDS[form], entries);
}

/** The named text fields of a submitted form, the first of each (files and unknown fields left out). */
export function pickTextFields(fields: readonly string[], entries: Iterable<[string, unknown]>): Record<string, string> {
  const wanted = new Set(fields);
  const out: Record<string, string> = {};
  for (const [k, v] of entries) if (wanted.has(k) && typeof v === 'string' && !(k in out)) out[k] = v;
  return out;
}

/** The first problem per field, for showing beside the inputs. */
export function fieldProblems(error: z.ZodError): Record<string, string> {
  const out: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = String(issue.path[0] ?? '');
    out[key] ??= issue.message;
  }
  return out;
}

/** True when the hidden field was filled in: a bot, not a person. */
export function isHoneypotFilled(entries: Iterable<[string, unknown]>): boolean {
  for (const [k, v] of entries) if (k === HONEYPOT_FIELD && typeof v === 'string' && v.trim() !== '') return true;
  return false;
}
