// What an admin may set in the operator-wide settings, validated in one place
// (the API route parses with it; the database's checks are the last line).
import { z } from 'zod';
import { multilineText, text } from '@/lib/text-input';
import { IANAZone } from 'luxon';
import { PUBLIC_LANGUAGES } from '@/lib/requests/public-languages';

/** "Name <address>" or a bare address; null when it is neither. */
export function parseMailbox(value: string): { name: string | null; address: string } | null {
  const v = value.trim();
  const named = /^"?([^"<>]*?)"?\s*<([^<>\s]+)>$/.exec(v);
  const name = named ? named[1]!.trim() || null : null;
  const address = named ? named[2]! : v;
  if (!text().email().safeParse(address).success) return null;
  if (name && /[\r\n]/.test(name)) return null;
  return { name, address };
}

/** An IANA zone name in its canonical spelling ("europe/amsterdam" → "Europe/Amsterdam"), or null. */
export function canonicalTimeZone(value: string): string | null {
  const v = value.trim();
  if (!IANAZone.isValidZone(v)) return null;
  const resolved = new Intl.DateTimeFormat('en', { timeZone: v }).resolvedOptions().timeZone;
  // Keep what was typed when the runtime maps it to another zone ("EST" → an American city):
  // only the spelling is corrected.
  return resolved.toLowerCase() === v.toLowerCase() ? resolved : v;
}

const CURRENCIES = new Set(Intl.supportedValuesOf('currency'));

export const settingsSchema = z
  .object({
    version: z.number().int().min(0),
    operatorName: text().trim().min(1, 'Enter the operator’s name.').max(160),
    gs1CompanyPrefix: text()
      .trim()
      .regex(/^\d{4,12}$/, 'A GS1 company prefix is 4 to 12 digits.'),
    gs1PrefixLength: z.number().int().min(4, 'Between 4 and 12.').max(12, 'Between 4 and 12.'),
    digitalLinkBase: text()
      .trim()
      .max(200)
      .refine((v) => {
        try {
          const u = new URL(v);
          return (u.protocol === 'https:' || u.protocol === 'http:') && !u.search && !u.hash && !u.username;
        } catch {
          return false;
        }
      }, 'Enter a web address starting with https:// (no ?query or #part), e.g. https://id.pool.example')
      .transform((v) => v.replace(/\/+$/, '')),
    timeZone: text().transform((v, ctx) => {
      const zone = canonicalTimeZone(v);
      if (!zone) {
        ctx.addIssue({ code: z.ZodIssueCode.custom, message: 'Not a time zone name. Use an IANA name such as Europe/Amsterdam.' });
        return z.NEVER;
      }
      return zone;
    }),
    currency: text()
      .trim()
      .toUpperCase()
      .refine((v) => /^[A-Z]{3}$/.test(v) && CURRENCIES.has(v), 'Use a three-letter ISO 4217 currency code, e.g. EUR.'),
    taxRate: text()
      .trim()
      .regex(/^0(\.\d{1,4})?$/, 'A fraction from 0 to 0.9999, e.g. 0.21 for 21 %.'),
    mailSender: text()
      .trim()
      .max(254)
      .refine((v) => parseMailbox(v) !== null, 'An e-mail address, optionally with a name: Pool desk <pool@company.example>'),
    returnInstructions: multilineText().trim().max(2000, 'Keep it under 2,000 characters.'),
    // Empty means "no wording of our own in that language": the main instructions are shown instead.
    returnInstructionsByLanguage: z
      .object(
        Object.fromEntries(PUBLIC_LANGUAGES.map((l) => [l, multilineText().trim().max(2000, 'Keep it under 2,000 characters.').optional()])) as Record<
          (typeof PUBLIC_LANGUAGES)[number],
          z.ZodOptional<z.ZodString>
        >,
      )
      .strict()
      .default({})
      .transform((v) => Object.fromEntries(Object.entries(v).filter(([, text]) => text)) as Partial<Record<(typeof PUBLIC_LANGUAGES)[number], string>>),
    undoSeconds: z
      .number({ invalid_type_error: 'A number of seconds.' })
      .int('Whole seconds.')
      .min(0, 'From 0 (no undo) to 600 seconds.')
      .max(600, 'From 0 (no undo) to 600 seconds.'),
    /** Left out: unchanged. */
    reminderDaysOver: z.number({ invalid_type_error: 'A number of days.' }).int('Whole days.').min(1, 'From 1 to 365 days.').max(365, 'From 1 to 365 days.').optional(),
    /** Left out: unchanged. Days past an invoice's due date before the first payment reminder. */
    paymentReminderDays: z.number({ invalid_type_error: 'A number of days.' }).int('Whole days.').min(1, 'From 1 to 90 days.').max(90, 'From 1 to 90 days.').optional(),
    /** Left out: unchanged. Empty or null: never propose retirement. */
    repairRetireThreshold: z
      .union([text().trim(), z.null()])
      .optional()
      .transform((v) => (v === '' ? null : v))
      .refine((v) => v === undefined || v === null || /^\d{1,10}(\.\d{1,2})?$/.test(v), 'An amount such as 400 or 400.00; leave it empty to never propose retirement.'),
  })
  .superRefine((v, ctx) => {
    if (v.gs1CompanyPrefix.length !== v.gs1PrefixLength) {
      ctx.addIssue({
        code: z.ZodIssueCode.custom,
        path: ['gs1PrefixLength'],
        message: `The prefix has ${v.gs1CompanyPrefix.length} digits; its length must say the same.`,
      });
    }
  });

export type SettingsInput = z.infer<typeof settingsSchema>;

/** The settings as the page and API show them. */
export interface SettingsView extends Omit<SettingsInput, 'version'> {
  version: number;
  updatedAt: string;
}
