// Monthly statements: read one customer's trips, tariffs, liners, truck stops, charge-backs and missing
// declarations for a month, let `statementFor` (pure) price them, and issue the result once. An issued statement is
// never updated; a later change to a past month (a late scan, a voided event) becomes adjustment lines on the next
// statement, worked out by `adjustmentLines` against what the earlier month was last billed as (`billed_as`).
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { AppError } from '@/lib/api-errors';
import { recordAudit, type AuditActor } from '@/lib/audit.server';
import { localDate, type LocalDate } from '@/lib/calendar';
import { getSettings } from '@/lib/settings/settings.server';
import { repairChargesFor } from '@/lib/inspections/repairs.server';
import {
  BillingInputError,
  adjustmentLines,
  withCorrections,
  statementFor,
  taxTreatmentFor,
  type BillingPeriod,
  type Statement,
  type StatementInput,
  type StatementLine,
} from './hire-billing';
import { billingMonth, issuableFrom, tariffVersions, versionInForce, type TariffRow } from './statement-input';

/** How many earlier issued months a new statement re-checks for late changes (older ones are closed for good). */
export const ADJUSTMENT_LOOKBACK = 12;

export interface BillingCustomer {
  id: number;
  name: string;
  country: string | null;
  vatId: string | null;
}

async function customer(id: number, transaction?: Transaction): Promise<BillingCustomer> {
  const [row] = await sequelize.query<BillingCustomer>(`SELECT id, name, country, vat_id AS "vatId" FROM organisations WHERE id = $1 AND kind = 'customer'`, {
    bind: [id],
    type: QueryTypes.SELECT,
    transaction,
  });
  if (!row) throw new AppError('not_found', 'There is no such customer.');
  return row;
}

async function operatorCountry(transaction?: Transaction): Promise<string> {
  const [row] = await sequelize.query<{ country: string }>(`SELECT country FROM settings WHERE id = 1`, { type: QueryTypes.SELECT, transaction });
  return row?.country ?? 'NL';
}

/** Everything of one customer the rule needs for `period`, as its input. */
export async function statementInput(customerId: number, period: BillingPeriod, transaction?: Transaction): Promise<StatementInput> {
  const settings = await getSettings();
  const who = await customer(customerId, transaction);
  const q = <T extends object>(sql: string, bind: unknown[]) => sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT, transaction });
  // Instants within a day of the period's ends are read generously; the rule places each on its local date.
  const fromTs = `${period.from}T00:00:00Z`;
  const toTs = `${period.to}T23:59:59Z`;
  const [tariffRows, trips, liners, stops, damages, missing, found] = await Promise.all([
    q<TariffRow>(
      `SELECT to_char(valid_from, 'YYYY-MM-DD') AS valid_from, currency, free_days, daily_rate::text, per_trip_fee::text, lost_bin_fee::text,
              liner_fee::text, stop_fee::text, first_day_counts, last_day_counts, hire_starts_at, hire_stops_at
         FROM tariffs WHERE customer_id = $1 ORDER BY valid_from`,
      [customerId],
    ),
    // Trips that may touch the period: dispatched before it ends, not back before it starts (free days run from
    // the trip's start, so an earlier dispatch still matters).
    q<{ id: number; serial: string; dispatched_at: Date; delivered_at: Date | null; ready_at: Date | null; collected_at: Date | null; returned_at: Date | null }>(
      `SELECT t.id, a.serial, t.dispatched_at, t.delivered_at, t.collected_at, t.returned_at,
              (SELECT min(e.occurred_at) FROM scan_events e WHERE e.trip_id = t.id AND e.action = 'fold' AND e.voided_at IS NULL) AS ready_at
         FROM trips t JOIN assets a ON a.id = t.asset_id
        WHERE t.customer_id = $1 AND t.dispatched_at <= $3::timestamptz + interval '1 day'
          AND (t.returned_at IS NULL OR t.returned_at >= $2::timestamptz - interval '1 day')`,
      [customerId, fromTs, toTs],
    ),
    q<{ trip_id: number; serial: string; at: Date; lot: string | null }>(
      `SELECT t.id AS trip_id, a.serial, t.dispatched_at AS at, l.lot_number AS lot
         FROM trips t JOIN assets a ON a.id = t.asset_id LEFT JOIN liner_lots l ON l.id = t.liner_lot_id
        WHERE t.customer_id = $1 AND t.liner_lot_id IS NOT NULL AND t.dispatched_at BETWEEN $2::timestamptz - interval '1 day' AND $3::timestamptz + interval '1 day'`,
      [customerId, fromTs, toTs],
    ),
    q<{ run_id: number; reference: string; planned_on: string; site: string }>(
      `SELECT r.id AS run_id, r.reference, to_char(r.planned_on, 'YYYY-MM-DD') AS planned_on, s.name AS site
         FROM truck_runs r JOIN truck_run_stops st ON st.run_id = r.id JOIN sites s ON s.id = st.site_id
        WHERE r.status = 'done' AND s.organisation_id = $1 AND r.planned_on BETWEEN $2::date AND $3::date`,
      [customerId, period.from, period.to],
    ),
    repairChargesFor(customerId, period, transaction),
    q<{ trip_id: number; at: Date }>(
      `SELECT e.trip_id, min(e.occurred_at) AS at FROM scan_events e JOIN trips t ON t.id = e.trip_id
        WHERE t.customer_id = $1 AND e.action = 'mark_missing' AND e.voided_at IS NULL AND e.occurred_at <= $2::timestamptz + interval '1 day'
        GROUP BY e.trip_id`,
      [customerId, toTs],
    ),
    q<{ trip_id: number; at: Date }>(
      `SELECT e.trip_id, min(e.occurred_at) AS at FROM scan_events e JOIN trips t ON t.id = e.trip_id
        WHERE t.customer_id = $1 AND e.action = 'mark_found' AND e.voided_at IS NULL AND e.occurred_at <= $2::timestamptz + interval '1 day'
          AND EXISTS (SELECT 1 FROM scan_events m WHERE m.trip_id = e.trip_id AND m.action = 'mark_missing' AND m.voided_at IS NULL AND m.occurred_at <= e.occurred_at)
        GROUP BY e.trip_id`,
      [customerId, toTs],
    ),
  ]);
  const versions = tariffVersions(tariffRows);
  const priced = (at: Date, pick: (v: (typeof versions)[number]) => number) => {
    const v = versionInForce(versions, localDate(at, settings.timeZone));
    return v ? pick(v) : 0;
  };
  return {
    timeZone: settings.timeZone,
    period,
    tariffs: versions,
    trips: trips.map((t) => ({
      tripId: String(t.id),
      binId: t.serial,
      dispatchedAt: t.dispatched_at,
      deliveredAt: t.delivered_at,
      readyNoticeAt: t.ready_at,
      collectedAt: t.collected_at,
      receivedAt: t.returned_at,
    })),
    liners: liners
      .filter((l) => priced(l.at, (v) => v.linerFeeMinor) > 0)
      .map((l) => ({ tripId: String(l.trip_id), binId: l.serial, at: l.at, quantity: 1, unitPriceMinor: priced(l.at, (v) => v.linerFeeMinor), linerLot: l.lot })),
    truckRuns: stops
      .map((s) => ({
        runId: s.reference,
        at: `${s.planned_on}T12:00:00Z`,
        description: `Collection at ${s.site}`,
        fee: versionInForce(versions, s.planned_on as LocalDate)?.stopFeeMinor ?? 0,
      }))
      .filter((s) => s.fee > 0)
      .map(({ fee, ...s }) => ({ ...s, amountMinor: fee })),
    // Charge-backs are dated at noon of the day the repair ended (the rule reads the local date back).
    damages: damages.map((d) => ({
      repairOrderId: `R-${d.repairOrderId}`,
      binId: d.serial,
      tripId: d.tripId === null ? null : String(d.tripId),
      at: `${d.endedOn}T12:00:00Z`,
      costMinor: d.amountMinor,
      photoIds: d.photoIds.map(String),
      description: d.fault,
    })),
    missing: missing.map((m) => ({ tripId: String(m.trip_id), declaredAt: m.at })),
    found: found.map((f) => ({ tripId: String(f.trip_id), foundAt: f.at })),
    tax: taxTreatmentFor(await operatorCountry(transaction), { country: who.country ?? '', business: true, vatId: who.vatId }, Math.round(settings.taxRate * 10_000)),
  };
}

/** The rule's answer, with its refusals as one clear 400 instead of an error page. */
function priced(input: StatementInput): Statement {
  try {
    return statementFor(input);
  } catch (err) {
    if (err instanceof BillingInputError) throw new AppError('unprocessable', `This month cannot be priced: ${err.problems.join('; ')}.`);
    throw err;
  }
}

interface IssuedRef {
  id: number;
  period_from: string;
  period_to: string;
  currency: string;
  billed_as: StatementLine[];
}

async function earlierIssued(customerId: number, before: LocalDate, transaction?: Transaction): Promise<IssuedRef[]> {
  return sequelize.query<IssuedRef>(
    `SELECT id, to_char(period_from, 'YYYY-MM-DD') AS period_from, to_char(period_to, 'YYYY-MM-DD') AS period_to, currency, billed_as
       FROM statements WHERE customer_id = $1 AND period_from < $2::date ORDER BY period_from DESC LIMIT ${ADJUSTMENT_LOOKBACK}`,
    { bind: [customerId, before], type: QueryTypes.SELECT, transaction },
  );
}

export interface Correction extends StatementLine {
  /** The earlier statement whose month the line corrects. */
  adjusts: number;
}

export interface Draft {
  customer: BillingCustomer;
  period: BillingPeriod;
  statement: Statement;
  corrections: Correction[];
  /** Per corrected earlier statement: the lines its month comes out with now (its next `billed_as`). */
  recomputed: Array<{ id: number; lines: StatementLine[] }>;
}

/** The statement a month would get if issued now: its own lines plus corrections of earlier issued months. */
export async function draftStatement(customerId: number, period: BillingPeriod, transaction?: Transaction): Promise<Draft> {
  const who = await customer(customerId, transaction);
  const own = priced(await statementInput(customerId, period, transaction));
  const recomputed: Draft['recomputed'] = [];
  const corrections: Correction[] = [];
  for (const s of await earlierIssued(customerId, period.from, transaction)) {
    const earlier = { from: s.period_from as LocalDate, to: s.period_to as LocalDate };
    const now = priced(await statementInput(customerId, earlier, transaction)).lines;
    const lines = adjustmentLines(s.billed_as, now, { period: earlier, currency: s.currency, on: period.from });
    if (lines.length === 0) continue;
    recomputed.push({ id: s.id, lines: now });
    corrections.push(...lines.map((l) => ({ ...l, adjusts: s.id })));
  }
  return { customer: who, period, statement: withCorrections(own, corrections), corrections, recomputed };
}

/**
 * Issue a month's statement for a customer: only once the month is over, only once per month (a second try is a
 * conflict), in one transaction that also records what each corrected earlier month is now billed as. The demo
 * seed passes its own transaction and clock.
 */
export async function issueStatement(customerId: number, month: string, actor: AuditActor, opts: { transaction?: Transaction; now?: Date } = {}): Promise<{ id: number }> {
  const period = billingMonth(month);
  if (!period) throw new AppError('validation_failed', 'Give the month as YYYY-MM, e.g. 2027-03.');
  const { timeZone } = await getSettings();
  const today = localDate(opts.now ?? new Date(), timeZone);
  if (today < issuableFrom(period)) throw new AppError('unprocessable', `${month} is not over yet: its statement can be issued from ${issuableFrom(period)}.`);
  if (opts.transaction) return issueIn(opts.transaction, customerId, month, period, actor);
  return sequelize.transaction((transaction) => issueIn(transaction, customerId, month, period, actor));
}

async function issueIn(transaction: Transaction, customerId: number, month: string, period: BillingPeriod, actor: AuditActor): Promise<{ id: number }> {
  // One issuer per customer at a time, so two admins cannot both correct the same earlier month.
  await sequelize.query(`SELECT pg_advisory_xact_lock(hashtext('statement'), $1)`, { bind: [customerId], transaction });
  const [already] = await sequelize.query<{ id: number }>(`SELECT id FROM statements WHERE customer_id = $1 AND period_from = $2::date`, {
    bind: [customerId, period.from],
    type: QueryTypes.SELECT,
    transaction,
  });
  if (already) throw new AppError('duplicate', `The statement for ${month} was issued already (statement ${already.id}).`);
  const draft = await draftStatement(customerId, period, transaction);
  const { statement } = draft;
  const t = statement.totals;
  const ownLines = statement.lines.filter((l) => l.kind !== 'adjustment');
  const [row] = await sequelize.query<{ id: number }>(
    `INSERT INTO statements (customer_id, period_from, period_to, currency, net_minor, tax_minor, gross_minor, tax_kind, tax_rate_bp, customer_vat_id, tax_note, rounding, billed_as, issued_by)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13::jsonb, $14) RETURNING id`,
    {
      bind: [
        customerId,
        period.from,
        period.to,
        t.currency,
        t.netMinor,
        t.taxMinor,
        t.grossMinor,
        t.tax.kind,
        t.tax.kind === 'rate' ? t.tax.rateBasisPoints : null,
        t.tax.kind === 'reverse_charge' ? t.tax.customerVatId : null,
        t.taxNote,
        t.rounding,
        JSON.stringify(ownLines),
        actor.userId,
      ],
      type: QueryTypes.SELECT,
      transaction,
    },
  );
  const id = row!.id;
  const adjusts = new Map<StatementLine, number>(draft.corrections.map((c) => [c, c.adjusts]));
  let position = 0;
  for (const l of statement.lines) {
    position += 1;
    await sequelize.query(
      `INSERT INTO statement_lines (statement_id, position, kind, bin_label, trip_id, reference, from_on, to_on, trip_day_first, trip_day_last,
                                      quantity, unit_minor, amount_minor, estimated, photo_ids, text, adjusts_statement_id)
         VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14, $15::int[], $16, $17)`,
      {
        bind: [
          id,
          position,
          l.kind,
          l.binId,
          l.tripId === null ? null : Number(l.tripId),
          l.reference,
          l.from,
          l.to,
          l.tripDays?.first ?? null,
          l.tripDays?.last ?? null,
          l.quantity,
          l.unitMinor,
          l.amountMinor,
          l.estimated,
          `{${l.photoIds.map(Number).filter(Number.isInteger).join(',')}}`,
          l.text,
          adjusts.get(l) ?? null,
        ],
        transaction,
      },
    );
  }
  for (const r of draft.recomputed) {
    await sequelize.query(`UPDATE statements SET billed_as = $2::jsonb WHERE id = $1`, { bind: [r.id, JSON.stringify(r.lines)], transaction });
  }
  await recordAudit(
    { actor, action: 'statement.issue', entityType: 'statement', entityId: id, after: { customerId, month, grossMinor: t.grossMinor, lines: statement.lines.length } },
    { transaction },
  );
  return { id };
}
