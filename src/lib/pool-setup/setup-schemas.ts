// What an admin enters to set up the pool: customers, sites (depots, customers'
// sites, repair shops, recycling points) and bin types. Validated here once —
// the API routes parse with these, the database's checks are the last line.
// Pure: no I/O.
import { z } from 'zod';
import { multilineText, text } from '@/lib/text-input';
import { parseUnTypeCode } from '@/lib/bins/un-marking';
import { DEFAULT_UN_POLICY, policyProblems } from '@/lib/inspections/inspection-due';
import { ADR_SERVICE_LIFE_YEARS, serviceLifePolicyProblems } from '@/lib/inspections/service-life';
import { tariffInputSchema } from '@/lib/planning/tariffs';

const version = z.number().int().min(0);
const id = z.number().int().positive().max(2_147_483_647);
const code = (what: string) =>
  text()
    .trim()
    .toUpperCase()
    .min(1, `Enter a ${what} code.`)
    .max(24, 'At most 24 characters.')
    .regex(/^[A-Z0-9][A-Z0-9-]*$/, 'Letters, digits and dashes, starting with a letter or digit, e.g. DEP-NORTH.');
const optionalText = (max: number) =>
  text()
    .trim()
    .max(max, `At most ${max} characters.`)
    .nullish()
    .transform((v) => (v ? v : null));

// ---------------------------------------------------------------- customers

/** The hire terms a new customer starts with: the first tariff, valid from the day they are added. */
export const hireTermsSchema = tariffInputSchema.pick({ freeDays: true, dailyRate: true, perTripFee: true, lostBinFee: true, currency: true });

const customerFields = {
  name: text().trim().min(1, 'Enter the customer’s name.').max(160, 'At most 160 characters.'),
  contactEmail: text()
    .trim()
    .toLowerCase()
    .max(254)
    .refine((v) => v === '' || z.string().email().safeParse(v).success, 'Enter an e-mail address, like desk@customer.example, or leave it empty.')
    .nullish()
    .transform((v) => (v ? v : null)),
  /** With the VAT number, decides reverse charge on statements (a business in another EU country than the operator's). */
  country: text()
    .trim()
    .toUpperCase()
    .refine((v) => v === '' || /^[A-Z]{2}$/.test(v), 'Two letters (ISO 3166), like NL or DE, or leave it empty.')
    .nullish()
    .transform((v) => (v ? v : null)),
  vatId: text()
    .trim()
    .toUpperCase()
    .transform((v) => v.replace(/[\s.-]/g, ''))
    .refine((v) => v === '' || /^[A-Z]{2}[0-9A-Z+*]{2,18}$/.test(v), 'A VAT number starts with its country code, like DE287654310, or leave it empty.')
    .nullish()
    .transform((v) => (v ? v : null)),
};

export const customerCreateSchema = z.object({ ...customerFields, terms: hireTermsSchema }).strict();
export type CustomerCreate = z.infer<typeof customerCreateSchema>;

export const customerPatchSchema = z
  .object({ version, ...customerFields, active: z.boolean() })
  .partial({ name: true, contactEmail: true, country: true, vatId: true, active: true })
  .strict();
export type CustomerPatch = z.infer<typeof customerPatchSchema>;

// ---------------------------------------------------------------- sites

export const SITE_KINDS = ['depot', 'customer', 'repair', 'recycling'] as const;
export type SiteKindName = (typeof SITE_KINDS)[number];

export const SITE_KIND_LABELS: Record<SiteKindName, string> = {
  depot: 'Depot',
  customer: 'Customer site',
  repair: 'Repair shop',
  recycling: 'Recycling point',
};

/** Depots, repair shops and recycling points belong to the operator; a customer's site to that customer. */
export function siteOwnerKind(kind: SiteKindName): 'operator' | 'customer' {
  return kind === 'customer' ? 'customer' : 'operator';
}

const coordinate = (min: number, max: number, what: string) =>
  z
    .number({ invalid_type_error: `The ${what} is a number.` })
    .min(min, `The ${what} lies between ${min} and ${max}.`)
    .max(max, `The ${what} lies between ${min} and ${max}.`)
    .nullable();

const siteObject = z.object({
  version,
  organisationId: id,
  code: code('site'),
  name: text().trim().min(1, 'Enter the site’s name.').max(160, 'At most 160 characters.'),
  kind: z.enum(SITE_KINDS),
  address: multilineText()
    .trim()
    .max(500, 'At most 500 characters.')
    .nullish()
    .transform((v) => (v ? v : null)),
  latitude: coordinate(-90, 90, 'latitude'),
  longitude: coordinate(-180, 180, 'longitude'),
  /** Bins a collection must have before a truck run goes (1 = any). */
  minCollectionQty: z
    .number({ invalid_type_error: 'The minimum collection is a whole number of bins.' })
    .int('The minimum collection is a whole number of bins.')
    .min(1, 'The minimum collection lies between 1 and 500 bins.')
    .max(500, 'The minimum collection lies between 1 and 500 bins.'),
  active: z.boolean(),
});

/** A position is both coordinates or none, as field messages (a new site, or an edit merged onto the stored row). */
export function positionProblems(v: { latitude: number | null; longitude: number | null }): { path: string; message: string }[] {
  if (v.latitude === null && v.longitude !== null) return [{ path: 'latitude', message: 'Give the latitude too, or neither.' }];
  if (v.longitude === null && v.latitude !== null) return [{ path: 'longitude', message: 'Give the longitude too, or neither.' }];
  return [];
}

function bothOrNeither(v: { latitude: number | null; longitude: number | null }, ctx: z.RefinementCtx) {
  for (const p of positionProblems(v)) ctx.addIssue({ code: z.ZodIssueCode.custom, path: [p.path], message: p.message });
}

export const siteCreateSchema = siteObject.omit({ version: true }).partial({ address: true, active: true, minCollectionQty: true }).strict().superRefine(bothOrNeither);
export type SiteCreate = z.infer<typeof siteCreateSchema>;

/** An edit names the fields it changes; the owner does not change. Both-or-neither coordinates is checked on the merged row. */
export const sitePatchSchema = siteObject.omit({ organisationId: true }).partial().required({ version: true }).strict();
export type SitePatch = z.infer<typeof sitePatchSchema>;

// ---------------------------------------------------------------- bin types

const wholeMm = (what: string, max = 5000) =>
  z
    .number({ invalid_type_error: `The ${what} is a number of millimetres.` })
    .int('Whole millimetres.')
    .min(1, 'Above 0.')
    .max(max, `At most ${max} mm.`);
const kg = (what: string) =>
  z
    .number({ invalid_type_error: `The ${what} is a number of kilograms.` })
    .positive('Above 0.')
    .max(99_999, 'At most 99,999 kg.')
    .refine((v) => Math.round(v * 10) === v * 10, 'At most one decimal, e.g. 86.5.');

const binTypeObject = z.object({
  version,
  code: code('bin type'),
  name: text().trim().min(1, 'Enter a name, e.g. Folding IBC 1000 L.').max(120, 'At most 120 characters.'),
  graiAssetType: text()
    .trim()
    .regex(/^\d{1,6}$/, 'The GRAI asset type is 1 to 6 digits.'),
  nominalCapacityL: z.number({ invalid_type_error: 'The capacity is a number of litres.' }).int('Whole litres.').min(1, 'Above 0.').max(3000, 'IBCs hold at most 3,000 L.'),
  tareKg: kg('tare mass'),
  maxGrossKg: kg('maximum gross mass'),
  footprintLengthMm: wholeMm('length'),
  footprintWidthMm: wholeMm('width'),
  heightErectedMm: wholeMm('erected height'),
  heightFoldedMm: wholeMm('folded height'),
  unCode: text()
    .trim()
    .toUpperCase()
    .nullish()
    .transform((v, ctx) => {
      if (!v) return null;
      const parsed = parseUnTypeCode(v);
      if (!parsed.ok) {
        ctx.addIssue({ code: z.ZodIssueCode.custom, message: `${parsed.error.message}. Leave it empty for a bin without a UN mark.` });
        return z.NEVER;
      }
      return parsed.typeCode.code;
    }),
  policyKind: z.enum(['un', 'own']),
  intermediateMonths: z.number({ invalid_type_error: 'A number of months.' }).int('Whole months.').min(1, 'At least 1 month.').max(120, 'At most 120 months.'),
  fullMonths: z.number({ invalid_type_error: 'A number of months.' }).int('Whole months.').min(1, 'At least 1 month.').max(240, 'At most 240 months.'),
  /** ADR 4.1.1.15: a rigid plastics inner receptacle's period of use (not for bins lined with a single-use liner). */
  serviceLifeApplies: z.boolean().optional(),
  serviceLifeYears: z.number({ invalid_type_error: 'A number of years.' }).int('Whole years.').min(1, 'At least 1 year.').max(5, 'ADR 4.1.1.15 allows at most 5 years.').optional(),
  active: z.boolean(),
});

export type BinTypeFields = z.infer<typeof binTypeObject>;

/**
 * The rules between fields of a bin type, as field messages. Used on a whole
 * row (a new type, or an edit merged onto the stored row).
 */
export function binTypeProblems(b: Omit<BinTypeFields, 'version' | 'active' | 'code' | 'name' | 'graiAssetType'>): { path: string; message: string }[] {
  const problems: { path: string; message: string }[] = [];
  if (b.maxGrossKg <= b.tareKg) problems.push({ path: 'maxGrossKg', message: 'The maximum gross mass is above the tare (the empty bin).' });
  if (b.heightFoldedMm >= b.heightErectedMm) problems.push({ path: 'heightFoldedMm', message: 'Folded, the bin is lower than erected.' });
  if (b.policyKind === 'un' && !b.unCode)
    problems.push({ path: 'unCode', message: 'The UN inspection policy is for UN-marked bins: enter the UN code, or choose the operator’s own policy.' });
  const policy = { ...DEFAULT_UN_POLICY, kind: b.policyKind, intermediateMonths: b.intermediateMonths, fullMonths: b.fullMonths };
  for (const p of serviceLifePolicyProblems({ applies: b.serviceLifeApplies ?? false, years: b.serviceLifeYears ?? ADR_SERVICE_LIFE_YEARS })) {
    problems.push({ path: 'serviceLifeYears', message: `${p[0]!.toUpperCase() + p.slice(1)}.` });
  }
  for (const p of policyProblems(policy)) {
    problems.push({ path: /full/.test(p) && !/intermediate/.test(p) ? 'fullMonths' : 'intermediateMonths', message: `${p[0]!.toUpperCase() + p.slice(1)}.` });
  }
  return problems;
}

export const binTypeCreateSchema = binTypeObject
  .omit({ version: true })
  .partial({ active: true })
  .strict()
  .superRefine((v, ctx) => {
    for (const p of binTypeProblems(v)) ctx.addIssue({ code: z.ZodIssueCode.custom, path: [p.path], message: p.message });
  });
export type BinTypeCreate = z.infer<typeof binTypeCreateSchema>;

/** An edit names the fields it changes; the cross-field rules run on the merged row in the service. */
export const binTypePatchSchema = binTypeObject.partial().required({ version: true }).strict();
export type BinTypePatch = z.infer<typeof binTypePatchSchema>;

// ---------------------------------------------------------------- trailers

const trailerObject = z.object({
  version,
  name: text().trim().min(1, 'Enter a name, e.g. Curtainsider 13.6 m.').max(120, 'At most 120 characters.'),
  insideLengthMm: wholeMm('inside length', 20_000).min(1000, 'At least 1,000 mm.'),
  insideWidthMm: wholeMm('inside width', 3000).min(1000, 'At least 1,000 mm.'),
  insideHeightMm: wholeMm('inside height', 4000).min(1000, 'At least 1,000 mm.'),
  payloadKg: z.number({ invalid_type_error: 'The payload is a number of kilograms.' }).int('Whole kilograms.').min(100, 'At least 100 kg.').max(60_000, 'At most 60,000 kg.'),
  active: z.boolean(),
});

export const trailerCreateSchema = trailerObject.omit({ version: true }).partial({ active: true }).strict();
export type TrailerCreate = z.infer<typeof trailerCreateSchema>;
export const trailerPatchSchema = trailerObject.partial().required({ version: true }).strict();
export type TrailerPatch = z.infer<typeof trailerPatchSchema>;
