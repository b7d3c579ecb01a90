/**
 * Hire billing: one customer's statement lines for one billing period, from the customer's trips and tariff
 * versions. Pure: no clock, no database; the caller passes everything in.
 *
 *   statementFor(input)                                → { lines, totals } for the period
 *   adjustmentLines(issuedLines, recomputedLines, opts) → lines that correct an issued period
 *   withCorrections(statement, corrections)            → the statement with those lines added, totals again
 *   taxTreatmentFor(operatorCountry, customer, rate)   → a tax rate, or reverse charge
 *
 * The rules (hire terms are the customer's tariff; no single published source — common practice in equipment
 * hire unless said otherwise):
 *   - Dates are local dates in the operator's time zone (`localDate` of calendar.ts, so a DST change never
 *     moves an event to another day); the period is [from, to], both inclusive.
 *   - A trip's terms — when the hire starts (delivery or dispatch), which event stops it (ready-for-collection
 *     notice, collection or depot receipt), whether the first and last day count, the free days and the trip fee —
 *     are those of the tariff version in force on the day the bin was dispatched. The daily rate follows each
 *     day's tariff version, so a rate change mid-period splits a line at the effective date.
 *   - A hire starting at delivery whose delivery was never scanned starts at the dispatch (the earlier date) and
 *     its lines say `estimated`, like the overdue rule. When the stop event a tariff names never happened but a
 *     later one did (no notice, but a collection), the next later one stops the hire. With none, the hire runs
 *     through the period's last day.
 *   - Days are counted by hire-days.ts, the rule the overdue-back check uses. Free days are per trip: the first
 *     `freeDaysPerTrip` counted days of the trip, counted from its start, whichever period they fall in.
 *   - The trip fee is charged in the period holding the trip's start date.
 *   - A bin declared missing at the customer stops its hire on the declaration date (as a stop event) and is
 *     charged the lost-bin fee of the tariff in force that day, in the period of the declaration. When it turns
 *     up, that same fee is credited in the period it was found in; the days it was missing are not charged.
 *   - Liners, truck runs and damage charge-backs are charged in the period of their date at the amounts given
 *     (damage lines carry the repair order and its photo ids).
 *   - Money is integer minor units; rounding is stated once in money.ts (`ROUNDING`): only tax is rounded.
 *   - Bad input is refused with a `BillingInputError` listing every problem; nothing is computed from it.
 */
import { addDays, daysBetween, formatLongDate, isLocalDate, localDate, type LocalDate } from '@/lib/calendar';
import { clipRange, hireDayNumber, hireDayRange, lastFreeDay, type DayCountTerms } from './hire-days';
import { ROUNDING, applyRate, formatMoney, isMinorAmount, minorDigits } from './money';

export type Instant = Date | string;
export type HireStartEvent = 'dispatch' | 'delivery';
export type HireStopEvent = 'ready_notice' | 'collection' | 'depot_receipt';

/** In the order they happen on a trip; a missing one falls back to the next. */
const HIRE_STOP_EVENTS: readonly HireStopEvent[] = ['ready_notice', 'collection', 'depot_receipt'];

export interface TariffVersion extends DayCountTerms {
  /** First local date this version applies to. */
  effectiveFrom: LocalDate;
  currency: string;
  freeDaysPerTrip: number;
  dailyRateMinor: number;
  tripFeeMinor: number;
  lostBinFeeMinor: number;
  hireStartsAt: HireStartEvent;
  hireStopsAt: HireStopEvent;
}

export interface TripRecord {
  tripId: string;
  /** The bin as the customer sees it on its label. */
  binId: string;
  dispatchedAt: Instant;
  deliveredAt: Instant | null;
  readyNoticeAt: Instant | null;
  collectedAt: Instant | null;
  receivedAt: Instant | null;
}

export interface LinerUse {
  tripId: string;
  binId: string;
  at: Instant;
  quantity: number;
  unitPriceMinor: number;
  linerLot: string | null;
}
export interface TruckRun {
  runId: string;
  at: Instant;
  description: string;
  amountMinor: number;
}
export interface DamageChargeBack {
  repairOrderId: string;
  binId: string;
  tripId: string | null;
  at: Instant;
  costMinor: number;
  photoIds: string[];
  description: string;
}
export interface MissingDeclaration {
  tripId: string;
  declaredAt: Instant;
}
export interface FoundAgain {
  tripId: string;
  foundAt: Instant;
}

export type TaxTreatment = { kind: 'rate'; rateBasisPoints: number } | { kind: 'reverse_charge'; customerVatId: string };

export interface BillingPeriod {
  from: LocalDate;
  to: LocalDate;
}

export interface StatementInput {
  timeZone: string;
  period: BillingPeriod;
  tariffs: TariffVersion[];
  /** All trips of the customer that may touch the period (earlier ones too: free days run from the trip's start). */
  trips: TripRecord[];
  liners?: LinerUse[];
  truckRuns?: TruckRun[];
  damages?: DamageChargeBack[];
  /** All declarations of the customer's trips, earlier ones too (a credit needs the fee that was charged). */
  missing?: MissingDeclaration[];
  found?: FoundAgain[];
  tax: TaxTreatment;
}

export type LineKind = 'free_days' | 'hire' | 'trip_fee' | 'liners' | 'transport' | 'damage' | 'lost_bin' | 'lost_bin_credit' | 'adjustment';

export interface StatementLine {
  kind: LineKind;
  binId: string | null;
  tripId: string | null;
  /** Repair order, truck run or liner lot the line stems from. */
  reference: string | null;
  /** Dates the line covers, inclusive (a one-day item has from = to). */
  from: LocalDate;
  to: LocalDate;
  /** For free-day and hire lines: the line's first and last day number within the trip (1 = first counted day). */
  tripDays: { first: number; last: number } | null;
  /** Days for free-day and hire lines, items otherwise. */
  quantity: number;
  unitMinor: number;
  amountMinor: number;
  /** The hire start is the dispatch because the delivery was never scanned. */
  estimated: boolean;
  photoIds: string[];
  text: string;
}

export interface StatementTotals {
  currency: string;
  netMinor: number;
  taxMinor: number;
  grossMinor: number;
  tax: TaxTreatment;
  /** The tax wording printed on the statement and invoice. */
  taxNote: string;
  rounding: string;
}

export interface Statement {
  period: BillingPeriod;
  lines: StatementLine[];
  totals: StatementTotals;
}

export class BillingInputError extends RangeError {
  constructor(readonly problems: string[]) {
    super(`Billing input refused: ${problems.join('; ')}`);
    this.name = 'BillingInputError';
  }
}

/**
 * Reverse charge [memory, not confirmed here]: in the EU, a hire of goods other than means of transport is, between
 * businesses, supplied where the customer is established (VAT Directive 2006/112/EC, Art. 44), and the customer
 * accounts for the VAT (Art. 196); the invoice then shows no VAT, the customer's VAT number and the words
 * "Reverse charge" (Art. 226). Check with the operator's tax adviser before relying on it.
 */
export const REVERSE_CHARGE_NOTE = 'Reverse charge: VAT to be accounted for by the recipient (Art. 196 Directive 2006/112/EC).';

export interface TaxCustomer {
  country: string;
  business: boolean;
  vatId: string | null;
}

/**
 * A business customer with a VAT number in another EU member state than the operator gets reverse charge; anyone
 * else pays the operator's rate. (Customers outside the EU are outside this rule: the caller decides.)
 */
export function taxTreatmentFor(operatorCountry: string, customer: TaxCustomer, rateBasisPoints: number): TaxTreatment {
  const vatId = customer.vatId?.trim() ?? '';
  if (customer.business && vatId !== '' && customer.country.toUpperCase() !== operatorCountry.toUpperCase()) {
    return { kind: 'reverse_charge', customerVatId: vatId };
  }
  return { kind: 'rate', rateBasisPoints };
}

// ---------------------------------------------------------------------------------------------------------------

interface Ctx {
  timeZone: string;
  problems: string[];
}

function dateOf(ctx: Ctx, instant: Instant | null, what: string): LocalDate | null {
  if (instant === null || instant === undefined) return null;
  try {
    return localDate(instant, ctx.timeZone);
  } catch (error) {
    ctx.problems.push(`${what}: ${(error as Error).message}`);
    return null;
  }
}

function requireAmount(ctx: Ctx, value: number, what: string, allowZero = true): void {
  if (!isMinorAmount(value) || value < 0 || (!allowZero && value === 0)) {
    ctx.problems.push(`${what} must be a whole number of minor units ≥ ${allowZero ? 0 : 1}, got ${value}`);
  }
}

function checkTariffs(ctx: Ctx, tariffs: TariffVersion[]): TariffVersion[] {
  if (!Array.isArray(tariffs) || tariffs.length === 0) {
    ctx.problems.push('the customer has no tariff');
    return [];
  }
  const sorted = [...tariffs].sort((a, b) => (a.effectiveFrom < b.effectiveFrom ? -1 : a.effectiveFrom > b.effectiveFrom ? 1 : 0));
  const currencies = new Set(sorted.map((t) => t.currency));
  if (currencies.size > 1) ctx.problems.push(`tariff versions mix currencies (${[...currencies].join(', ')}): one currency per customer`);
  sorted.forEach((t, i) => {
    const what = `tariff from ${t.effectiveFrom}`;
    if (!isLocalDate(t.effectiveFrom)) ctx.problems.push(`tariff ${i + 1}: effective date is not YYYY-MM-DD: ${JSON.stringify(t.effectiveFrom)}`);
    if (i > 0 && sorted[i - 1]!.effectiveFrom === t.effectiveFrom) ctx.problems.push(`two tariff versions take effect on ${t.effectiveFrom}`);
    try {
      minorDigits(t.currency);
    } catch (error) {
      ctx.problems.push(`${what}: ${(error as Error).message}`);
    }
    if (!Number.isInteger(t.freeDaysPerTrip) || t.freeDaysPerTrip < 0 || t.freeDaysPerTrip > 365)
      ctx.problems.push(`${what}: free days must be a whole number 0–365, got ${t.freeDaysPerTrip}`);
    requireAmount(ctx, t.dailyRateMinor, `${what}: daily rate`);
    requireAmount(ctx, t.tripFeeMinor, `${what}: trip fee`);
    requireAmount(ctx, t.lostBinFeeMinor, `${what}: lost-bin fee`);
    if (t.hireStartsAt !== 'dispatch' && t.hireStartsAt !== 'delivery') ctx.problems.push(`${what}: hire starts at dispatch or delivery, got ${JSON.stringify(t.hireStartsAt)}`);
    if (!HIRE_STOP_EVENTS.includes(t.hireStopsAt)) ctx.problems.push(`${what}: hire stops at ${HIRE_STOP_EVENTS.join(', ')}, got ${JSON.stringify(t.hireStopsAt)}`);
    if (typeof t.firstDayCounts !== 'boolean' || typeof t.lastDayCounts !== 'boolean') ctx.problems.push(`${what}: say whether the first and the last day count`);
  });
  return sorted;
}

function versionOn(ctx: Ctx, tariffs: TariffVersion[], date: LocalDate): TariffVersion | null {
  let found: TariffVersion | null = null;
  for (const t of tariffs) if (t.effectiveFrom <= date) found = t;
  if (found === null && tariffs.length > 0) ctx.problems.push(`no tariff is in force on ${date} (the first takes effect on ${tariffs[0]!.effectiveFrom})`);
  return found;
}

function binTrip(binId: string | null, tripId: string | null): string {
  return [binId ? `Bin ${binId}` : null, tripId ? `trip ${tripId}` : null].filter(Boolean).join(', ');
}

function span(from: LocalDate, to: LocalDate): string {
  return from === to ? formatLongDate(from) : `${formatLongDate(from)} – ${formatLongDate(to)}`;
}

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? '' : 's'}`;
}

function inPeriod(period: BillingPeriod, date: LocalDate): boolean {
  return date >= period.from && date <= period.to;
}

interface ResolvedTrip {
  trip: TripRecord;
  terms: TariffVersion;
  startOn: LocalDate;
  stopOn: LocalDate | null;
  estimated: boolean;
  missingOn: LocalDate | null;
}

function resolveTrip(ctx: Ctx, tariffs: TariffVersion[], trip: TripRecord, missingOn: LocalDate | null): ResolvedTrip | null {
  const what = `trip ${trip.tripId}`;
  const dispatchedOn = dateOf(ctx, trip.dispatchedAt, `${what} dispatch`);
  const deliveredOn = dateOf(ctx, trip.deliveredAt, `${what} delivery`);
  const stops: Record<HireStopEvent, LocalDate | null> = {
    ready_notice: dateOf(ctx, trip.readyNoticeAt, `${what} ready-for-collection notice`),
    collection: dateOf(ctx, trip.collectedAt, `${what} collection`),
    depot_receipt: dateOf(ctx, trip.receivedAt, `${what} depot receipt`),
  };
  if (dispatchedOn === null) {
    if (trip.dispatchedAt === null || trip.dispatchedAt === undefined) ctx.problems.push(`${what} has no dispatch`);
    return null;
  }
  const terms = versionOn(ctx, tariffs, dispatchedOn);
  if (terms === null) return null;
  const estimated = terms.hireStartsAt === 'delivery' && deliveredOn === null;
  const startOn = terms.hireStartsAt === 'delivery' && deliveredOn !== null ? deliveredOn : dispatchedOn;
  let stopOn: LocalDate | null = null;
  for (const event of HIRE_STOP_EVENTS.slice(HIRE_STOP_EVENTS.indexOf(terms.hireStopsAt))) {
    if (stops[event] !== null) {
      stopOn = stops[event];
      break;
    }
  }
  if (missingOn !== null && (stopOn === null || missingOn < stopOn)) stopOn = missingOn;
  return { trip, terms, startOn, stopOn, estimated, missingOn };
}

function hireLines(ctx: Ctx, tariffs: TariffVersion[], period: BillingPeriod, r: ResolvedTrip): StatementLine[] {
  const { trip, terms, startOn, stopOn, estimated } = r;
  const range = clipRange(hireDayRange(startOn, stopOn, period.to, terms), period.from, period.to);
  if (range.first === null || range.last === null) return [];
  const freeUntil = lastFreeDay(startOn, terms.freeDaysPerTrip, terms);
  const base = { binId: trip.binId, tripId: trip.tripId, reference: null, estimated, photoIds: [] as string[] };
  const estimatedNote = estimated ? ' (delivery not scanned: counted from the dispatch)' : '';
  const lines: StatementLine[] = [];
  let cursor = range.first;
  while (cursor <= range.last) {
    let segmentEnd = range.last;
    let kind: 'free_days' | 'hire';
    let rate = 0;
    if (cursor <= freeUntil) {
      kind = 'free_days';
      if (freeUntil < segmentEnd) segmentEnd = freeUntil;
    } else {
      kind = 'hire';
      const version = versionOn(ctx, tariffs, cursor);
      if (version === null) return lines;
      rate = version.dailyRateMinor;
      // The next version taking effect inside the segment ends it the day before.
      const next = tariffs.find((t) => t.effectiveFrom > cursor && t.effectiveFrom <= segmentEnd);
      if (next) segmentEnd = addDays(next.effectiveFrom, -1);
    }
    const days = daysBetween(cursor, segmentEnd) + 1;
    const tripDays = { first: hireDayNumber(startOn, cursor, terms), last: hireDayNumber(startOn, segmentEnd, terms) };
    const dayWords = tripDays.first === tripDays.last ? `day ${tripDays.first}` : `days ${tripDays.first}–${tripDays.last}`;
    const text =
      kind === 'free_days'
        ? `${binTrip(trip.binId, trip.tripId)}: ${span(cursor, segmentEnd)}, ${dayWords} of the trip, ${plural(days, 'day')} free (${terms.freeDaysPerTrip} free days per trip)${estimatedNote}`
        : `${binTrip(trip.binId, trip.tripId)}: ${span(cursor, segmentEnd)}, ${dayWords} of the trip, ${plural(days, 'day')} × ${formatMoney(rate, terms.currency)}${estimatedNote}`;
    lines.push({ ...base, kind, from: cursor, to: segmentEnd, tripDays, quantity: days, unitMinor: rate, amountMinor: days * rate, text });
    cursor = addDays(segmentEnd, 1);
  }
  return lines;
}

const KIND_ORDER: LineKind[] = ['free_days', 'hire', 'trip_fee', 'liners', 'lost_bin', 'lost_bin_credit', 'damage', 'transport', 'adjustment'];

function compareLines(a: StatementLine, b: StatementLine): number {
  const keys = (l: StatementLine) => [l.binId === null ? 1 : 0, l.binId ?? '', l.tripId ?? '', l.from, KIND_ORDER.indexOf(l.kind), l.reference ?? ''] as const;
  const ka = keys(a);
  const kb = keys(b);
  for (let i = 0; i < ka.length; i++) {
    if (ka[i]! < kb[i]!) return -1;
    if (ka[i]! > kb[i]!) return 1;
  }
  return 0;
}

function taxNoteOf(tax: TaxTreatment): string {
  if (tax.kind === 'reverse_charge') return `${REVERSE_CHARGE_NOTE} Customer VAT number: ${tax.customerVatId}.`;
  return `VAT ${(tax.rateBasisPoints / 100).toFixed(2).replace(/\.?0+$/, '')} % on the net total.`;
}

function totalsOf(lines: StatementLine[], currency: string, tax: TaxTreatment): StatementTotals {
  const netMinor = lines.reduce((sum, l) => sum + l.amountMinor, 0);
  const taxMinor = tax.kind === 'rate' ? applyRate(netMinor, tax.rateBasisPoints) : 0;
  return { currency, netMinor, taxMinor, grossMinor: netMinor + taxMinor, tax, taxNote: taxNoteOf(tax), rounding: ROUNDING };
}

function checkTax(ctx: Ctx, tax: TaxTreatment): void {
  if (tax?.kind === 'rate') {
    if (!Number.isInteger(tax.rateBasisPoints) || tax.rateBasisPoints < 0 || tax.rateBasisPoints > 10_000) {
      ctx.problems.push(`tax rate must be whole basis points 0–10000 (1900 = 19 %), got ${tax.rateBasisPoints}`);
    }
  } else if (tax?.kind === 'reverse_charge') {
    if (typeof tax.customerVatId !== 'string' || tax.customerVatId.trim() === '') ctx.problems.push("reverse charge needs the customer's VAT number");
  } else {
    ctx.problems.push('tax must be a rate or reverse charge');
  }
}

/** The statement of one customer for one period. Throws BillingInputError on bad input. */
export function statementFor(input: StatementInput): Statement {
  const ctx: Ctx = { timeZone: input.timeZone, problems: [] };
  const { period } = input;
  if (!isLocalDate(period?.from) || !isLocalDate(period?.to)) throw new BillingInputError([`period must be two YYYY-MM-DD dates, got ${JSON.stringify(period)}`]);
  if (period.from > period.to) throw new BillingInputError([`period starts (${period.from}) after it ends (${period.to})`]);
  try {
    localDate(new Date(0), input.timeZone);
  } catch (error) {
    throw new BillingInputError([(error as Error).message]);
  }
  const tariffs = checkTariffs(ctx, input.tariffs);
  checkTax(ctx, input.tax);
  if (ctx.problems.length > 0) throw new BillingInputError(ctx.problems);
  const currency = tariffs[0]!.currency;
  const money = (minor: number) => formatMoney(minor, currency);

  const tripsById = new Map<string, TripRecord>();
  for (const trip of input.trips) {
    if (tripsById.has(trip.tripId)) ctx.problems.push(`trip ${trip.tripId} is listed twice`);
    tripsById.set(trip.tripId, trip);
  }
  const missingOn = new Map<string, LocalDate>();
  for (const m of input.missing ?? []) {
    if (!tripsById.has(m.tripId)) ctx.problems.push(`missing declaration for unknown trip ${m.tripId}`);
    if (missingOn.has(m.tripId)) ctx.problems.push(`trip ${m.tripId} is declared missing twice`);
    const on = dateOf(ctx, m.declaredAt, `missing declaration of trip ${m.tripId}`);
    if (on !== null) missingOn.set(m.tripId, on);
  }

  const lines: StatementLine[] = [];
  const resolved = new Map<string, ResolvedTrip>();
  const foundTrips = new Set((input.found ?? []).map((f) => f.tripId));
  for (const trip of input.trips) {
    // A trip received back at a depot before the period, or dispatched after it, has no line in it: skip it
    // before asking which tariff governs it (an old trip from before the first tariff must not block a period).
    const receivedOn = dateOf(ctx, trip.receivedAt, `trip ${trip.tripId} depot receipt`);
    const dispatchedOn = dateOf(ctx, trip.dispatchedAt, `trip ${trip.tripId} dispatch`);
    const outside = (receivedOn !== null && receivedOn < period.from) || (dispatchedOn !== null && dispatchedOn > period.to);
    if (outside && !foundTrips.has(trip.tripId)) continue;
    const r = resolveTrip(ctx, tariffs, trip, missingOn.get(trip.tripId) ?? null);
    if (r === null) continue;
    resolved.set(trip.tripId, r);
    lines.push(...hireLines(ctx, tariffs, period, r));
    if (inPeriod(period, r.startOn) && r.terms.tripFeeMinor > 0) {
      lines.push({
        kind: 'trip_fee',
        binId: trip.binId,
        tripId: trip.tripId,
        reference: null,
        from: r.startOn,
        to: r.startOn,
        tripDays: null,
        quantity: 1,
        unitMinor: r.terms.tripFeeMinor,
        amountMinor: r.terms.tripFeeMinor,
        estimated: r.estimated,
        photoIds: [],
        text: `${binTrip(trip.binId, trip.tripId)}: trip fee, hire started ${formatLongDate(r.startOn)}`,
      });
    }
    if (r.missingOn !== null && inPeriod(period, r.missingOn)) {
      const version = versionOn(ctx, tariffs, r.missingOn);
      if (version) {
        lines.push({
          kind: 'lost_bin',
          binId: trip.binId,
          tripId: trip.tripId,
          reference: null,
          from: r.missingOn,
          to: r.missingOn,
          tripDays: null,
          quantity: 1,
          unitMinor: version.lostBinFeeMinor,
          amountMinor: version.lostBinFeeMinor,
          estimated: false,
          photoIds: [],
          text: `${binTrip(trip.binId, trip.tripId)}: declared missing on ${formatLongDate(r.missingOn)}, lost-bin fee (hire stops that day)`,
        });
      }
    }
  }

  for (const f of input.found ?? []) {
    const r = resolved.get(f.tripId);
    const declaredOn = missingOn.get(f.tripId);
    const foundOn = dateOf(ctx, f.foundAt, `found-again event of trip ${f.tripId}`);
    if (declaredOn === undefined) {
      ctx.problems.push(`trip ${f.tripId} is found again but was never declared missing`);
      continue;
    }
    if (foundOn === null || r === undefined) continue;
    if (foundOn < declaredOn) {
      ctx.problems.push(`trip ${f.tripId} is found again (${foundOn}) before it was declared missing (${declaredOn})`);
      continue;
    }
    if (!inPeriod(period, foundOn)) continue;
    const version = versionOn(ctx, tariffs, declaredOn);
    if (!version) continue;
    lines.push({
      kind: 'lost_bin_credit',
      binId: r.trip.binId,
      tripId: f.tripId,
      reference: null,
      from: foundOn,
      to: foundOn,
      tripDays: null,
      quantity: 1,
      unitMinor: -version.lostBinFeeMinor,
      amountMinor: -version.lostBinFeeMinor,
      estimated: false,
      photoIds: [],
      text: `${binTrip(r.trip.binId, f.tripId)}: found again on ${formatLongDate(foundOn)}, lost-bin fee of ${formatLongDate(declaredOn)} credited`,
    });
  }

  for (const l of input.liners ?? []) {
    const on = dateOf(ctx, l.at, `liners of trip ${l.tripId}`);
    if (!Number.isInteger(l.quantity) || l.quantity < 1) ctx.problems.push(`liners of trip ${l.tripId}: quantity must be a whole number ≥ 1, got ${l.quantity}`);
    requireAmount(ctx, l.unitPriceMinor, `liners of trip ${l.tripId}: unit price`);
    if (on === null || !inPeriod(period, on)) continue;
    lines.push({
      kind: 'liners',
      binId: l.binId,
      tripId: l.tripId,
      reference: l.linerLot,
      from: on,
      to: on,
      tripDays: null,
      quantity: l.quantity,
      unitMinor: l.unitPriceMinor,
      amountMinor: l.quantity * l.unitPriceMinor,
      estimated: false,
      photoIds: [],
      text: `${binTrip(l.binId, l.tripId)}: ${plural(l.quantity, 'liner')}${l.linerLot ? ` (lot ${l.linerLot})` : ''} fitted ${formatLongDate(on)} × ${money(l.unitPriceMinor)}`,
    });
  }

  for (const run of input.truckRuns ?? []) {
    const on = dateOf(ctx, run.at, `truck run ${run.runId}`);
    requireAmount(ctx, run.amountMinor, `truck run ${run.runId}: amount`);
    if (on === null || !inPeriod(period, on)) continue;
    lines.push({
      kind: 'transport',
      binId: null,
      tripId: null,
      reference: run.runId,
      from: on,
      to: on,
      tripDays: null,
      quantity: 1,
      unitMinor: run.amountMinor,
      amountMinor: run.amountMinor,
      estimated: false,
      photoIds: [],
      text: `Truck run ${run.runId} on ${formatLongDate(on)}: ${run.description}`,
    });
  }

  for (const d of input.damages ?? []) {
    const on = dateOf(ctx, d.at, `repair order ${d.repairOrderId}`);
    requireAmount(ctx, d.costMinor, `repair order ${d.repairOrderId}: cost`);
    if (!Array.isArray(d.photoIds)) ctx.problems.push(`repair order ${d.repairOrderId}: photo ids must be a list`);
    if (on === null || !inPeriod(period, on)) continue;
    const photos = d.photoIds.length === 0 ? 'no photos' : plural(d.photoIds.length, 'photo');
    lines.push({
      kind: 'damage',
      binId: d.binId,
      tripId: d.tripId,
      reference: d.repairOrderId,
      from: on,
      to: on,
      tripDays: null,
      quantity: 1,
      unitMinor: d.costMinor,
      amountMinor: d.costMinor,
      estimated: false,
      photoIds: [...d.photoIds],
      text: `${binTrip(d.binId, d.tripId)}: damage repaired under repair order ${d.repairOrderId} (${formatLongDate(on)}, ${photos}): ${d.description}`,
    });
  }

  if (ctx.problems.length > 0) throw new BillingInputError([...new Set(ctx.problems)]);
  lines.sort(compareLines);
  return { period: { ...period }, lines, totals: totalsOf(lines, currency, input.tax) };
}

// --- adjustments ------------------------------------------------------------------------------------------------

export interface AdjustmentOptions {
  /** The issued period the corrections belong to. */
  period: BillingPeriod;
  currency: string;
  /** The date the adjustment lines carry (usually the first day of the period they appear in). */
  on: LocalDate;
  /** Why the past changed, in words (e.g. "collection scanned late on 4 Apr"); added to each line. */
  reason?: string;
}

function groupKey(l: StatementLine): string {
  return [l.kind, l.binId ?? '', l.tripId ?? '', l.reference ?? '', l.unitMinor].join('|');
}

interface Group {
  sample: StatementLine;
  quantity: number;
  amountMinor: number;
  spans: string[];
  from: LocalDate;
  to: LocalDate;
}

function group(lines: StatementLine[]): Map<string, Group> {
  const groups = new Map<string, Group>();
  for (const l of lines) {
    if (l.kind === 'adjustment') continue; // corrections of earlier periods are not part of this period's facts
    const key = groupKey(l);
    const g = groups.get(key) ?? { sample: l, quantity: 0, amountMinor: 0, spans: [], from: l.from, to: l.to };
    g.quantity += l.quantity;
    g.amountMinor += l.amountMinor;
    g.spans.push(span(l.from, l.to));
    if (l.from < g.from) g.from = l.from;
    if (l.to > g.to) g.to = l.to;
    groups.set(key, g);
  }
  return groups;
}

const KIND_WORDS: Record<LineKind, string> = {
  free_days: 'free days',
  hire: 'hire days',
  trip_fee: 'trip fee',
  liners: 'liners',
  transport: 'transport',
  damage: 'damage charge-back',
  lost_bin: 'lost-bin fee',
  lost_bin_credit: 'lost-bin credit',
  adjustment: 'adjustment',
};

function describe(g: Group | undefined, currency: string): string {
  if (!g) return 'nothing';
  const unit = g.sample.kind === 'free_days' || g.sample.kind === 'hire' ? 'day' : 'item';
  return `${plural(g.quantity, unit)} (${g.spans.join(', ')}), ${formatMoney(g.amountMinor, currency)}`;
}

/**
 * Corrections for an issued period: compare the lines as issued with the lines the same period gets now (after a
 * late or voided event) and answer one adjustment line per bin, trip, kind and rate whose days or amount changed.
 * Each line names what it was and what it is now; its amount is the difference. Issued lines never change.
 */
export function adjustmentLines(issued: StatementLine[], recomputed: StatementLine[], opts: AdjustmentOptions): StatementLine[] {
  const before = group(issued);
  const after = group(recomputed);
  const keys = [...new Set([...before.keys(), ...after.keys()])];
  const lines: StatementLine[] = [];
  for (const key of keys) {
    const was = before.get(key);
    const now = after.get(key);
    const wasAmount = was?.amountMinor ?? 0;
    const nowAmount = now?.amountMinor ?? 0;
    if (wasAmount === nowAmount && (was?.quantity ?? 0) === (now?.quantity ?? 0)) continue;
    const sample = (now ?? was)!.sample;
    const rateWords = sample.kind === 'hire' ? ` at ${formatMoney(sample.unitMinor, opts.currency)} a day` : '';
    const subject = [binTrip(sample.binId, sample.tripId), sample.reference ? `ref. ${sample.reference}` : null].filter(Boolean).join(', ');
    const reason = opts.reason ? ` Reason: ${opts.reason}.` : '';
    const diff = nowAmount - wasAmount;
    lines.push({
      kind: 'adjustment',
      binId: sample.binId,
      tripId: sample.tripId,
      reference: sample.reference,
      from: opts.on,
      to: opts.on,
      tripDays: null,
      quantity: 1,
      unitMinor: diff,
      amountMinor: diff,
      estimated: sample.estimated,
      photoIds: [],
      text:
        `Correction to ${span(opts.period.from, opts.period.to)}: ${subject}, ${KIND_WORDS[sample.kind]}${rateWords}: ` +
        `was ${describe(was, opts.currency)}, now ${describe(now, opts.currency)}; difference ${formatMoney(diff, opts.currency)}.${reason}`,
    });
  }
  return lines.sort(compareLines);
}

/**
 * A period's statement with corrections of earlier periods added: the lines in statement order and the totals
 * (tax included) worked out again over all of them, by the same rule as the period's own lines.
 */
export function withCorrections(statement: Statement, corrections: StatementLine[]): Statement {
  if (corrections.some((l) => l.kind !== 'adjustment')) throw new BillingInputError(['only adjustment lines can be added to an issued period']);
  const lines = [...statement.lines, ...corrections].sort(compareLines);
  return { period: { ...statement.period }, lines, totals: totalsOf(lines, statement.totals.currency, statement.totals.tax) };
}
