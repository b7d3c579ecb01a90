// Customers as the admin sets them up: name, contact, active, and their hire
// terms. Terms live in `tariffs` with effective dates (src/lib/planning/tariffs.ts,
// the one place they are read from); a new customer starts with a first tariff
// from the day it is added, and later changes are new tariffs.
import { QueryTypes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { Organisation } from '@/models';
import { AppError } from '@/lib/api-errors';
import type { AuditActor } from '@/lib/audit.server';
import { localDate } from '@/lib/calendar';
import { getSettings } from '@/lib/settings/settings.server';
import { addTariff } from '@/lib/planning/tariffs.server';
import type { CustomerCreate, CustomerPatch } from './setup-schemas';
import { createAudited, editVersioned } from './versioned-edit.server';
import { DEFAULT_TARIFF_TERMS } from '@/lib/planning/tariffs';

export interface CustomerRow {
  id: number;
  name: string;
  contactEmail: string | null;
  country: string | null;
  vatId: string | null;
  active: boolean;
  version: number;
  sites: number;
  binsOnHire: number;
  /** The tariff in force today, or null. */
  terms: { freeDays: number; dailyRate: string; perTripFee: string; lostBinFee: string; currency: string; validFrom: string; validTo: string | null } | null;
}

const CUSTOMER_SQL = `
  SELECT o.id, o.name, o.contact_email AS "contactEmail", o.country, o.vat_id AS "vatId", o.active, o.version,
         (SELECT count(*)::int FROM sites s WHERE s.organisation_id = o.id) AS sites,
         (SELECT count(*)::int FROM assets a WHERE a.customer_id = o.id AND a.status IN ('on_hire', 'awaiting_collection')) AS "binsOnHire",
         (SELECT json_build_object('freeDays', t.free_days, 'dailyRate', t.daily_rate::text, 'perTripFee', t.per_trip_fee::text,
                                   'lostBinFee', t.lost_bin_fee::text, 'currency', t.currency,
                                   'validFrom', to_char(t.valid_from, 'YYYY-MM-DD'), 'validTo', to_char(t.valid_to, 'YYYY-MM-DD'))
            FROM tariffs t WHERE t.customer_id = o.id AND t.valid_from <= $1::date AND (t.valid_to IS NULL OR t.valid_to >= $1::date)) AS terms
    FROM organisations o
   WHERE o.kind = 'customer'`;

/** Today in the operator's zone (the day the terms in force are read for). */
export async function today(): Promise<string> {
  return localDate(new Date(), (await getSettings()).timeZone);
}

export async function listCustomers(): Promise<CustomerRow[]> {
  return sequelize.query<CustomerRow>(`${CUSTOMER_SQL} ORDER BY o.active DESC, lower(o.name), o.id`, { bind: [await today()], type: QueryTypes.SELECT });
}

export async function customerById(id: number): Promise<CustomerRow> {
  const [row] = await sequelize.query<CustomerRow>(`${CUSTOMER_SQL} AND o.id = $2`, { bind: [await today(), id], type: QueryTypes.SELECT });
  if (!row) throw new AppError('not_found', 'There is no such customer.');
  return row;
}

function snapshot(o: Organisation) {
  return { name: o.name, contactEmail: o.contactEmail, country: o.country ?? null, vatId: o.vatId ?? null, active: o.active };
}

/** A new customer and its first tariff, valid from today in the operator's zone. */
export async function createCustomer(input: CustomerCreate, actor: AuditActor): Promise<CustomerRow> {
  const validFrom = await today();
  const id = await createAudited('customer', actor, async (transaction) => {
    const t = input.terms;
    // The organisation's own term columns are kept equal to its first tariff for the readers that still use them.
    const org = await Organisation.create(
      {
        name: input.name,
        kind: 'customer',
        contactEmail: input.contactEmail,
        country: input.country ?? null,
        vatId: input.vatId ?? null,
        freeDays: t.freeDays,
        dailyRate: t.dailyRate,
        tripFee: t.perTripFee,
        lostBinFee: t.lostBinFee,
        currency: t.currency,
      },
      { transaction },
    );
    await addTariff({ customerId: org.id, ...DEFAULT_TARIFF_TERMS, ...t, validFrom, validTo: null }, actor, transaction);
    return { id: org.id, snapshot: snapshot(org), result: org.id };
  });
  return customerById(id);
}

export async function updateCustomer(id: number, patch: CustomerPatch, actor: AuditActor): Promise<CustomerRow> {
  await editVersioned({
    model: Organisation,
    id,
    version: patch.version,
    entityType: 'customer',
    actor,
    notFound: 'There is no such customer.',
    describe: (o) => o.name,
    snapshot,
    apply: (o) => {
      if (o.kind !== 'customer') throw new AppError('not_found', 'There is no such customer.');
      if (patch.name !== undefined) o.name = patch.name;
      if (patch.contactEmail !== undefined) o.contactEmail = patch.contactEmail;
      if (patch.country !== undefined) o.country = patch.country;
      if (patch.vatId !== undefined) o.vatId = patch.vatId;
      if (patch.active !== undefined) o.active = patch.active;
    },
  });
  return customerById(id);
}
