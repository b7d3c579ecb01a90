// Hire billing against statements worked by hand (the working is in each test's comments), and day counts and
// period splits against date-fns v4 (differenceInCalendarDays, addDays), which the code under test does not use.
// The hire terms themselves (free days per trip, which ends count, lost-bin fee then credit) are common practice
// in equipment hire, no single published source. Europe/Berlin DST dates 2027 (last Sunday of March / October:
// 28 Mar and 31 Oct, switch at 01:00 UTC) are worked from the EU summer-time rule (Directive 2000/84/EC, from
// memory) and checked in the first DST test through Intl, which the code does not use for zones.
import { describe, test, expect } from 'vitest';
import fc from 'fast-check';
import { addDays as fnsAddDays, differenceInCalendarDays, format, parseISO } from 'date-fns';
import {
  BillingInputError,
  REVERSE_CHARGE_NOTE,
  adjustmentLines,
  statementFor,
  taxTreatmentFor,
  type StatementInput,
  type StatementLine,
  type TariffVersion,
  type TripRecord,
} from '@/lib/billing/hire-billing';
import { ROUNDING, applyRate, formatMoney } from '@/lib/billing/money';

const ZONE = 'Europe/Berlin';
const V1: TariffVersion = {
  effectiveFrom: '2027-01-01',
  currency: 'EUR',
  freeDaysPerTrip: 14,
  dailyRateMinor: 250,
  tripFeeMinor: 1500,
  lostBinFeeMinor: 48000,
  hireStartsAt: 'delivery',
  hireStopsAt: 'collection',
  firstDayCounts: false,
  lastDayCounts: true,
};
const V2: TariffVersion = { ...V1, effectiveFrom: '2027-03-20', dailyRateMinor: 300 };
const MARCH = { from: '2027-03-01', to: '2027-03-31' };
const APRIL = { from: '2027-04-01', to: '2027-04-30' };
const VAT19 = { kind: 'rate' as const, rateBasisPoints: 1900 };

function trip(over: Partial<TripRecord> & { tripId: string }): TripRecord {
  return {
    binId: `B-${over.tripId}`,
    dispatchedAt: '2027-02-27T07:00:00+01:00',
    deliveredAt: null,
    readyNoticeAt: null,
    collectedAt: null,
    receivedAt: null,
    ...over,
  };
}

function run(over: Partial<StatementInput>) {
  return statementFor({ timeZone: ZONE, period: MARCH, tariffs: [V1, V2], trips: [], tax: VAT19, ...over });
}

/** The lines reduced to what a customer checks: kind, dates, day numbers, quantity × unit = amount. */
function brief(lines: StatementLine[]) {
  return lines.map((l) => [l.kind, l.tripId, l.from, l.to, l.tripDays ? `${l.tripDays.first}-${l.tripDays.last}` : null, l.quantity, l.unitMinor, l.amountMinor]);
}

describe('statement lines worked by hand', () => {
  test('rate change mid-period splits the line at the effective date; 19 % VAT once on the net', () => {
    // Delivered 1 Mar, collected 31 Mar (after the DST change: +02:00). Default terms: 2 Mar..31 Mar = 30 days.
    // Days 1–14 = 2–15 Mar free; 16–19 Mar at 2.50 (4 × 2.50 = 10.00); from 20 Mar 3.00: 20–31 Mar, 12 × 3.00 = 36.00.
    // Trip fee 15.00 (hire started 1 Mar). Net 61.00; VAT 19 % = 11.59; gross 72.59.
    const s = run({ trips: [trip({ tripId: 'T1', deliveredAt: '2027-03-01T09:00:00+01:00', collectedAt: '2027-03-31T10:00:00+02:00' })] });
    expect(brief(s.lines)).toEqual([
      ['trip_fee', 'T1', '2027-03-01', '2027-03-01', null, 1, 1500, 1500],
      ['free_days', 'T1', '2027-03-02', '2027-03-15', '1-14', 14, 0, 0],
      ['hire', 'T1', '2027-03-16', '2027-03-19', '15-18', 4, 250, 1000],
      ['hire', 'T1', '2027-03-20', '2027-03-31', '19-30', 12, 300, 3600],
    ]);
    expect(s.totals).toMatchObject({ currency: 'EUR', netMinor: 6100, taxMinor: 1159, grossMinor: 7259, taxNote: 'VAT 19 % on the net total.', rounding: ROUNDING });
    expect(s.lines[2]!.text).toBe('Bin B-T1, trip T1: 16 Mar 2027 – 19 Mar 2027, days 15–18 of the trip, 4 days × 2.50 EUR');
    expect(s.lines[1]!.text).toBe('Bin B-T1, trip T1: 2 Mar 2027 – 15 Mar 2027, days 1–14 of the trip, 14 days free (14 free days per trip)');
  });

  test('free days span two periods: counted from the trip start, not per period', () => {
    // Delivered 20 Feb 2027, collected 10 Mar. Day 1 = 21 Feb; 21–28 Feb = days 1–8 (February has 28 days in 2027);
    // 1 Mar = day 9, 6 Mar = day 14 (last free); 7–10 Mar = days 15–18 at 2.50 = 10.00.
    const t = trip({ tripId: 'T2', deliveredAt: '2027-02-20T10:00:00+01:00', collectedAt: '2027-03-10T15:00:00+01:00' });
    const feb = run({ trips: [t], period: { from: '2027-02-01', to: '2027-02-28' } });
    expect(brief(feb.lines)).toEqual([
      ['trip_fee', 'T2', '2027-02-20', '2027-02-20', null, 1, 1500, 1500],
      ['free_days', 'T2', '2027-02-21', '2027-02-28', '1-8', 8, 0, 0],
    ]);
    const mar = run({ trips: [t] });
    expect(brief(mar.lines)).toEqual([
      ['free_days', 'T2', '2027-03-01', '2027-03-06', '9-14', 6, 0, 0],
      ['hire', 'T2', '2027-03-07', '2027-03-10', '15-18', 4, 250, 1000],
    ]);
    // Second opinion (date-fns): 6 Mar is 14 calendar days after 20 Feb; 10 Mar is 18.
    expect(differenceInCalendarDays(parseISO('2027-03-06'), parseISO('2027-02-20'))).toBe(14);
    expect(differenceInCalendarDays(parseISO('2027-03-10'), parseISO('2027-02-20'))).toBe(18);
  });

  test('period clipping: a hire still running is billed through the period end, then goes on next period', () => {
    // Delivered 25 Mar, not collected. March: 26–31 Mar = days 1–6, free. April: 1–8 Apr = days 7–14 free,
    // 9–30 Apr = days 15–36, 22 × 3.00 = 66.00.
    const t = trip({ tripId: 'T3', deliveredAt: '2027-03-25T11:00:00+01:00' });
    expect(brief(run({ trips: [t] }).lines)).toEqual([
      ['trip_fee', 'T3', '2027-03-25', '2027-03-25', null, 1, 1500, 1500],
      ['free_days', 'T3', '2027-03-26', '2027-03-31', '1-6', 6, 0, 0],
    ]);
    const april = run({ trips: [t], period: APRIL });
    expect(brief(april.lines)).toEqual([
      ['free_days', 'T3', '2027-04-01', '2027-04-08', '7-14', 8, 0, 0],
      ['hire', 'T3', '2027-04-09', '2027-04-30', '15-36', 22, 300, 6600],
    ]);
    expect(april.totals).toMatchObject({ netMinor: 6600, taxMinor: 1254, grossMinor: 7854 }); // 66.00 × 19 % = 12.54
  });

  test('DST start (28 Mar 2027): events just after local midnight fall on the Berlin date, not the UTC one', () => {
    // 27 Mar 23:30 UTC = 28 Mar 00:30 CET (+01:00, before the 01:00 UTC switch); 31 Mar 22:30 UTC = 1 Apr 00:30 CEST.
    expect(new Intl.DateTimeFormat('en-CA', { timeZone: ZONE, dateStyle: 'short' }).format(new Date('2027-03-27T23:30:00Z'))).toBe('2027-03-28');
    expect(new Intl.DateTimeFormat('en-CA', { timeZone: ZONE, dateStyle: 'short' }).format(new Date('2027-03-31T22:30:00Z'))).toBe('2027-04-01');
    // No free days, 4.00 a day, default terms: counted 29, 30, 31 Mar (3 days, 12.00) and 1 Apr (1 day, 4.00).
    // By UTC dates it would have been 28–31 Mar, 4 days, all in March.
    const tariff = { ...V1, freeDaysPerTrip: 0, dailyRateMinor: 400, tripFeeMinor: 0 };
    const t = trip({ tripId: 'T4', deliveredAt: '2027-03-27T23:30:00Z', collectedAt: '2027-03-31T22:30:00Z' });
    expect(brief(run({ trips: [t], tariffs: [tariff] }).lines)).toEqual([['hire', 'T4', '2027-03-29', '2027-03-31', '1-3', 3, 400, 1200]]);
    expect(brief(run({ trips: [t], tariffs: [tariff], period: APRIL }).lines)).toEqual([['hire', 'T4', '2027-04-01', '2027-04-01', '4-4', 1, 400, 400]]);
  });

  test('DST end (31 Oct 2027): a 25-hour hire over the change spans two dates and two periods', () => {
    // 30 Oct 22:30 UTC = 31 Oct 00:30 CEST (+02:00); 31 Oct 23:30 UTC = 1 Nov 00:30 CET (+01:00): 25 hours apart.
    // Both ends count, no free days, 4.00 a day: 31 Oct in October, 1 Nov in November.
    const tariff = { ...V1, freeDaysPerTrip: 0, dailyRateMinor: 400, tripFeeMinor: 0, firstDayCounts: true };
    const t = trip({ tripId: 'T5', dispatchedAt: '2027-10-30T06:00:00Z', deliveredAt: '2027-10-30T22:30:00Z', collectedAt: '2027-10-31T23:30:00Z' });
    expect(brief(run({ trips: [t], tariffs: [tariff], period: { from: '2027-10-01', to: '2027-10-31' } }).lines)).toEqual([
      ['hire', 'T5', '2027-10-31', '2027-10-31', '1-1', 1, 400, 400],
    ]);
    expect(brief(run({ trips: [t], tariffs: [tariff], period: { from: '2027-11-01', to: '2027-11-30' } }).lines)).toEqual([
      ['hire', 'T5', '2027-11-01', '2027-11-01', '2-2', 1, 400, 400],
    ]);
  });

  test('a lost bin found again: hire stops at the declaration, fee charged, then credited in the month it turns up', () => {
    // Delivered 1 Mar, declared missing 22 Mar (a stop; last day counts): 2–22 Mar = 21 days; 2–15 free,
    // 16–19 Mar 4 × 2.50 = 10.00, 20–22 Mar 3 × 3.00 = 9.00, trip fee 15.00, lost-bin fee 480.00 → net 514.00,
    // VAT 97.66. Found again 5 Apr: April credits −480.00 (VAT −91.20), no hire for the missing days.
    const input = {
      trips: [trip({ tripId: 'T6', deliveredAt: '2027-03-01T09:00:00+01:00' })],
      missing: [{ tripId: 'T6', declaredAt: '2027-03-22T08:00:00+01:00' }],
      found: [{ tripId: 'T6', foundAt: '2027-04-05T10:00:00+02:00' }],
    };
    const march = run(input);
    expect(brief(march.lines)).toEqual([
      ['trip_fee', 'T6', '2027-03-01', '2027-03-01', null, 1, 1500, 1500],
      ['free_days', 'T6', '2027-03-02', '2027-03-15', '1-14', 14, 0, 0],
      ['hire', 'T6', '2027-03-16', '2027-03-19', '15-18', 4, 250, 1000],
      ['hire', 'T6', '2027-03-20', '2027-03-22', '19-21', 3, 300, 900],
      ['lost_bin', 'T6', '2027-03-22', '2027-03-22', null, 1, 48000, 48000],
    ]);
    expect(march.totals).toMatchObject({ netMinor: 51400, taxMinor: 9766, grossMinor: 61166 });
    const april = run({ ...input, period: APRIL });
    expect(brief(april.lines)).toEqual([['lost_bin_credit', 'T6', '2027-04-05', '2027-04-05', null, 1, -48000, -48000]]);
    expect(april.lines[0]!.text).toBe('Bin B-T6, trip T6: found again on 5 Apr 2027, lost-bin fee of 22 Mar 2027 credited');
    expect(april.totals).toMatchObject({ netMinor: -48000, taxMinor: -9120, grossMinor: -57120 });
  });

  test('which event stops the hire is a tariff term; a missing notice falls back to the collection', () => {
    // Notice 10 Mar, collected 14 Mar, received at the depot 17 Mar; delivered 1 Mar, no free days, 1.00 a day.
    const tariff = { ...V1, freeDaysPerTrip: 0, dailyRateMinor: 100, tripFeeMinor: 0 };
    const t = trip({
      tripId: 'T7',
      deliveredAt: '2027-03-01T09:00:00+01:00',
      readyNoticeAt: '2027-03-10T16:00:00+01:00',
      collectedAt: '2027-03-14T09:00:00+01:00',
      receivedAt: '2027-03-17T12:00:00+01:00',
    });
    const days = (over: Partial<TariffVersion>, tr = t) => run({ trips: [tr], tariffs: [{ ...tariff, ...over }] }).lines.map((l) => [l.from, l.to, l.quantity]);
    expect(days({ hireStopsAt: 'ready_notice' })).toEqual([['2027-03-02', '2027-03-10', 9]]);
    expect(days({ hireStopsAt: 'collection' })).toEqual([['2027-03-02', '2027-03-14', 13]]);
    expect(days({ hireStopsAt: 'depot_receipt' })).toEqual([['2027-03-02', '2027-03-17', 16]]);
    expect(days({ hireStopsAt: 'ready_notice' }, { ...t, readyNoticeAt: null })).toEqual([['2027-03-02', '2027-03-14', 13]]);
    // Hire from dispatch (27 Feb), both ends count: 27 Feb .. 14 Mar, March part 1–14 Mar = days 3–16.
    const fromDispatch = run({ trips: [t], tariffs: [{ ...tariff, hireStartsAt: 'dispatch', firstDayCounts: true }] }).lines;
    expect(brief(fromDispatch)).toEqual([['hire', 'T7', '2027-03-01', '2027-03-14', '3-16', 14, 100, 1400]]);
  });

  test('trips received back before the period or dispatched after it add nothing, even from before the first tariff', () => {
    const s = run({
      tariffs: [{ ...V1, effectiveFrom: '2027-02-01' }],
      trips: [
        trip({ tripId: 'OLD', dispatchedAt: '2027-01-05T08:00:00+01:00', deliveredAt: '2027-01-06T08:00:00+01:00', receivedAt: '2027-01-30T08:00:00+01:00' }),
        trip({ tripId: 'NEXT', dispatchedAt: '2027-04-01T08:00:00+02:00' }),
      ],
    });
    expect(s.lines).toEqual([]);
    expect(s.totals).toMatchObject({ netMinor: 0, taxMinor: 0, grossMinor: 0 });
  });

  test('a delivery never scanned counts from the dispatch and the lines say so', () => {
    const s = run({ trips: [trip({ tripId: 'T8', collectedAt: '2027-03-20T09:00:00+01:00' })] }); // dispatched 27 Feb
    // 28 Feb = day 1 (in February); 1–13 Mar days 2–14 free; 14–19 Mar at 2.50 (6 days), 20 Mar at 3.00.
    expect(brief(s.lines)).toEqual([
      ['free_days', 'T8', '2027-03-01', '2027-03-13', '2-14', 13, 0, 0],
      ['hire', 'T8', '2027-03-14', '2027-03-19', '15-20', 6, 250, 1500],
      ['hire', 'T8', '2027-03-20', '2027-03-20', '21-21', 1, 300, 300],
    ]);
    expect(s.lines.every((l) => l.estimated)).toBe(true);
    expect(s.lines[0]!.text).toContain('delivery not scanned: counted from the dispatch');
  });

  test('liners, truck runs and damage charge-backs land in the period of their date', () => {
    const s = run({
      liners: [
        { tripId: 'T9', binId: 'B-T9', at: '2027-03-03T08:00:00+01:00', quantity: 2, unitPriceMinor: 420, linerLot: 'LL-88' },
        { tripId: 'T9', binId: 'B-T9', at: '2027-04-03T08:00:00+02:00', quantity: 1, unitPriceMinor: 420, linerLot: null },
      ],
      truckRuns: [{ runId: 'R-5', at: '2027-03-31T21:30:00Z', description: 'delivery run, 12 bins', amountMinor: 9500 }], // 21:30 UTC = 23:30 CEST, still 31 Mar
      damages: [
        { repairOrderId: 'RO-9', binId: 'B-T9', tripId: 'T9', at: '2027-03-12T14:00:00+01:00', costMinor: 12_345, photoIds: ['p1', 'p2'], description: 'valve housing cracked' },
      ],
    });
    // 2 × 4.20 = 8.40; run 95.00; repair 123.45 → net 226.85; VAT 19 % = 43.1015 → 43.10; gross 269.95.
    expect(brief(s.lines)).toEqual([
      ['liners', 'T9', '2027-03-03', '2027-03-03', null, 2, 420, 840],
      ['damage', 'T9', '2027-03-12', '2027-03-12', null, 1, 12_345, 12_345],
      ['transport', null, '2027-03-31', '2027-03-31', null, 1, 9500, 9500],
    ]);
    expect(s.lines[1]!.photoIds).toEqual(['p1', 'p2']);
    expect(s.lines[1]!.text).toBe('Bin B-T9, trip T9: damage repaired under repair order RO-9 (12 Mar 2027, 2 photos): valve housing cracked');
    expect(s.totals).toMatchObject({ netMinor: 22_685, taxMinor: 4310, grossMinor: 26_995 });
  });

  test("reverse charge: no VAT, the note and the customer's VAT number on the statement", () => {
    const tax = taxTreatmentFor('DE', { country: 'NL', business: true, vatId: 'NL000099998B57' }, 1900);
    expect(tax).toEqual({ kind: 'reverse_charge', customerVatId: 'NL000099998B57' });
    expect(taxTreatmentFor('DE', { country: 'DE', business: true, vatId: 'DE000000000' }, 1900)).toEqual(VAT19);
    expect(taxTreatmentFor('DE', { country: 'NL', business: false, vatId: null }, 1900)).toEqual(VAT19);
    const s = run({ tax, trips: [trip({ tripId: 'T1', deliveredAt: '2027-03-01T09:00:00+01:00', collectedAt: '2027-03-31T10:00:00+02:00' })] });
    expect(s.totals).toMatchObject({ netMinor: 6100, taxMinor: 0, grossMinor: 6100 });
    expect(s.totals.taxNote).toBe(`${REVERSE_CHARGE_NOTE} Customer VAT number: NL000099998B57.`);
  });
});

describe('money and rounding', () => {
  test('tax rounds half away from zero, once: 2.50 × 19 % = 0.475 → 0.48; −2.50 → −0.48; 0.01 × 19 % → 0.00', () => {
    expect(applyRate(250, 1900)).toBe(48);
    expect(applyRate(-250, 1900)).toBe(-48);
    expect(applyRate(1, 1900)).toBe(0);
    expect(applyRate(Number.MAX_SAFE_INTEGER, 10_000)).toBe(Number.MAX_SAFE_INTEGER);
    expect(() => applyRate(1.5, 1900)).toThrow(RangeError);
    expect(() => applyRate(100, 19.5)).toThrow(RangeError);
  });

  test('formatting: grouping, sign, currencies without minor units', () => {
    expect(formatMoney(123_450, 'EUR')).toBe('1,234.50 EUR');
    expect(formatMoney(-750, 'EUR')).toBe('-7.50 EUR');
    expect(formatMoney(5, 'EUR')).toBe('0.05 EUR');
    expect(formatMoney(1500, 'JPY')).toBe('1,500 JPY');
    expect(() => formatMoney(1, 'euro')).toThrow(RangeError);
  });
});

describe('adjustments for an issued period', () => {
  test('a voided collection scan, the true collection on 25 Mar: one line of −18.00 naming old and new days', () => {
    // Issued: 20–31 Mar, 12 × 3.00 = 36.00. Recomputed: 20–25 Mar, 6 × 3.00 = 18.00. The 2.50 days do not change.
    const issuedTrip = trip({ tripId: 'T1', deliveredAt: '2027-03-01T09:00:00+01:00', collectedAt: '2027-03-31T10:00:00+02:00' });
    const issued = run({ trips: [issuedTrip] }).lines;
    const now = run({ trips: [{ ...issuedTrip, collectedAt: '2027-03-25T10:00:00+01:00' }] }).lines;
    const adjustments = adjustmentLines(issued, now, { period: MARCH, currency: 'EUR', on: '2027-04-01', reason: 'collection scan of 31 Mar voided; collected 25 Mar' });
    expect(brief(adjustments)).toEqual([['adjustment', 'T1', '2027-04-01', '2027-04-01', null, 1, -1800, -1800]]);
    expect(adjustments[0]!.text).toBe(
      'Correction to 1 Mar 2027 – 31 Mar 2027: Bin B-T1, trip T1, hire days at 3.00 EUR a day: ' +
        'was 12 days (20 Mar 2027 – 31 Mar 2027), 36.00 EUR, now 6 days (20 Mar 2027 – 25 Mar 2027), 18.00 EUR; ' +
        'difference -18.00 EUR. Reason: collection scan of 31 Mar voided; collected 25 Mar.',
    );
    // The April statement carries it: the trip has no April days, so April = the adjustment alone.
    const april = run({ trips: [{ ...issuedTrip, collectedAt: '2027-03-25T10:00:00+01:00' }], period: APRIL });
    expect(april.lines).toEqual([]);
    expect(adjustmentLines(issued, issued, { period: MARCH, currency: 'EUR', on: '2027-04-01' })).toEqual([]);
  });

  test('a late delivery scan moves free days: lines that appear or vanish are adjusted too', () => {
    // Issued without a delivery scan (from dispatch 27 Feb): see the estimated test — 14–19 Mar at 2.50 (15.00),
    // 20 Mar at 3.00. Late scan: delivered 2 Mar → counted 3–20 Mar, all 14 free days 3–16 Mar, 17–19 Mar at
    // 2.50 (7.50), 20 Mar at 3.00 (3.00): the 2.50 line drops by 7.50; the trip fee (start 2 Mar) appears, +15.00.
    const before = trip({ tripId: 'T8', collectedAt: '2027-03-20T09:00:00+01:00' });
    const issued = run({ trips: [before] }).lines;
    const now = run({ trips: [{ ...before, deliveredAt: '2027-03-02T10:00:00+01:00' }] }).lines;
    const adjustments = adjustmentLines(issued, now, { period: MARCH, currency: 'EUR', on: '2027-04-01' });
    expect(adjustments.map((a) => [a.amountMinor, a.text.split(': ')[1]])).toEqual([
      [0, 'Bin B-T8, trip T8, free days'],
      [-750, 'Bin B-T8, trip T8, hire days at 2.50 EUR a day'],
      [1500, 'Bin B-T8, trip T8, trip fee'],
    ]);
    expect(adjustments[2]!.text).toContain('was nothing, now 1 item (2 Mar 2027), 15.00 EUR');
  });
});

describe('bad input is refused with every problem named', () => {
  test('no tariff in force, mixed currencies, bad amounts, unknown trips', () => {
    const bad = () =>
      run({
        tariffs: [
          { ...V1, effectiveFrom: '2027-03-10' },
          { ...V2, currency: 'CHF', dailyRateMinor: 2.5 },
        ],
        trips: [trip({ tripId: 'T1', deliveredAt: '2027-03-01T09:00:00+01:00' })],
      });
    expect(bad).toThrow(BillingInputError);
    try {
      bad();
    } catch (error) {
      expect((error as BillingInputError).problems).toEqual([
        'tariff versions mix currencies (EUR, CHF): one currency per customer',
        'tariff from 2027-03-20: daily rate must be a whole number of minor units ≥ 0, got 2.5',
      ]);
    }
    expect(() => run({ tariffs: [{ ...V1, effectiveFrom: '2027-03-10' }], trips: [trip({ tripId: 'T1' })] })).toThrow(
      'no tariff is in force on 2027-02-27 (the first takes effect on 2027-03-10)',
    );
    expect(() => run({ found: [{ tripId: 'T1', foundAt: '2027-03-05T10:00:00Z' }], trips: [trip({ tripId: 'T1' })] })).toThrow(
      'trip T1 is found again but was never declared missing',
    );
    expect(() => run({ trips: [trip({ tripId: 'T1', deliveredAt: '2027-03-01T09:00' })] })).toThrow("trip T1 delivery: Instant needs a 'Z'");
    expect(() => run({ period: { from: '2027-03-31', to: '2027-03-01' } })).toThrow('period starts (2027-03-31) after it ends (2027-03-01)');
    expect(() => run({ timeZone: 'Mars/Olympus' })).toThrow('Unknown time zone');
    expect(() => run({ tax: { kind: 'rate', rateBasisPoints: 19 / 100 } })).toThrow('tax rate must be whole basis points');
  });
});

describe('period splits against date-fns (second opinion)', () => {
  test("monthly statements of random trips add up to the trip's days, free days first, the rate split at its date", () => {
    const iso = (d: Date) => format(d, 'yyyy-MM-dd');
    const months = Array.from({ length: 19 }, (_, i) => {
      const from = new Date(Date.UTC(2026, 11 + i, 1));
      const to = new Date(Date.UTC(2026, 12 + i, 0));
      return { from: from.toISOString().slice(0, 10), to: to.toISOString().slice(0, 10) };
    });
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 300 }),
        fc.integer({ min: 0, max: 200 }),
        fc.integer({ min: 0, max: 40 }),
        fc.integer({ min: 0, max: 300 }),
        fc.boolean(),
        fc.boolean(),
        (startOffset, length, freeDays, changeOffset, firstDayCounts, lastDayCounts) => {
          const start = fnsAddDays(parseISO('2027-01-01'), startOffset);
          const stop = fnsAddDays(start, length);
          const change = fnsAddDays(parseISO('2027-01-02'), changeOffset);
          const tariffs = [
            { ...V1, freeDaysPerTrip: freeDays, firstDayCounts, lastDayCounts, tripFeeMinor: 0, effectiveFrom: '2026-12-01' },
            { ...V1, freeDaysPerTrip: freeDays, firstDayCounts, lastDayCounts, tripFeeMinor: 0, effectiveFrom: iso(change), dailyRateMinor: 300 },
          ];
          const t = trip({ tripId: 'P', dispatchedAt: `${iso(start)}T06:00:00+01:00`, deliveredAt: `${iso(start)}T12:00:00+01:00`, collectedAt: `${iso(stop)}T12:00:00+01:00` });
          const lines = months.flatMap((period) => statementFor({ timeZone: ZONE, period, tariffs, trips: [t], tax: VAT19 }).lines);
          // date-fns working: the counted dates are first..last; free days are the first `freeDays` of them.
          const first = fnsAddDays(start, firstDayCounts ? 0 : 1);
          const last = fnsAddDays(stop, lastDayCounts ? 0 : -1);
          const total = length === 0 ? (firstDayCounts && lastDayCounts ? 1 : 0) : Math.max(0, differenceInCalendarDays(last, first) + 1);
          const sum = (kind: string, unit?: number) => lines.filter((l) => l.kind === kind && (unit === undefined || l.unitMinor === unit)).reduce((n, l) => n + l.quantity, 0);
          expect(sum('free_days') + sum('hire')).toBe(total);
          expect(sum('free_days')).toBe(Math.min(freeDays, total));
          // Charged days before the change: counted dates from day freeDays+1 up to the day before the change.
          const firstCharged = fnsAddDays(first, freeDays);
          const beforeChange =
            length === 0
              ? total > 0 && freeDays === 0 && start < change
                ? 1
                : 0
              : Math.max(0, differenceInCalendarDays(fnsAddDays(last < fnsAddDays(change, -1) ? last : fnsAddDays(change, -1), 1), firstCharged));
          expect(sum('hire', 250)).toBe(beforeChange);
          // No line crosses a month end or the change date, and days never repeat across periods.
          for (const l of lines) {
            expect(l.from.slice(0, 7)).toBe(l.to.slice(0, 7));
            if (l.kind === 'hire') expect(l.from < iso(change) === l.to < iso(change)).toBe(true);
          }
          const dates = lines.map((l) => l.from);
          expect(new Set(dates).size).toBe(dates.length);
        },
      ),
      { numRuns: 150 },
    );
  });
});
