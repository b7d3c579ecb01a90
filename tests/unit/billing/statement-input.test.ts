// The glue between the database and the billing rule: months as periods (month lengths and leap years checked
// against date-fns' endOfMonth, which the code under test does not use), NUMERIC text as minor units (by hand),
// tariff rows as versions, the CSV layouts (amounts as numbers), and corrections added to a period's statement.
import { describe, test, expect } from 'vitest';
import fc from 'fast-check';
import { endOfMonth, format } from 'date-fns';
import { billingMonth, decimalToMinor, issuableFrom, lastClosedMonth, monthOf, tariffVersions, versionInForce, type TariffRow } from '@/lib/billing/statement-input';
import { minorToDecimal, statementLinesCsv, accountingCsv, STATEMENT_LINE_FIELDS } from '@/lib/billing/statement-csv';
import { BillingInputError, statementFor, withCorrections, type StatementLine } from '@/lib/billing/hire-billing';

describe('billing months', () => {
  test('hand-checked months: February in a leap year, December, the year before 2000 refused', () => {
    expect(billingMonth('2028-02')).toEqual({ from: '2028-02-01', to: '2028-02-29' });
    expect(billingMonth('2027-02')).toEqual({ from: '2027-02-01', to: '2027-02-28' });
    expect(billingMonth('2026-12')).toEqual({ from: '2026-12-01', to: '2026-12-31' });
    for (const bad of ['2026-13', '2026-00', '26-10', '2026-1', '1999-12', '2026-10-01', '']) expect(billingMonth(bad)).toBeNull();
    expect(monthOf({ from: '2026-10-01', to: '2026-10-31' })).toBe('2026-10');
    expect(issuableFrom({ from: '2026-12-01', to: '2026-12-31' })).toBe('2027-01-01');
    expect(lastClosedMonth('2027-01-15')).toBe('2026-12');
    expect(lastClosedMonth('2026-12-04')).toBe('2026-11');
  });

  test('every month of 2000–2099 ends where date-fns says it does', () => {
    fc.assert(
      fc.property(fc.integer({ min: 2000, max: 2099 }), fc.integer({ min: 1, max: 12 }), (y, m) => {
        const month = `${y}-${String(m).padStart(2, '0')}`;
        expect(billingMonth(month)!.to).toBe(format(endOfMonth(new Date(y, m - 1, 1)), 'yyyy-MM-dd'));
      }),
    );
  });
});

describe('decimal amounts as minor units', () => {
  test('by hand', () => {
    expect(decimalToMinor('12.50', 'EUR')).toBe(1250);
    expect(decimalToMinor('0.00', 'EUR')).toBe(0);
    expect(decimalToMinor('250', 'EUR')).toBe(25000);
    expect(decimalToMinor('1.5', 'EUR')).toBe(150);
    expect(decimalToMinor('-7.50', 'EUR')).toBe(-750);
    expect(decimalToMinor('1500', 'JPY')).toBe(1500);
    expect(() => decimalToMinor('1.005', 'EUR')).toThrow(/at most/);
    expect(() => decimalToMinor('1.5', 'JPY')).toThrow(/at most/);
    expect(() => decimalToMinor('1e3', 'EUR')).toThrow(/Not an amount/);
    expect(minorToDecimal(1250, 'EUR')).toBe('12.50');
    expect(minorToDecimal(-750, 'EUR')).toBe('-7.50');
    expect(minorToDecimal(5, 'EUR')).toBe('0.05');
    expect(minorToDecimal(1500, 'JPY')).toBe('1500');
  });

  test('minorToDecimal and decimalToMinor undo each other', () => {
    fc.assert(
      fc.property(fc.integer({ min: -1e12, max: 1e12 }), (n) => {
        expect(decimalToMinor(minorToDecimal(n, 'EUR'), 'EUR')).toBe(n);
      }),
    );
  });
});

const ROW: TariffRow = {
  valid_from: '2000-01-01',
  currency: 'EUR',
  free_days: 14,
  daily_rate: '1.50',
  per_trip_fee: '10.00',
  lost_bin_fee: '250.00',
  liner_fee: '4.00',
  stop_fee: '0.00',
  first_day_counts: false,
  last_day_counts: true,
  hire_starts_at: 'delivery',
  hire_stops_at: 'collection',
};

describe('tariff rows as versions', () => {
  test('sorted by first day, amounts in cents, the version in force on a day', () => {
    const versions = tariffVersions([{ ...ROW, valid_from: '2026-10-20', daily_rate: '2.00' }, ROW]);
    expect(versions.map((v) => [v.effectiveFrom, v.dailyRateMinor, v.tripFeeMinor, v.lostBinFeeMinor, v.linerFeeMinor])).toEqual([
      ['2000-01-01', 150, 1000, 25000, 400],
      ['2026-10-20', 200, 1000, 25000, 400],
    ]);
    expect(versionInForce(versions, '1999-12-31')).toBeNull();
    expect(versionInForce(versions, '2026-10-19')!.dailyRateMinor).toBe(150);
    expect(versionInForce(versions, '2026-10-20')!.dailyRateMinor).toBe(200);
    expect(() => tariffVersions([{ ...ROW, valid_from: '20 Oct' }])).toThrow(/not a date/);
  });
});

const line = (over: Partial<StatementLine>): StatementLine => ({
  kind: 'hire',
  binId: 'A1',
  tripId: '7',
  reference: null,
  from: '2026-10-16',
  to: '2026-10-19',
  tripDays: { first: 15, last: 18 },
  quantity: 4,
  unitMinor: 150,
  amountMinor: 600,
  estimated: false,
  photoIds: [],
  text: 'Hire',
  ...over,
});

describe('corrections on a statement', () => {
  test('an adjustment of −6.00 on a 44.00 month at 21 % VAT: net 38.00, tax 7.98, total 45.98 (by hand)', () => {
    const own = statementFor({
      timeZone: 'Europe/Amsterdam',
      period: { from: '2026-11-01', to: '2026-11-30' },
      tariffs: tariffVersions([ROW]),
      trips: [],
      truckRuns: [{ runId: 'CR-1', at: '2026-11-03T12:00:00Z', description: 'Collection', amountMinor: 4400 }],
      tax: { kind: 'rate', rateBasisPoints: 2100 },
    });
    expect(own.totals.netMinor).toBe(4400);
    const out = withCorrections(own, [line({ kind: 'adjustment', tripDays: null, quantity: 1, unitMinor: -600, amountMinor: -600, from: '2026-11-01', to: '2026-11-01' })]);
    expect([out.totals.netMinor, out.totals.taxMinor, out.totals.grossMinor]).toEqual([3800, 798, 4598]);
    expect(out.lines.map((l) => l.kind)).toEqual(['adjustment', 'transport']); // bins first, then the lines without one
    expect(own.lines).toHaveLength(1); // the period's own statement is left as it was
    expect(() => withCorrections(own, [line({})])).toThrow(BillingInputError);
  });
});

describe('CSV layouts', () => {
  test('statement lines: the documented columns, amounts as plain numbers', () => {
    const csv = statementLinesCsv({ id: 42, currency: 'EUR', lines: [{ ...line({}), position: 1 }] });
    const [header, row] = csv.trim().split(/\r?\n/);
    expect(header).toBe(STATEMENT_LINE_FIELDS.join(','));
    expect(row).toBe('42,1,hire,A1,7,,2026-10-16,2026-10-19,15,18,4,1.50,6.00,EUR,false,Hire');
  });

  test('accounting: one row per statement', () => {
    const csv = accountingCsv([
      {
        id: 3,
        customerId: 9,
        customer: 'Kade Chemie',
        period: { from: '2026-10-01', to: '2026-10-31' },
        currency: 'EUR',
        netMinor: 4400,
        taxMinor: 924,
        grossMinor: 5324,
        taxNote: 'VAT 21 % on the net total.',
        customerVatId: null,
        issuedOn: '2026-11-02',
      },
    ]);
    expect(csv.trim().split(/\r?\n/)[1]).toBe('3,9,Kade Chemie,2026-10-01,2026-10-31,44.00,9.24,53.24,EUR,VAT 21 % on the net total.,,2026-11-02');
  });
});
