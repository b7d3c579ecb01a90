/**
 * The empties coming back: how long bins stay on hire, and how many are expected back at each depot per day.
 *
 *   kaplanMeier(spells)                         → the Kaplan–Meier table of days on hire: trips still open
 *                                                 count as "out at least this long" (right-censored)
 *   survivalAt(curve, t)                        → S(t) = P(still out after t days)
 *   probabilityBackBy(curve, a, k)              → P(back within a + k days | out a days) = 1 − S(a+k)/S(a);
 *                                                 null when S(a) = 0 (out longer than every trip seen)
 *   poissonBinomial(ps)                         → exact distribution of a sum of independent Bernoullis
 *   fitReturnModel(trips, asOf)                 → one curve per customer site and bin type, per site, and
 *                                                 pooled, from what was known on `asOf` (nothing later)
 *   forecastReturns(model, binsOut, options)    → per depot and day of the horizon: expected returns with a
 *                                                 10–90 % band, per day and cumulative
 *   usualReturnDepots(trips, asOf)              → the depot each customer site's bins usually come back to
 *
 * Conventions. Days on hire = calendar days from the dispatch date to the return date (both local dates).
 * A bin still out on `asOf` has been out a = asOf − dispatch days and is known only to have T > a (censored
 * at a); at a tie, censored trips are still at risk at that day (the usual Kaplan–Meier convention).
 * The band: each bin out today comes back on a given day (or by it) with its own probability p, bins
 * independently of each other, so the count per depot is Poisson-binomial with mean Σp and variance
 * Σp(1−p). The band is its EXACT 10 % and 90 % quantiles (smallest x with P(X ≤ x) ≥ q), computed by
 * convolution — no normal approximation — so it stays right for the small counts of a single depot.
 * A curve for a site and bin type is used when it rests on at least `minReturns` returned trips, else the
 * site's curve over all types, else the pool of all sites. A bin out longer than any trip of its curve ever
 * lasted (S(a) = 0) is counted in `beyondHistory` and contributes nothing to the expectation: the history has
 * nothing to say about it (it is more likely lost than coming back tomorrow).
 */
import { addDays, daysBetween, isLocalDate } from '@/lib/calendar';
import type { LocalDate } from '@/lib/calendar';

export interface HireSpell {
  /** Days on hire so far (open) or in all (returned). */
  days: number;
  /** True when the bin came back after `days`; false when it is still out (censored). */
  returned: boolean;
}

export interface KaplanMeierRow {
  day: number;
  /** Spells lasting at least `day` days. */
  atRisk: number;
  returned: number;
  censored: number;
  /** S(day): share still out after `day` days. */
  survival: number;
}

export interface SurvivalCurve {
  /** One row per distinct day with a return or a censoring, in day order. */
  rows: KaplanMeierRow[];
  spells: number;
  returns: number;
}

function checkSpell(s: HireSpell, i: number) {
  if (!s || typeof s.days !== 'number' || !Number.isInteger(s.days) || s.days < 0 || typeof s.returned !== 'boolean') {
    throw new RangeError(`spell ${i} must be { days: whole number ≥ 0, returned: boolean } (got ${JSON.stringify(s)})`);
  }
}

export function kaplanMeier(spells: readonly HireSpell[]): SurvivalCurve {
  spells.forEach(checkSpell);
  const byDay = new Map<number, { returned: number; censored: number }>();
  for (const s of spells) {
    const e = byDay.get(s.days) ?? { returned: 0, censored: 0 };
    if (s.returned) e.returned++;
    else e.censored++;
    byDay.set(s.days, e);
  }
  const days = [...byDay.keys()].sort((a, b) => a - b);
  let atRisk = spells.length;
  let survival = 1;
  const rows: KaplanMeierRow[] = [];
  for (const day of days) {
    const { returned, censored } = byDay.get(day)!;
    survival *= 1 - returned / atRisk;
    rows.push({ day, atRisk, returned, censored, survival });
    atRisk -= returned + censored;
  }
  return { rows, spells: spells.length, returns: spells.filter((s) => s.returned).length };
}

/** S(t): the Kaplan–Meier step function (right-continuous; 1 before the first return). */
export function survivalAt(curve: SurvivalCurve, t: number): number {
  let s = 1;
  for (const row of curve.rows) {
    if (row.day > t) break;
    s = row.survival;
  }
  return s;
}

/** P(T ≤ a + k | T > a). Null when S(a) = 0: no trip in the history lasted that long. */
export function probabilityBackBy(curve: SurvivalCurve, daysOut: number, withinDays: number): number | null {
  const sa = survivalAt(curve, daysOut);
  if (sa <= 0) return null;
  return 1 - survivalAt(curve, daysOut + withinDays) / sa;
}

// ---------------------------------------------------------------------------------------------------------
// Sums of independent Bernoullis

export interface CountDistribution {
  /** pmf[i] = P(X = offset + i); mass below offset or past the end is under 1e-15 per trimmed cell. */
  offset: number;
  pmf: number[];
  mean: number;
  variance: number;
}

const TRIM = 1e-15;

/** Exact Poisson-binomial distribution by convolution, one Bernoulli at a time; negligible tails trimmed. */
export function poissonBinomial(ps: readonly number[]): CountDistribution {
  let pmf = [1];
  let offset = 0;
  let mean = 0;
  let variance = 0;
  ps.forEach((p, i) => {
    if (typeof p !== 'number' || !(p >= 0 && p <= 1)) throw new RangeError(`probability ${i} must be in [0, 1] (got ${String(p)})`);
    mean += p;
    variance += p * (1 - p);
    if (p === 0) return;
    if (p === 1) {
      offset++;
      return;
    }
    const next = new Array<number>(pmf.length + 1).fill(0);
    for (let x = 0; x < pmf.length; x++) {
      next[x] += pmf[x] * (1 - p);
      next[x + 1] += pmf[x] * p;
    }
    let lo = 0;
    let hi = next.length;
    while (lo < hi - 1 && next[lo] < TRIM) lo++;
    while (hi - 1 > lo && next[hi - 1] < TRIM) hi--;
    offset += lo;
    pmf = next.slice(lo, hi);
  });
  return { offset, pmf, mean, variance };
}

/** Smallest x with P(X ≤ x) ≥ q. */
export function quantileOf(dist: CountDistribution, q: number): number {
  let cumulative = 0;
  for (let i = 0; i < dist.pmf.length; i++) {
    cumulative += dist.pmf[i];
    if (cumulative >= q - 1e-12) return dist.offset + i;
  }
  return dist.offset + dist.pmf.length - 1;
}

// ---------------------------------------------------------------------------------------------------------
// From trip history to a forecast per depot

export interface TripHistoryRecord {
  siteKey: string;
  binTypeKey: string;
  dispatchedOn: LocalDate;
  /** Null while the trip is open. */
  returnedOn: LocalDate | null;
  /** Depot the bin came back to (when returned). */
  returnDepotKey?: string | null;
}

export interface ReturnModel {
  asOf: LocalDate;
  minReturns: number;
  pooled: SurvivalCurve;
  bySite: Map<string, SurvivalCurve>;
  bySiteAndType: Map<string, SurvivalCurve>;
}

const keyOf = (siteKey: string, binTypeKey: string) => `${siteKey}\u0000${binTypeKey}`;

/** The spell a trip showed on `asOf`, or null when it had not started yet. */
function spellAsOf(trip: TripHistoryRecord, asOf: LocalDate): HireSpell | null {
  if (trip.dispatchedOn > asOf) return null;
  if (trip.returnedOn !== null && trip.returnedOn <= asOf) {
    return { days: Math.max(0, daysBetween(trip.dispatchedOn, trip.returnedOn)), returned: true };
  }
  return { days: daysBetween(trip.dispatchedOn, asOf), returned: false };
}

function checkTrip(t: TripHistoryRecord, i: number) {
  if (!t || typeof t.siteKey !== 'string' || typeof t.binTypeKey !== 'string' || !isLocalDate(t.dispatchedOn) || (t.returnedOn !== null && !isLocalDate(t.returnedOn))) {
    throw new RangeError(`trip ${i} must have siteKey, binTypeKey, dispatchedOn (YYYY-MM-DD) and returnedOn (YYYY-MM-DD or null)`);
  }
  if (t.returnedOn !== null && t.returnedOn < t.dispatchedOn) throw new RangeError(`trip ${i} came back before it left (${t.dispatchedOn} → ${t.returnedOn})`);
}

export function fitReturnModel(trips: readonly TripHistoryRecord[], asOf: LocalDate, { minReturns = 20 } = {}): ReturnModel {
  if (!isLocalDate(asOf)) throw new RangeError(`asOf must be a date YYYY-MM-DD (got ${String(asOf)})`);
  trips.forEach(checkTrip);
  const all: HireSpell[] = [];
  const site = new Map<string, HireSpell[]>();
  const siteType = new Map<string, HireSpell[]>();
  for (const t of trips) {
    const spell = spellAsOf(t, asOf);
    if (!spell) continue;
    all.push(spell);
    const push = (m: Map<string, HireSpell[]>, k: string) => {
      const list = m.get(k);
      if (list) list.push(spell);
      else m.set(k, [spell]);
    };
    push(site, t.siteKey);
    push(siteType, keyOf(t.siteKey, t.binTypeKey));
  }
  const fit = (m: Map<string, HireSpell[]>) => new Map([...m].map(([k, spells]) => [k, kaplanMeier(spells)]));
  return { asOf, minReturns, pooled: kaplanMeier(all), bySite: fit(site), bySiteAndType: fit(siteType) };
}

export type CurveLevel = 'site and bin type' | 'site' | 'all sites';

export function curveFor(model: ReturnModel, siteKey: string, binTypeKey: string): { curve: SurvivalCurve; level: CurveLevel } {
  const st = model.bySiteAndType.get(keyOf(siteKey, binTypeKey));
  if (st && st.returns >= model.minReturns) return { curve: st, level: 'site and bin type' };
  const s = model.bySite.get(siteKey);
  if (s && s.returns >= model.minReturns) return { curve: s, level: 'site' };
  return { curve: model.pooled, level: 'all sites' };
}

export interface BinOut {
  depotKey: string;
  siteKey: string;
  binTypeKey: string;
  dispatchedOn: LocalDate;
}

export interface ForecastDay {
  date: LocalDate;
  /** Returns expected on this day: mean, and the 10 % / 90 % quantiles of the count. */
  expected: number;
  low: number;
  high: number;
  /** Returns expected from tomorrow up to and including this day. */
  cumulativeExpected: number;
  cumulativeLow: number;
  cumulativeHigh: number;
}

export interface DepotForecast {
  depotKey: string;
  binsOut: number;
  /** Bins out longer than their curve's longest trip: no forecast for them. */
  beyondHistory: number;
  days: ForecastDay[];
}

export interface ForecastOptions {
  asOf: LocalDate;
  horizonDays: number;
  /** Quantiles of the band; 10–90 % unless told. */
  band?: [number, number];
}

/** For one bin out `daysOut` days: P(back on day k of the horizon), k = 1..H; null beyond history. */
export function dailyReturnProbabilities(curve: SurvivalCurve, daysOut: number, horizonDays: number): number[] | null {
  const sa = survivalAt(curve, daysOut);
  if (sa <= 0) return null;
  const out: number[] = [];
  let before = sa;
  for (let k = 1; k <= horizonDays; k++) {
    const s = survivalAt(curve, daysOut + k);
    out.push(Math.max(0, (before - s) / sa));
    before = s;
  }
  return out;
}

export function forecastReturns(model: ReturnModel, binsOut: readonly BinOut[], options: ForecastOptions): DepotForecast[] {
  const { asOf, horizonDays } = options;
  const [qLow, qHigh] = options.band ?? [0.1, 0.9];
  if (!isLocalDate(asOf)) throw new RangeError(`asOf must be a date YYYY-MM-DD (got ${String(asOf)})`);
  if (!Number.isInteger(horizonDays) || horizonDays < 1 || horizonDays > 366) throw new RangeError(`horizonDays must be a whole number from 1 to 366 (got ${String(horizonDays)})`);
  if (!(qLow > 0 && qLow < qHigh && qHigh < 1)) throw new RangeError('band must be two quantiles 0 < low < high < 1');

  const byDepot = new Map<string, { binsOut: number; beyondHistory: number; daily: number[][] }>();
  binsOut.forEach((b, i) => {
    if (!b || typeof b.depotKey !== 'string' || !isLocalDate(b.dispatchedOn) || b.dispatchedOn > asOf) {
      throw new RangeError(`bin ${i} must have a depotKey and a dispatchedOn date on or before ${asOf}`);
    }
    const entry = byDepot.get(b.depotKey) ?? { binsOut: 0, beyondHistory: 0, daily: [] };
    byDepot.set(b.depotKey, entry);
    entry.binsOut++;
    const ps = dailyReturnProbabilities(curveFor(model, b.siteKey, b.binTypeKey).curve, daysBetween(b.dispatchedOn, asOf), horizonDays);
    if (ps === null) entry.beyondHistory++;
    else entry.daily.push(ps);
  });

  return [...byDepot]
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
    .map(([depotKey, entry]) => {
      const days: ForecastDay[] = [];
      const cumulative = entry.daily.map(() => 0);
      for (let k = 0; k < horizonDays; k++) {
        const ps = entry.daily.map((d) => d[k]);
        entry.daily.forEach((d, i) => (cumulative[i] = Math.min(1, cumulative[i] + d[k])));
        const day = poissonBinomial(ps);
        const upTo = poissonBinomial(cumulative);
        days.push({
          date: addDays(asOf, k + 1),
          expected: day.mean,
          low: quantileOf(day, qLow),
          high: quantileOf(day, qHigh),
          cumulativeExpected: upTo.mean,
          cumulativeLow: quantileOf(upTo, qLow),
          cumulativeHigh: quantileOf(upTo, qHigh),
        });
      }
      return { depotKey, binsOut: entry.binsOut, beyondHistory: entry.beyondHistory, days };
    });
}

/**
 * The depot each customer site's bins come back to most often (returns known on `asOf`); ties go to the
 * depot named first in sort order. Sites with no return yet are absent: callers fall back to the dispatching
 * depot.
 */
export function usualReturnDepots(trips: readonly TripHistoryRecord[], asOf: LocalDate): Map<string, string> {
  const counts = new Map<string, Map<string, number>>();
  for (const t of trips) {
    if (t.returnedOn === null || t.returnedOn > asOf || !t.returnDepotKey) continue;
    const m = counts.get(t.siteKey) ?? new Map<string, number>();
    counts.set(t.siteKey, m);
    m.set(t.returnDepotKey, (m.get(t.returnDepotKey) ?? 0) + 1);
  }
  const out = new Map<string, string>();
  for (const [siteKey, m] of counts) {
    const best = [...m].sort(([a, ca], [b, cb]) => cb - ca || (a < b ? -1 : a > b ? 1 : 0))[0];
    out.set(siteKey, best[0]);
  }
  return out;
}

// ---------------------------------------------------------------------------------------------------------
// Back-test: forecasts made at past dates against what came back

export interface HistoryTrip extends TripHistoryRecord {
  /** Depot the bin left from (the fallback return depot). */
  dispatchDepotKey: string;
}

/** The bins on hire at the end of `asOf`, each assigned to the depot its site usually returns to. */
export function binsOutAsOf(trips: readonly HistoryTrip[], asOf: LocalDate): BinOut[] {
  const usual = usualReturnDepots(trips, asOf);
  return trips
    .filter((t) => t.dispatchedOn <= asOf && (t.returnedOn === null || t.returnedOn > asOf))
    .map((t) => ({ depotKey: usual.get(t.siteKey) ?? t.dispatchDepotKey, siteKey: t.siteKey, binTypeKey: t.binTypeKey, dispatchedOn: t.dispatchedOn }));
}

export interface BackTestDay {
  asOf: LocalDate;
  depotKey: string;
  date: LocalDate;
  actual: number;
  expected: number;
  low: number;
  high: number;
  inside: boolean;
}

/**
 * For each forecast date: fit on what was known then, forecast the returns of the bins then on hire, and
 * count, per depot and day of the horizon, how many of those bins actually came back there that day.
 */
export function backTestReturns(
  trips: readonly HistoryTrip[],
  asOfDates: readonly LocalDate[],
  { horizonDays, minReturns = 20 }: { horizonDays: number; minReturns?: number },
): { days: BackTestDay[]; insideShare: number } {
  const days: BackTestDay[] = [];
  for (const asOf of asOfDates) {
    const model = fitReturnModel(trips, asOf, { minReturns });
    const out = trips.filter((t) => t.dispatchedOn <= asOf && (t.returnedOn === null || t.returnedOn > asOf));
    const actual = new Map<string, number>();
    for (const t of out) {
      if (t.returnedOn === null || !t.returnDepotKey) continue;
      const key = `${t.returnDepotKey}\u0000${t.returnedOn}`;
      actual.set(key, (actual.get(key) ?? 0) + 1);
    }
    for (const depot of forecastReturns(model, binsOutAsOf(trips, asOf), { asOf, horizonDays })) {
      for (const d of depot.days) {
        const n = actual.get(`${depot.depotKey}\u0000${d.date}`) ?? 0;
        days.push({ asOf, depotKey: depot.depotKey, date: d.date, actual: n, expected: d.expected, low: d.low, high: d.high, inside: n >= d.low && n <= d.high });
      }
    }
  }
  return { days, insideShare: days.length === 0 ? Number.NaN : days.filter((d) => d.inside).length / days.length };
}
