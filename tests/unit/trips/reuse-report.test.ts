// The reuse report's figures against values worked by hand (definitions in src/lib/trips/reuse-report.ts and on
// the page); day counts double-checked with date-fns differenceInCalendarDays, which the module does not use.
import { describe, test, expect } from 'vitest';
import { differenceInCalendarDays, parseISO } from 'date-fns';
import { daysInPool, inPoolDuring, reuseByYear, reuseCsv, reuseSummary, serviceYears, type ReuseBin } from '@/lib/trips/reuse-report.ts';

const today = '2026-12-01';
const period = { from: '2025-12-02', to: today }; // 365 days
const pool = { kind: 'pool' as const };

function bin(serial: string, fields: Partial<ReuseBin> & Pick<ReuseBin, 'commissionedOn'>): ReuseBin {
  return {
    assetId: Number(serial),
    grai: `0952123410010${serial.slice(-1)}${serial}`,
    serial,
    binType: 'FX1000',
    leftOn: null,
    rotationsTotal: 0,
    rotationsByYear: {},
    rotationsInPeriod: 0,
    ...fields,
  };
}

// B1 in service since mid-2024; B2 declared missing on 10 Feb 2026; B3 new in November 2026; B4 retired 1 May 2025.
const B1 = bin('100001', { commissionedOn: '2024-06-15', rotationsTotal: 10, rotationsByYear: { 2024: 3, 2025: 5, 2026: 2 }, rotationsInPeriod: 4 });
const B2 = bin('100002', { commissionedOn: '2025-03-01', leftOn: '2026-02-10', rotationsTotal: 4, rotationsByYear: { 2025: 4 }, rotationsInPeriod: 1 });
const B3 = bin('100010', { commissionedOn: '2026-11-20' });
const B4 = bin('100003', { commissionedOn: '2024-01-10', leftOn: '2025-05-01', rotationsTotal: 6, rotationsByYear: { 2024: 5, 2025: 1 } });
const bins = [B4, B3, B2, B1];
const days = (a: string, b: string) => differenceInCalendarDays(parseISO(b), parseISO(a));

test('days in service, worked by hand, agree with date-fns: 899, 346, 11 and 477', () => {
  // B1 15 Jun 2024 → 15 Jun 2026 = 365 + 365, + 15 (rest of June) + 31 + 31 + 30 + 31 + 30 + 1 = 899
  // B2 1 Mar 2025 → 1 Mar 2026 = 365, less 10 Feb → 1 Mar 2026 (19 days) = 346
  // B4 10 Jan 2024 → 10 Jan 2025 = 366 (2024 is a leap year), + 21 + 28 + 31 + 30 + 1 = 477
  expect([days('2024-06-15', today), days('2025-03-01', '2026-02-10'), days('2026-11-20', today), days('2024-01-10', '2025-05-01')]).toEqual([899, 346, 11, 477]);
  expect(serviceYears(B1, today)).toBeCloseTo(899 / 365, 12);
  expect(serviceYears(B4, today)).toBeCloseTo(477 / 365, 12);
});

test('in the pool during a range: commissioned by its end and not gone before its start', () => {
  expect([B1, B2, B3, B4].map((b) => inPoolDuring(b, period.from, period.to))).toEqual([true, true, true, false]);
  expect(inPoolDuring(B2, '2026-02-10', '2026-02-10')).toBe(true); // the day it went missing still counts
  expect(inPoolDuring(B2, '2026-02-11', '2026-03-01')).toBe(false);
});

test('days in the pool inside a range: B1 all 365, B2 71 (2 Dec → 10 Feb), B3 12 (20 Nov → 1 Dec), B4 none', () => {
  // B2: 30 days of December (2–31) + 31 of January + 10 of February = 71. B3: 20 Nov – 1 Dec = 11 + 1 = 12.
  expect([B1, B2, B3, B4].map((b) => daysInPool(b, period.from, period.to))).toEqual([365, 71, 12, 0]);
  expect(days('2025-12-02', '2026-02-10') + 1).toBe(71); // date-fns agrees
});

describe('the pool', () => {
  test('period: 3 bins in the pool, 2 reused (2/3), 5 rotations over 448 bin-days; since commissioning 20 / 4 = 5', () => {
    const s = reuseSummary(bins, period, today, pool);
    expect(s).toMatchObject({
      days: 365,
      binDays: 448,
      bins: 3,
      binsReused: 2,
      rotations: 5,
      binsEverCommissioned: 4,
      rotationsSinceCommissioning: 20,
      averageRotationsSinceCommissioning: 5,
    });
    expect(s.shareReused).toBeCloseTo(2 / 3, 12);
    // 448 bin-days = 448 / 365 bin-years; 5 / (448 / 365) = 4.07 rotations per bin-year
    expect(s.rotationsPerBinPerYear).toBeCloseTo(5 / (448 / 365), 12);
    // 20 rotations over (899 + 346 + 11 + 477) / 365 = 1733 / 365 service years = 4.21 a year
    expect(s.rotationsPerServiceYear).toBeCloseTo(20 / (1733 / 365), 12);
  });

  test('per calendar year, newest first; this year counted to today (335 days), 2024 has 366', () => {
    // Bin-days: 2026 = B1 335 + B2 41 (1 Jan – 10 Feb) + B3 12 = 388; 2025 = B1 365 + B2 306 (1 Mar – 31 Dec)
    // + B4 121 (1 Jan – 1 May: 31 + 28 + 31 + 30 + 1) = 792; 2024 = B1 200 (15 Jun – 31 Dec: 16 + 31 + 31 + 30
    // + 31 + 30 + 31) + B4 357 (10 Jan – 31 Dec of a leap year: 366 − 9) = 557.
    const years = reuseByYear(bins, today, pool);
    expect(years.map((y) => [y.year, y.from, y.to, y.partial, y.days, y.bins, y.binsReused, y.rotations, y.binDays])).toEqual([
      [2026, '2026-01-01', today, true, 335, 3, 1, 2, 388],
      [2025, '2025-01-01', '2025-12-31', false, 365, 3, 3, 10, 792],
      [2024, '2024-01-01', '2024-12-31', false, 366, 2, 2, 8, 557],
    ]);
    expect(days('2025-03-01', '2025-12-31') + 1).toBe(306);
    expect(days('2024-06-15', '2024-12-31') + 1).toBe(200);
    expect(years[0]!.rotationsPerBinPerYear).toBeCloseTo(2 / (388 / 365), 12);
    expect(years[1]!.shareReused).toBe(1);
    expect(years[1]!.rotationsPerBinPerYear).toBeCloseTo(10 / (792 / 365), 12);
    expect(years[2]!.rotationsPerBinPerYear).toBeCloseTo(8 / (557 / 365), 12);
  });

  test('CSV: one row per bin in the pool during the period, serials in number order', () => {
    const csv = reuseCsv(bins, period, today, pool);
    expect(csv.fields).toEqual([
      'grai',
      'serial',
      'bin_type',
      'commissioned_on',
      'left_pool_on',
      'period_from',
      'period_to',
      'rotations_in_period',
      'rotations_since_commissioning',
      'years_in_service',
      'rotations_per_year_in_service',
    ]);
    // years: 899/365 = 2.463 → 2.46, 10 / 2.463 = 4.060 → 4.06; 346/365 = 0.948 → 0.95, 4 / 0.948 = 4.220 → 4.22; 11/365 = 0.030 → 0.03
    expect(csv.rows).toEqual([
      // counts and rates are numbers (the CSV writer leaves them unquoted), not text
      [B1.grai, '100001', 'FX1000', '2024-06-15', '', period.from, today, 4, 10, 2.46, 4.06],
      [B2.grai, '100002', 'FX1000', '2025-03-01', '2026-02-10', period.from, today, 1, 4, 0.95, 4.22],
      [B3.grai, '100010', 'FX1000', '2026-11-20', '', period.from, today, 0, 0, 0.03, 0],
    ]);
  });

  test('an empty pool: no rates, no years', () => {
    expect(reuseSummary([], period, today, pool)).toMatchObject({
      bins: 0,
      binDays: 0,
      shareReused: null,
      rotationsPerBinPerYear: null,
      averageRotationsSinceCommissioning: null,
      rotationsPerServiceYear: null,
    });
    expect(reuseByYear([], today, pool)).toEqual([]);
  });
});

describe('one customer', () => {
  const customer = { kind: 'customer' as const, name: 'Halden Oils' };
  // The same bins, counting only this customer's rotations: B1 made 2 for them in the period, B2 none.
  const forCustomer = [
    { ...B1, rotationsTotal: 3, rotationsByYear: { 2025: 1, 2026: 2 }, rotationsInPeriod: 2 },
    { ...B2, rotationsTotal: 1, rotationsByYear: { 2025: 1 }, rotationsInPeriod: 0 },
    { ...B3 },
  ];

  test('bins = those that made a rotation for the customer; no share of the pool', () => {
    const s = reuseSummary(forCustomer, period, today, customer);
    expect(s).toMatchObject({
      bins: 1,
      binDays: 365,
      binsReused: 1,
      shareReused: null,
      rotations: 2,
      binsEverCommissioned: 2,
      rotationsSinceCommissioning: 4,
      averageRotationsSinceCommissioning: 2,
    });
    expect(s.rotationsPerBinPerYear).toBeCloseTo(2, 12); // B1 served all 365 days
  });

  test('CSV names the customer on every row and says the counts are theirs', () => {
    const csv = reuseCsv(forCustomer, period, today, customer);
    expect(csv.fields[0]).toBe('customer');
    expect(csv.fields).toContain('rotations_for_customer_in_period');
    expect(csv.rows).toEqual([['Halden Oils', B1.grai, '100001', 'FX1000', '2024-06-15', '', period.from, today, 2, 3, 2.46, 1.22]]);
  });
});
