// What people may send about a bin: "empty and ready for collection" and
// "report damage". Pure: the same rules check the public bin page's forms today
// and the customer portal's later. Form values arrive as strings; an empty
// field means "not given" (null). Limits match the columns of
// collection_requests and damage_reports.
import { z } from 'zod';
import { CONTROL_MESSAGE, DATE_RANGE_MESSAGE, inDateRange, multilineText, text } from '@/lib/text-input';
import { isLocalDate } from '@/lib/calendar';
import { publicWords, type PublicTranslate } from './public-words';

const english = publicWords('en');

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
export function phoneProblem(phone: string, t: PublicTranslate = english): string | null {
  if (!/^\+?[0-9 ()./-]+$/.test(phone)) return t('phoneCharacters');
  const digits = phone.replace(/\D/g, '').length;
  if (digits < 6) return t('phoneTooShort');
  if (digits > 15) return t('phoneTooLongDigits');
  return null;
}

const phoneField = (t: PublicTranslate) =>
  optionalText(MAX_PHONE_CHARS, t('phoneTooLong', { max: MAX_PHONE_CHARS })).superRefine((v, ctx) => {
    const problem = v ? phoneProblem(v, t) : null;
    if (problem) ctx.addIssue({ code: z.ZodIssueCode.custom, message: problem });
  });

const emailField = (t: PublicTranslate) =>
  optionalText(MAX_EMAIL_CHARS, t('emailTooLong')).superRefine((v, ctx) => {
    if (v && !text().email().safeParse(v).success) ctx.addIssue({ code: z.ZodIssueCode.custom, message: t('emailInvalid') });
  });

/** "Empty and ready for collection", its notes in the sender's language (`publicWords()`). */
export function collectionRequestFieldsIn(t: PublicTranslate) {
  return z
    .object({
      quantity: text({ required_error: t('quantityMissing') })
        .trim()
        .min(1, t('quantityMissing'))
        .regex(/^\d+$/, t('quantityWhole'))
        .transform(Number)
        .pipe(
          z
            .number()
            .int()
            .min(1, t('quantityMin'))
            .max(MAX_BINS_PER_REQUEST, t('quantityMax', { max: MAX_BINS_PER_REQUEST })),
        ),
      locationNote: optionalText(MAX_LOCATION_CHARS, t('whereTooLong', { max: MAX_LOCATION_CHARS }), true),
      contactName: text({ required_error: t('nameMissing') })
        .trim()
        .min(2, t('nameMissing'))
        .max(MAX_NAME_CHARS, t('nameTooLong', { max: MAX_NAME_CHARS })),
      contactPhone: phoneField(t),
      contactEmail: emailField(t),
      note: optionalText(MAX_NOTE_CHARS, t('noteTooLong', { max: MAX_NOTE_CHARS }), true),
    })
    .superRefine((v, ctx) => {
      if (!v.contactPhone && !v.contactEmail) {
        ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['contactPhone'], message: t('reachMissing') });
      }
    });
}

/**
 * A collection request a planner records for a customer (a phone call, a mail): the customer site, how many bins,
 * the day they are ready and who to ask for. The customer follows from the site.
 */
export const plannerCollectionRequest = z
  .object({
    siteId: z.number({ required_error: 'Choose the customer site.', invalid_type_error: 'Choose the customer site.' }).int().positive('Choose the customer site.'),
    quantity: z
      .number({ required_error: 'Say how many bins are ready.', invalid_type_error: 'Give the number of bins as a whole number.' })
      .int('Give the number of bins as a whole number.')
      .min(1, 'At least one bin.')
      .max(MAX_BINS_PER_REQUEST, `At most ${MAX_BINS_PER_REQUEST} bins in one request.`),
    readyOn: text({ required_error: 'Give the day the bins are ready.' }).refine(isLocalDate, 'must be a date like 2027-01-14').refine(inDateRange, DATE_RANGE_MESSAGE),
    contactName: text({ required_error: 'Name the person to ask for at the site.' })
      .trim()
      .min(2, 'Name the person to ask for at the site.')
      .max(MAX_NAME_CHARS, `At most ${MAX_NAME_CHARS} characters.`),
    contactPhone: phoneField(english),
    note: optionalText(MAX_NOTE_CHARS, `At most ${MAX_NOTE_CHARS} characters.`, true),
  })
  .strict();
export type PlannerCollectionRequest = z.output<typeof plannerCollectionRequest>;

/** "Report damage", its notes in the sender's language. */
export function damageReportFieldsIn(t: PublicTranslate) {
  return z.object({
    description: multilineText({ required_error: t('descriptionMissing') })
      .trim()
      .min(MIN_DESCRIPTION_CHARS, t('descriptionShort'))
      .max(MAX_DESCRIPTION_CHARS, t('descriptionTooLong', { max: MAX_DESCRIPTION_CHARS })),
    contactName: optionalText(MAX_NAME_CHARS, t('nameTooLong', { max: MAX_NAME_CHARS })),
    contactEmail: emailField(t),
  });
}

/** The English forms: the API's answers and the portal. */
export const collectionRequestFields = collectionRequestFieldsIn(english);
export type CollectionRequestFields = z.infer<typeof collectionRequestFields>;
export const damageReportFields = damageReportFieldsIn(english);

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

/** The first problem per field, for showing beside the inputs (the shared text type's note in the sender's language). */
export function fieldProblems(error: z.ZodError, t: PublicTranslate = english): Record<string, string> {
  const out: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = String(issue.path[0] ?? '');
    out[key] ??= issue.message === CONTROL_MESSAGE ? t('textControl') : issue.message;
  }
  return out;
}

/** True when the hidden field was filled in: a bot, not a person. */
export function isHoneypotFilled(entries: Iterable<[string, unknown]>): boolean {
  for (const [k, v] of entries) if (k === HONEYPOT_FIELD && typeof v === 'string' && v.trim() !== '') return true;
  return false;
}
