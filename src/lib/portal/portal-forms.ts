// The customer portal's forms, checked with zod: a hire order (saved as a draft the planner confirms), a collection
// of empties per site with the day they are ready, a damage report and a delivery confirmation. The forms post as
// HTML forms (they work without JavaScript on a phone), so every value arrives as a string. Pure.
import { z } from 'zod';
import { addDays, isLocalDate, type LocalDate } from '@/lib/calendar';
import { multilineText, text } from '@/lib/text-input';
import { fillSchema } from '@/lib/scans/scan-schema';

/** How far ahead a customer may order or announce empties (common practice: a quarter's horizon). */
export const PORTAL_HORIZON_DAYS = 120;

const id = (what: string) =>
  z.coerce
    .number({ invalid_type_error: `Choose ${what}.` })
    .int(`Choose ${what}.`)
    .positive(`Choose ${what}.`)
    .max(2_147_483_647, `Choose ${what}.`);

const optionalLine = (max: number, message: string) =>
  text()
    .trim()
    .max(max, message)
    .optional()
    .transform((v) => (v ? v : null));
const optionalNote = (max: number, message: string) =>
  multilineText()
    .trim()
    .max(max, message)
    .optional()
    .transform((v) => (v ? v : null));

/** A day from today up to the horizon, as a form's date field sends it. */
function dayFrom(today: LocalDate, words: { missing: string; past: string }) {
  const last = addDays(today, PORTAL_HORIZON_DAYS);
  return text({ required_error: words.missing })
    .trim()
    .min(1, words.missing)
    .refine(isLocalDate, 'Give the day as a date, e.g. 2027-01-14.')
    .refine((d) => d >= today, words.past)
    .refine((d) => d <= last, `Choose a day within ${PORTAL_HORIZON_DAYS} days from today.`);
}

const wholeCount = (max: number, what: string) =>
  text({ required_error: `Say how many ${what}.` })
    .trim()
    .min(1, `Say how many ${what}.`)
    .regex(/^\d+$/, 'Give a whole number, e.g. 6.')
    .transform(Number)
    .pipe(z.number().int().min(1, 'At least one.').max(max, `At most ${max} per request; send another for the rest.`));

export const MAX_ORDER_BINS = 200;
export const MAX_COLLECTION_BINS = 500;

export function portalOrderFields(today: LocalDate) {
  return z
    .object({
      binTypeId: id('a bin type'),
      quantity: wholeCount(MAX_ORDER_BINS, 'bins you need'),
      neededBy: dayFrom(today, { missing: 'Say by when you need the bins.', past: 'That day has passed; choose today or later.' }),
      deliverySiteId: id('the site that fills them'),
      product: optionalLine(120, 'Keep the product under 120 characters.'),
      /** The liner grade: food contact, and the hottest fill the liner must stand. */
      linerFoodContact: z
        .literal('yes')
        .optional()
        .transform((v) => v === 'yes'),
      linerMaxFillTempC: text()
        .trim()
        .optional()
        .transform((v) => (v ? v : null))
        .refine((v) => v === null || /^-?\d{1,3}$/.test(v), 'Give whole degrees, e.g. 60.')
        .transform((v) => (v === null ? null : Number(v)))
        .refine((v) => v === null || (v >= -40 && v <= 100), 'Between −40 and 100 °C.'),
      notes: optionalNote(1000, 'Keep the note under 1000 characters.'),
    })
    .strict();
}
export type PortalOrderInput = z.output<ReturnType<typeof portalOrderFields>>;

export function collectionFields(today: LocalDate) {
  return z
    .object({
      siteId: id('the site'),
      quantity: wholeCount(MAX_COLLECTION_BINS, 'folded bins are waiting'),
      readyOn: dayFrom(today, { missing: 'Say from which day the empties are ready.', past: 'That day has passed; choose today or later.' }),
      note: optionalNote(1000, 'Keep the note under 1000 characters.'),
    })
    .strict();
}
export type CollectionInput = z.output<ReturnType<typeof collectionFields>>;

export const damageFields = z
  .object({
    grai: text({ required_error: 'Choose the bin.' }).trim().min(1, 'Choose the bin.').max(40, 'Choose the bin.'),
    description: multilineText({ required_error: 'Say what is wrong with the bin.' })
      .trim()
      .min(3, 'Say what is wrong with the bin, in a few words.')
      .max(2000, 'Keep the description under 2000 characters.'),
  })
  .strict();
export type DamageInput = z.output<typeof damageFields>;

export const deliveryFields = z
  .object({
    reference: text().trim().min(1).max(32),
    receivedByName: text({ required_error: 'Give your name.' }).trim().min(2, 'Give your name.').max(120, 'Keep the name under 120 characters.'),
  })
  .strict();
export type DeliveryInput = z.output<typeof deliveryFields>;

export { pickTextFields, fieldProblems } from '@/lib/requests/report-forms';

export const ORDER_FORM_FIELDS = ['binTypeId', 'quantity', 'neededBy', 'deliverySiteId', 'product', 'linerFoodContact', 'linerMaxFillTempC', 'notes'] as const;
export const COLLECTION_FORM_FIELDS = ['siteId', 'quantity', 'readyOn', 'note'] as const;
export const DAMAGE_FORM_FIELDS = ['grai', 'description'] as const;
export const DELIVERY_FORM_FIELDS = ['reference', 'receivedByName'] as const;

/** Site ids from a form's checkboxes (joined with commas by the form reader); none ticked = every site. */
const siteIdList = text()
  .optional()
  .transform((v) => (v ? v.split(',').filter(Boolean) : []))
  .refine((ids) => ids.every((i) => /^\d{1,9}$/.test(i)), 'Choose sites from the list.')
  .transform((ids) => [...new Set(ids.map(Number))].sort((a, b) => a - b));

export const inviteColleagueFields = z
  .object({
    name: text({ required_error: 'Give their name.' }).trim().min(2, 'Give their name.').max(160, 'Keep the name under 160 characters.'),
    email: text({ required_error: 'Give their e-mail address.' }).trim().toLowerCase().email('Give an e-mail address, like name@company.example.').max(254),
    siteIds: siteIdList,
    admin: z
      .literal('yes')
      .optional()
      .transform((v) => v === 'yes'),
  })
  .strict();
export type InviteColleagueInput = z.output<typeof inviteColleagueFields>;

export const colleagueSitesFields = z.object({ userId: id('the person'), siteIds: siteIdList }).strict();
export type ColleagueSitesInput = z.output<typeof colleagueSitesFields>;

export const INVITE_FORM_FIELDS = ['name', 'email', 'siteIds', 'admin'] as const;
export const SITES_FORM_FIELDS = ['userId', 'siteIds'] as const;
/** Fields a form sends more than once (checkboxes), read as one comma-joined value. */
export const MULTI_FIELDS = ['siteIds'] as const;

/** The monthly count of one site: how it was done; the bins come as repeated `counted` fields (read from the form). */
export const countFields = z
  .object({
    method: z.enum(['ticked', 'scanned'], { errorMap: () => ({ message: 'Tick the bins you see, or scan them.' }) }).default('ticked'),
  })
  .strict();
export const COUNT_FORM_FIELDS = ['method'] as const;
/** The bins of a count from the form: each ticked box or scanned label (a GRAI or a serial of the list). */
export function countedFrom(values: readonly unknown[]): string[] {
  return values
    .filter((v): v is string => typeof v === 'string')
    .map((v) => v.trim().slice(0, 120))
    .filter(Boolean);
}

/** A decimal as a form sends it ("1 000,5" or "1000.5"); empty = none. */
const optionalDecimal = (message: string) =>
  text()
    .trim()
    .optional()
    .transform((v) => (v ? v.replace(/\s/g, '').replace(',', '.') : null))
    .refine((v) => v === null || /^-?\d+(\.\d+)?$/.test(v), message)
    .transform((v) => (v === null ? null : Number(v)));

/**
 * A fill record from the portal: the bin, the product, volume or mass (at least one), the filling temperature and the
 * seal numbers (comma or space separated). The record itself is checked once more by the scan service's fill schema.
 */
export const fillRecordFields = z
  .object({
    clientEventId: text().uuid('Open the form again.'),
    grai: text({ required_error: 'Choose the bin.' }).trim().min(1, 'Choose the bin.').max(40, 'Choose the bin.'),
    product: text({ required_error: 'Say what was filled.' }).trim().min(1, 'Say what was filled.').max(120, 'Keep the product under 120 characters.'),
    volumeL: optionalDecimal('Give the volume in litres, e.g. 950.'),
    massKg: optionalDecimal('Give the mass in kilograms, e.g. 870.5.'),
    temperatureC: optionalDecimal('Give the temperature in °C, e.g. 20.'),
    seals: text()
      .trim()
      .max(240, 'At most six seal numbers.')
      .optional()
      .transform((v) => (v ? v.split(/[\s,;]+/).filter(Boolean) : [])),
  })
  .strict()
  .superRefine((f, ctx) => {
    if (f.volumeL === null && f.massKg === null) ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['volumeL'], message: 'Give the volume or the mass filled.' });
    const record = fillSchema.safeParse({ product: f.product, volumeL: f.volumeL, massKg: f.massKg, temperatureC: f.temperatureC, seals: f.seals });
    if (!record.success) {
      for (const issue of record.error.issues) {
        const field = String(issue.path[0] ?? 'product');
        const words: Record<string, string> = {
          volumeL: 'The volume is between 0 and 3000 L.',
          massKg: 'The mass is between 0 and 5000 kg.',
          temperatureC: 'The temperature is between −40 and 100 °C.',
        };
        ctx.addIssue({ code: z.ZodIssueCode.custom, path: [field], message: words[field] ?? issue.message });
      }
    }
  });
export type FillRecordInput = z.output<typeof fillRecordFields>;
export const FILL_FORM_FIELDS = ['clientEventId', 'grai', 'product', 'volumeL', 'massKg', 'temperatureC', 'seals'] as const;
