/**
 * Trip statistics for the planner: how long a rotation takes, how long bins sit at customers and at depots,
 * how much of a period bins spend on hire, and how many rotations a bin makes in a year.
 *
 *   tripDates(trip, timeZone)                     → the trip's steps as local dates in the operator's zone
 *   cycleTimeDays(trip, timeZone)                 → dispatch → return in days, null while the trip is open
 *   dwellAtCustomer(trip, timeZone)               → { days, estimated } delivered → collected, or null
 *   depotGaps(trips, timeZone)                    → DepotGap[] return → next dispatch, per bin
 *   onHireDaysInPeriod(trip, period, timeZone)    → days of the period the trip kept its bin on hire
 *   periodDays(period)                            → days in the period (both ends included)
 *   utilisation(trips, period, timeZone)          → 0–1, on-hire bin-days / (bins × period days)
 *   rotationsPerYear(trips, period, timeZone)     → completed trips per bin, scaled to 365 days
 *   summarise(trips, { groupBy, period, timeZone }) → GroupSummary[] per asset, customer or depot
 *
 * Day conventions (all counts are calendar days in the operator's time zone, never elapsed hours / 24,
 * so a trip across a daylight-saving change counts the same as any other):
 * - A duration is the number of calendar days from the first local date to the second: dispatched and
 *   returned on the same day is 0 days, Monday to Wednesday is 2.
 * - A bin is on hire on the day it is dispatched and on every day up to, not including, the day it comes
 *   back; the return day is a depot day. So one day is never counted twice when a bin comes back and goes
 *   out again the same day, and a bin's cycle times plus its depot gaps add up to the days it has been
 *   in service since its first dispatch.
 * - Periods are { from, to } local dates, both included. An open trip (not yet returned) counts as on hire
 *   up to the end of the period, so callers pass a period that ends no later than today.
 * - A trip belongs to a period when it was on hire on at least one of its days or came back inside it.
 *   Completed trips, the ones that count for cycle time, dwell and rotations, are those that came back
 *   inside the period.
 * - Dwell at the customer runs from delivery to collection. A missed delivery scan falls back to the
 *   dispatch, a missed collection scan to the return; such a dwell is marked `estimated` (it includes
 *   transport days). While the trip has neither collection nor return, dwell is unknown (null).
 * - Records out of order (returned before dispatched, collected before delivered) give null rather than a
 *   negative number; fixing the scans is the event log's job, not the statistics'.
 */
import { daysBetween, localDate } from '@/lib/calendar';
import type { LocalDate } from '@/lib/calendar';

export interface Trip {
  assetId: string;
  customerId: string;
  /** The depot that dispatched the bin on this trip. */
  depotId: string;
  /** ISO instants with 'Z' or an offset. */
  dispatchedAt: string;
  deliveredAt?: string | null;
  collectedAt?: string | null;
  returnedAt?: string | null;
}

export interface Period {
  from: LocalDate;
  to: LocalDate;
}

export interface TripDates {
  dispatched: LocalDate;
  delivered: LocalDate | null;
  collected: LocalDate | null;
  returned: LocalDate | null;
}

export interface DwellAtCustomer {
  days: number;
  /** True when a missed delivery or collection scan was replaced by the dispatch or the return. */
  estimated: boolean;
}

export interface DepotGap {
  assetId: string;
  /** The depot that dispatched the next trip, i.e. where the bin waited. */
  depotId: string;
  returnedOn: LocalDate;
  dispatchedOn: LocalDate;
  days: number;
}

export type GroupBy = 'asset' | 'customer' | 'depot';

export interface SummaryOptions {
  groupBy: GroupBy;
  period: Period;
  timeZone: string;
}

export interface GroupSummary {
  /** The assetId, customerId or depotId the row is about. */
  key: string;
  /** Trips that belong to the period (on hire inside it or returned inside it). */
  trips: number;
  /** Trips returned inside the period. */
  completedTrips: number;
  /** Distinct bins among the group's trips in the period: the denominator of utilisation and rotations. */
  bins: number;
  meanCycleDays: number | null;
  medianCycleDays: number | null;
  meanDwellDays: number | null;
  /** 0–1: on-hire bin-days in the period / (bins × days in the period). */
  utilisation: number;
  rotationsPerBinPerYear: number;
}

const DAYS_PER_YEAR = 365;

function optionalLocalDate(instant: string | null | undefined, timeZone: string): LocalDate | null {
  return instant == null ? null : localDate(instant, timeZone);
}

export function tripDates(trip: Trip, timeZone: string): TripDates {
  return {
    dispatched: localDate(trip.dispatchedAt, timeZone),
    delivered: optionalLocalDate(trip.deliveredAt, timeZone),
    collected: optionalLocalDate(trip.collectedAt, timeZone),
    returned: optionalLocalDate(trip.returnedAt, timeZone),
  };
}

function nonNegativeDaysBetween(from: LocalDate, to: LocalDate): number | null {
  const days = daysBetween(from, to);
  return days < 0 ? null : days;
}

function cycleDaysOf(dates: TripDates): number | null {
  return dates.returned === null ? null : nonNegativeDaysBetween(dates.dispatched, dates.returned);
}

function dwellOf(dates: TripDates): DwellAtCustomer | null {
  const end = dates.collected ?? dates.returned;
  if (end === null) return null;
  const days = nonNegativeDaysBetween(dates.delivered ?? dates.dispatched, end);
  if (days === null) return null;
  return { days, estimated: dates.delivered === null || dates.collected === null };
}

export function cycleTimeDays(trip: Trip, timeZone: string): number | null {
  return cycleDaysOf(tripDates(trip, timeZone));
}

export function dwellAtCustomer(trip: Trip, timeZone: string): DwellAtCustomer | null {
  return dwellOf(tripDates(trip, timeZone));
}

export function periodDays(period: Period): number {
  const days = daysBetween(period.from, period.to) + 1;
  if (days < 1) throw new RangeError(`Period ends before it starts: ${period.from} – ${period.to}`);
  return days;
}

/** The on-hire days of a trip inside the period as [start, end) offsets from period.from; null if none. */
function onHireSpanInPeriod(dates: TripDates, period: Period): [number, number] | null {
  const lengthInDays = periodDays(period);
  const start = Math.max(0, daysBetween(period.from, dates.dispatched));
  const end = Math.min(lengthInDays, dates.returned === null ? lengthInDays : daysBetween(period.from, dates.returned));
  return end > start ? [start, end] : null;
}

function belongsToPeriod(dates: TripDates, period: Period): boolean {
  return onHireSpanInPeriod(dates, period) !== null || returnedInPeriod(dates, period);
}

function returnedInPeriod(dates: TripDates, period: Period): boolean {
  return dates.returned !== null && dates.returned >= period.from && dates.returned <= period.to;
}

export function onHireDaysInPeriod(trip: Trip, period: Period, timeZone: string): number {
  const span = onHireSpanInPeriod(tripDates(trip, timeZone), period);
  return span === null ? 0 : span[1] - span[0];
}

/** Days a bin was on hire in the period; overlapping trips of one bin (bad scans) count each day once. */
function onHireDaysOfOneBin(spans: [number, number][]): number {
  const sorted = [...spans].sort((a, b) => a[0] - b[0]);
  let total = 0;
  let coveredUpTo = 0;
  for (const [start, end] of sorted) {
    const from = Math.max(start, coveredUpTo);
    if (end > from) total += end - from;
    coveredUpTo = Math.max(coveredUpTo, end);
  }
  return total;
}

interface DatedTrip {
  trip: Trip;
  dates: TripDates;
}

function dated(trips: readonly Trip[], timeZone: string): DatedTrip[] {
  return trips.map((trip) => ({ trip, dates: tripDates(trip, timeZone) }));
}

function onHireBinDays(items: readonly DatedTrip[], period: Period): number {
  const spansByBin = new Map<string, [number, number][]>();
  for (const { trip, dates } of items) {
    const span = onHireSpanInPeriod(dates, period);
    if (span === null) continue;
    const spans = spansByBin.get(trip.assetId) ?? [];
    spans.push(span);
    spansByBin.set(trip.assetId, spans);
  }
  let total = 0;
  for (const spans of spansByBin.values()) total += onHireDaysOfOneBin(spans);
  return total;
}

function distinctBins(items: readonly DatedTrip[]): number {
  return new Set(items.map(({ trip }) => trip.assetId)).size;
}

function utilisationOf(inPeriod: readonly DatedTrip[], period: Period): number {
  const bins = distinctBins(inPeriod);
  return bins === 0 ? 0 : onHireBinDays(inPeriod, period) / (bins * periodDays(period));
}

function rotationsOf(inPeriod: readonly DatedTrip[], period: Period): number {
  const bins = distinctBins(inPeriod);
  if (bins === 0) return 0;
  const completed = inPeriod.filter(({ dates }) => returnedInPeriod(dates, period)).length;
  return (completed / bins) * (DAYS_PER_YEAR / periodDays(period));
}

function inPeriodOnly(trips: readonly Trip[], period: Period, timeZone: string): DatedTrip[] {
  return dated(trips, timeZone).filter(({ dates }) => belongsToPeriod(dates, period));
}

/** Share of the period the trips' bins were on hire; bins are those with a trip in the period. 0 if none. */
export function utilisation(trips: readonly Trip[], period: Period, timeZone: string): number {
  return utilisationOf(inPeriodOnly(trips, period, timeZone), period);
}

/** Trips returned in the period per bin, scaled from the period's length to 365 days. 0 if no trips. */
export function rotationsPerYear(trips: readonly Trip[], period: Period, timeZone: string): number {
  return rotationsOf(inPeriodOnly(trips, period, timeZone), period);
}

function instantMs(instant: string): number {
  return new Date(instant).getTime();
}

/** Return → next dispatch for each bin; pairs whose first trip is still open or overlaps the next are skipped. */
export function depotGaps(trips: readonly Trip[], timeZone: string): DepotGap[] {
  const byBin = new Map<string, DatedTrip[]>();
  for (const item of dated(trips, timeZone)) {
    const list = byBin.get(item.trip.assetId) ?? [];
    list.push(item);
    byBin.set(item.trip.assetId, list);
  }
  const gaps: DepotGap[] = [];
  for (const [assetId, list] of byBin) {
    list.sort((a, b) => instantMs(a.trip.dispatchedAt) - instantMs(b.trip.dispatchedAt));
    for (let i = 1; i < list.length; i += 1) {
      const returnedOn = list[i - 1]!.dates.returned;
      const next = list[i]!;
      if (returnedOn === null) continue;
      const days = nonNegativeDaysBetween(returnedOn, next.dates.dispatched);
      if (days === null) continue;
      gaps.push({ assetId, depotId: next.trip.depotId, returnedOn, dispatchedOn: next.dates.dispatched, days });
    }
  }
  return gaps;
}

function mean(values: readonly number[]): number | null {
  return values.length === 0 ? null : values.reduce((sum, value) => sum + value, 0) / values.length;
}

function median(values: readonly number[]): number | null {
  if (values.length === 0) return null;
  const sorted = [...values].sort((a, b) => a - b);
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 === 1 ? sorted[middle]! : (sorted[middle - 1]! + sorted[middle]!) / 2;
}

const GROUP_KEY: Record<GroupBy, (trip: Trip) => string> = {
  asset: (trip) => trip.assetId,
  customer: (trip) => trip.customerId,
  depot: (trip) => trip.depotId,
};

/** One row per asset, customer or depot with a trip in the period, sorted by key. */
export function summarise(trips: readonly Trip[], { groupBy, period, timeZone }: SummaryOptions): GroupSummary[] {
  periodDays(period); // rejects a reversed period before any work
  const groups = new Map<string, DatedTrip[]>();
  for (const item of inPeriodOnly(trips, period, timeZone)) {
    const key = GROUP_KEY[groupBy](item.trip);
    const list = groups.get(key) ?? [];
    list.push(item);
    groups.set(key, list);
  }
  return [...groups.keys()].sort().map((key) => {
    const items = groups.get(key)!;
    const completed = items.filter(({ dates }) => returnedInPeriod(dates, period));
    const cycleDays = completed.map(({ dates }) => cycleDaysOf(dates)).filter((days) => days !== null);
    const dwellDays = completed.map(({ dates }) => dwellOf(dates)?.days ?? null).filter((days) => days !== null);
    return {
      key,
      trips: items.length,
      completedTrips: completed.length,
      bins: distinctBins(items),
      meanCycleDays: mean(cycleDays),
      medianCycleDays: median(cycleDays),
      meanDwellDays: mean(dwellDays),
      utilisation: utilisationOf(items, period),
      rotationsPerBinPerYear: rotationsOf(items, period),
    };
  });
}
