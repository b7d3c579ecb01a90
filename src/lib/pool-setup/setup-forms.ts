// What the set-up pages show and ask, as data: the columns of each list and the
// fields of each form. One island (src/components/admin/SetupAdmin.tsx) renders
// all three from these, so the pages share one table, one dialog and one way of
// saving. Pure: no I/O, no framework.
import { formatLongDate } from '@/lib/calendar';
import { describeUnCode } from '@/lib/bins/un-marking';
import { SITE_KINDS, SITE_KIND_LABELS, type SiteKindName } from './setup-schemas';
import type { CustomerRow } from './customers.server';
import type { SiteRow } from './sites.server';
import type { BinTypeRow } from './bin-types.server';
import type { TrailerRow } from './trailers.server';

export type FieldType = 'text' | 'code' | 'email' | 'int' | 'decimal' | 'money' | 'currency' | 'textarea' | 'select' | 'checkbox';

export interface FieldSpec {
  /** The body key; "terms.freeDays" nests. */
  name: string;
  label: string;
  type: FieldType;
  hint?: string;
  /** Fixed choices, or 'owners' for the organisations passed to the page. */
  options?: readonly { value: string; label: string }[] | 'owners';
  /** Only in the new-record form, or only when editing. */
  only?: 'create' | 'edit';
  /** Empty means null (otherwise an empty number field is refused). */
  nullable?: boolean;
  /** Shown beside the field before it on wide screens. */
  pair?: boolean;
  unit?: string;
  /** A fieldset title starting a group of fields. */
  group?: string;
  /** The value a new record's form starts with. */
  initial?: string;
}

export interface ColumnSpec<R> {
  label: string;
  value: (row: R) => string;
  /** Monospace identifier (pinned at the left of the table). */
  ident?: boolean;
  num?: boolean;
  /** Hidden on medium screens, shown from this width (the row's card and dialog still show it). */
  from?: 'lg' | 'xl' | '2xl';
}

export interface SetupSpec<R extends { id: number; version: number; active: boolean }> {
  title: string;
  intro: string;
  /** "customer", "site", "bin type" */
  noun: string;
  apiBase: string;
  label: (row: R) => string;
  search: (row: R) => string;
  columns: ColumnSpec<R>[];
  fields: FieldSpec[];
  /** A choice that narrows the list (the site's kind). */
  filter?: { field: keyof R & string; label: string; options: readonly { value: string; label: string }[] };
  /** What deactivating means, shown beside the checkbox. */
  activeHint: string;
}

const n = (v: number) => v.toLocaleString('en-GB');
const kg = (v: number) => `${v.toLocaleString('en-GB', { maximumFractionDigits: 1 })} kg`;
const coords = (lat: number | null, lon: number | null) => (lat === null || lon === null ? '—' : `${lat.toFixed(4)}, ${lon.toFixed(4)}`);

export const CUSTOMERS: SetupSpec<CustomerRow> = {
  title: 'Customers',
  intro: 'The companies that hire bins, with the hire terms in force today. A change of terms is a new tariff from a date.',
  noun: 'customer',
  apiBase: '/api/admin/customers',
  label: (r) => r.name,
  search: (r) => `${r.name} ${r.contactEmail ?? ''}`,
  activeHint: 'A closed customer gets no new hire orders; their history stays.',
  columns: [
    { label: 'Customer', value: (r) => r.name },
    { label: 'Contact', value: (r) => r.contactEmail ?? '—', from: 'xl' },
    { label: 'VAT number', value: (r) => r.vatId ?? '—', from: '2xl' },
    { label: 'Free days', value: (r) => (r.terms ? String(r.terms.freeDays) : '—'), num: true },
    { label: 'Daily rate', value: (r) => (r.terms ? `${r.terms.currency} ${r.terms.dailyRate}` : 'no tariff today'), num: true },
    { label: 'Trip fee', value: (r) => (r.terms ? `${r.terms.currency} ${r.terms.perTripFee}` : '—'), num: true, from: '2xl' },
    { label: 'Lost-bin fee', value: (r) => (r.terms ? `${r.terms.currency} ${r.terms.lostBinFee}` : '—'), num: true, from: '2xl' },
    { label: 'Terms since', value: (r) => (r.terms ? formatLongDate(r.terms.validFrom) : '—'), from: '2xl' },
    { label: 'Sites', value: (r) => n(r.sites), num: true, from: 'lg' },
    { label: 'Bins out', value: (r) => n(r.binsOnHire), num: true },
  ],
  fields: [
    { name: 'name', label: 'Name', type: 'text' },
    { name: 'contactEmail', label: 'Contact e-mail', type: 'email', nullable: true, hint: 'Where collection reminders, invoices and payment reminders go. Optional.' },
    { name: 'country', label: 'Country', type: 'text', nullable: true, hint: 'Two letters, e.g. NL. With a VAT number from another EU country, statements use reverse charge.' },
    { name: 'vatId', label: 'VAT number', type: 'text', nullable: true, pair: true, hint: 'As on the customer’s invoices, e.g. DE287654310. Optional.' },
    { name: 'terms.freeDays', label: 'Free days', type: 'int', only: 'create', group: 'Hire terms', hint: 'Days on hire before the daily rate starts.' },
    { name: 'terms.currency', label: 'Currency', type: 'currency', only: 'create', pair: true, hint: 'ISO 4217, e.g. EUR.' },
    { name: 'terms.dailyRate', label: 'Daily rate per bin', type: 'money', only: 'create' },
    { name: 'terms.perTripFee', label: 'Fee per trip', type: 'money', only: 'create', pair: true },
    { name: 'terms.lostBinFee', label: 'Fee for a lost bin', type: 'money', only: 'create' },
  ],
};

export const SITE_KIND_OPTIONS = SITE_KINDS.map((k) => ({ value: k, label: SITE_KIND_LABELS[k] }));

export const SITES: SetupSpec<SiteRow> = {
  title: 'Sites',
  intro: 'Where bins stand: the operator’s depots, repair shops and recycling points, and the customers’ sites. Coordinates place them on the pool map.',
  noun: 'site',
  apiBase: '/api/admin/sites',
  label: (r) => `${r.name} (${r.code})`,
  search: (r) => `${r.code} ${r.name} ${r.organisationName} ${r.address ?? ''}`,
  activeHint: 'A closed site is no longer offered for scans and orders; a site with bins standing there cannot be closed.',
  filter: { field: 'kind', label: 'Kind', options: SITE_KIND_OPTIONS },
  columns: [
    { label: 'Code', value: (r) => r.code, ident: true },
    { label: 'Name', value: (r) => r.name },
    { label: 'Kind', value: (r) => SITE_KIND_LABELS[r.kind as SiteKindName] },
    { label: 'Belongs to', value: (r) => r.organisationName, from: 'lg' },
    { label: 'Coordinates', value: (r) => coords(r.latitude, r.longitude), num: true, from: 'xl' },
    { label: 'Minimum collection', value: (r) => (r.kind === 'customer' ? `${n(r.minCollectionQty)} bins` : '—'), num: true, from: '2xl' },
    { label: 'Bins there', value: (r) => n(r.bins), num: true },
  ],
  fields: [
    { name: 'kind', label: 'Kind', type: 'select', options: SITE_KIND_OPTIONS },
    {
      name: 'organisationId',
      label: 'Belongs to',
      type: 'select',
      options: 'owners',
      only: 'create',
      pair: true,
      hint: 'Depots, repair shops and recycling points: the operator. Customer sites: the customer.',
    },
    { name: 'code', label: 'Code', type: 'code', hint: 'Short and unique, e.g. DEP-NORTH. Printed on dispatch notes.' },
    { name: 'name', label: 'Name', type: 'text', pair: true },
    { name: 'address', label: 'Address', type: 'textarea', nullable: true },
    { name: 'latitude', label: 'Latitude', type: 'decimal', nullable: true, group: 'Position', hint: 'Decimal degrees, −90 to 90, e.g. 51.9225.' },
    { name: 'longitude', label: 'Longitude', type: 'decimal', nullable: true, pair: true, hint: 'Decimal degrees, −180 to 180, e.g. 4.4792.' },
    {
      name: 'minCollectionQty',
      label: 'Minimum collection',
      type: 'int',
      unit: 'bins',
      initial: '1',
      group: 'Collections',
      hint: 'Customer sites: a truck run goes only once this many empties are ready there (1 = any number).',
    },
  ],
};

const POLICY_OPTIONS = [
  { value: 'un', label: 'UN-marked IBC (2.5-year and 5-year inspections)' },
  { value: 'own', label: 'The operator’s own intervals' },
] as const;

export const BIN_TYPES: SetupSpec<BinTypeRow> = {
  title: 'Bin types',
  intro: 'Each model of bin: size folded and erected, what it holds and weighs, its UN code and how often it is inspected. Imports and the register name a type by its code.',
  noun: 'bin type',
  apiBase: '/api/admin/bin-types',
  label: (r) => `${r.name} (${r.code})`,
  search: (r) => `${r.code} ${r.name} ${r.unCode ?? ''}`,
  activeHint: 'A closed type is no longer offered when bins are registered; bins of it stay in the pool.',
  columns: [
    { label: 'Code', value: (r) => r.code, ident: true },
    { label: 'Name', value: (r) => r.name },
    { label: 'Capacity', value: (r) => `${n(r.nominalCapacityL)} L`, num: true },
    { label: 'Footprint', value: (r) => `${n(r.footprintLengthMm)} × ${n(r.footprintWidthMm)} mm`, num: true, from: 'lg' },
    { label: 'Height erected / folded', value: (r) => `${n(r.heightErectedMm)} / ${n(r.heightFoldedMm)} mm`, num: true, from: '2xl' },
    { label: 'Tare / max gross', value: (r) => `${kg(r.tareKg)} / ${kg(r.maxGrossKg)}`, num: true, from: 'lg' },
    { label: 'UN code', value: (r) => r.unCode ?? 'none', ident: false },
    { label: 'Inspections', value: (r) => `${r.intermediateMonths} / ${r.fullMonths} months`, num: true, from: '2xl' },
    { label: 'Period of use', value: (r) => (r.serviceLifeApplies ? `${r.serviceLifeYears} years` : 'no limit'), num: true, from: 'xl' },
    { label: 'Bins', value: (r) => n(r.bins), num: true },
  ],
  fields: [
    { name: 'code', label: 'Code', type: 'code', hint: 'As imports and the register name it, e.g. FX1000.' },
    { name: 'name', label: 'Name', type: 'text', pair: true },
    { name: 'graiAssetType', label: 'GRAI asset type', type: 'text', hint: 'The digits after the company prefix in this type’s GRAIs. Fixed once bins are registered.' },
    { name: 'nominalCapacityL', label: 'Capacity', type: 'int', unit: 'L', pair: true },
    { name: 'footprintLengthMm', label: 'Footprint length', type: 'int', unit: 'mm', group: 'Size' },
    { name: 'footprintWidthMm', label: 'Footprint width', type: 'int', unit: 'mm', pair: true },
    { name: 'heightErectedMm', label: 'Height erected', type: 'int', unit: 'mm' },
    { name: 'heightFoldedMm', label: 'Height folded', type: 'int', unit: 'mm', pair: true },
    { name: 'tareKg', label: 'Tare (empty)', type: 'decimal', unit: 'kg', group: 'Mass' },
    { name: 'maxGrossKg', label: 'Maximum gross mass', type: 'decimal', unit: 'kg', pair: true, hint: 'As marked on the bin.' },
    {
      name: 'unCode',
      label: 'UN code',
      type: 'code',
      nullable: true,
      group: 'Dangerous goods and inspections',
      hint: 'The IBC type code of the UN mark, e.g. 31HA1. Empty for a bin without one.',
    },
    { name: 'policyKind', label: 'Inspection policy', type: 'select', options: POLICY_OPTIONS },
    { name: 'intermediateMonths', label: 'Intermediate inspection every', type: 'int', unit: 'months', hint: 'At most 30 for UN-marked IBCs.' },
    { name: 'fullMonths', label: 'Full inspection every', type: 'int', unit: 'months', pair: true, hint: 'At most 60 for UN-marked IBCs.' },
    {
      name: 'serviceLifeApplies',
      label: 'Limited period of use (rigid plastics inner receptacle)',
      type: 'checkbox',
      group: 'Period of use',
      hint: 'ADR 4.1.1.15: rigid plastics IBCs and composites with a rigid plastics inner receptacle carry dangerous goods for 5 years from the inner receptacle’s manufacture, unless the competent authority allows otherwise. Not for bins lined with a single-use liner. Each bin then records the month its inner receptacle was made.',
    },
    { name: 'serviceLifeYears', label: 'Years of use', type: 'int', unit: 'years', pair: true, initial: '5', hint: 'At most 5; fewer where the substance asks for it.' },
  ],
};

/** The words for a UN code under its field ("Composite IBC for liquids: …"), or nothing. */
export function unCodeMeaning(code: string): string | undefined {
  return code.trim() ? describeUnCode(code.trim().toUpperCase()) : undefined;
}

export const TRAILERS: SetupSpec<TrailerRow> = {
  title: 'Trailers',
  intro:
    'The trailers loads and collection runs are planned with: inside size and payload. A run’s truck capacity is worked out from them and the bin type (floor positions, stack levels, payload); without one the standard semi-trailer of common practice is used.',
  noun: 'trailer',
  apiBase: '/api/admin/trailers',
  label: (r) => r.name,
  search: (r) => r.name,
  activeHint: 'A closed trailer is no longer offered for new runs; runs planned with it keep it.',
  columns: [
    { label: 'Name', value: (r) => r.name },
    { label: 'Inside length × width × height', value: (r) => `${n(r.insideLengthMm)} × ${n(r.insideWidthMm)} × ${n(r.insideHeightMm)} mm`, num: true },
    { label: 'Payload', value: (r) => kg(r.payloadKg), num: true },
    { label: 'Runs', value: (r) => n(r.runs), num: true, from: 'lg' },
  ],
  fields: [
    { name: 'name', label: 'Name', type: 'text', hint: 'As planners know it, e.g. Curtainsider 13.6 m.' },
    { name: 'insideLengthMm', label: 'Inside length', type: 'int', unit: 'mm', group: 'Inside size', hint: 'A standard semi-trailer: about 13,600 mm.' },
    { name: 'insideWidthMm', label: 'Inside width', type: 'int', unit: 'mm', pair: true, hint: 'About 2,450 mm.' },
    { name: 'insideHeightMm', label: 'Inside height', type: 'int', unit: 'mm', hint: 'About 2,700 mm.' },
    { name: 'payloadKg', label: 'Payload', type: 'int', unit: 'kg', pair: true, hint: 'About 24,000 kg.' },
  ],
};

export type SetupKind = 'customers' | 'sites' | 'bin-types' | 'trailers';
