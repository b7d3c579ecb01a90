// Checks service-life.ts against ADR 4.1.1.15 [published]: rigid plastics IBCs and composite IBCs with a
// rigid plastics inner receptacle may be used for 5 years from the manufacture of the inner receptacle.
// Reading of this module (policy): the mark carries month and year, so use ends on the last day of the month
// 60 months later. Dates worked by hand; date-fns (not used by the code) as second opinion.
import { describe, test, expect } from 'vitest';
import fc from 'fast-check';
import { addMonths, endOfMonth, format } from 'date-fns';
import { ADR_SERVICE_LIFE_YEARS, NO_SERVICE_LIMIT, fillLimit, serviceLifeEnd, serviceLifePolicyProblems } from '@/lib/inspections/service-life';

const RIGID = { applies: true, years: ADR_SERVICE_LIFE_YEARS };

describe('serviceLifeEnd (ADR 4.1.1.15)', () => {
  test('five years from the inner receptacle, to the end of that month: hand-worked', () => {
    expect(ADR_SERVICE_LIFE_YEARS).toBe(5);
    expect(serviceLifeEnd(RIGID, '2021-03')).toBe('2026-03-31'); // 2021-03 + 60 months = 2026-03
    expect(serviceLifeEnd(RIGID, '2019-02')).toBe('2024-02-29'); // 2024 is a leap year
    expect(serviceLifeEnd(RIGID, '2020-02')).toBe('2025-02-28'); // 2025 is not
    expect(serviceLifeEnd(RIGID, '2095-02')).toBe('2100-02-28'); // 2100: divisible by 100, not by 400
    expect(serviceLifeEnd(RIGID, '2021-12')).toBe('2026-12-31'); // year end
    expect(serviceLifeEnd({ applies: true, years: 3 }, '2024-04')).toBe('2027-04-30'); // a shorter period for a substance
  });

  test('does not apply to a liner-based bin', () => {
    expect(serviceLifeEnd(NO_SERVICE_LIMIT, null)).toBeNull();
    expect(serviceLifeEnd(NO_SERVICE_LIMIT, '2020-01')).toBeNull();
  });

  test('refuses what it cannot read', () => {
    expect(() => serviceLifeEnd(RIGID, null)).toThrow(/inner receptacle/);
    expect(() => serviceLifeEnd(RIGID, '2024-13')).toThrow(RangeError);
    expect(serviceLifePolicyProblems({ applies: true, years: 6 })[0]).toMatch(/at most 5 years/);
    expect(serviceLifePolicyProblems({ applies: true, years: 0 })).toHaveLength(1);
    expect(serviceLifePolicyProblems({ applies: false, years: 99 })).toEqual([]);
  });

  test('date-fns second opinion over a sweep of months', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1950, max: 2150 }), fc.integer({ min: 1, max: 12 }), (year, month) => {
        const ym = `${year}-${String(month).padStart(2, '0')}`;
        expect(serviceLifeEnd(RIGID, ym)).toBe(format(endOfMonth(addMonths(new Date(year, month - 1, 1), 60)), 'yyyy-MM-dd'));
      }),
      { numRuns: 1000 },
    );
  });
});

describe('fillLimit: the earlier of the test due date and the end of use', () => {
  test('literal cases', () => {
    expect(fillLimit('2026-07-31', null)).toEqual({ lastDay: '2026-07-31', because: 'test' });
    expect(fillLimit('2026-07-31', '2026-03-31')).toEqual({ lastDay: '2026-03-31', because: 'service_life' });
    expect(fillLimit('2026-03-31', '2026-03-31')).toEqual({ lastDay: '2026-03-31', because: 'test' });
    expect(fillLimit(null, '2026-03-31')).toEqual({ lastDay: '2026-03-31', because: 'service_life' });
    expect(fillLimit(null, null)).toBeNull();
  });
});

describe('the inner receptacle month a bin keeps', () => {
  // Hand-worked: given → kept; left out under 4.1.1.15 → the bin's own month (common practice: made with it); not under the rule → none.
  test('given, defaulted, or none', async () => {
    const { innerMadeMonthFor } = await import('@/lib/bins/registration-check');
    expect(innerMadeMonthFor('2021-06', '2024-03', true)).toBe('2021-06');
    expect(innerMadeMonthFor(null, '2024-03', true)).toBe('2024-03');
    expect(innerMadeMonthFor('', '2024-03', true)).toBe('2024-03');
    expect(innerMadeMonthFor(null, '2024-03', false)).toBeNull();
  });
  test('a month that is not one is refused on its field', async () => {
    const { checkRegistration } = await import('@/lib/bins/registration-check');
    const r = checkRegistration({ grai: '', manufactureMonth: '2024-03', innerMadeMonth: '2024-13' }, 7);
    expect(r.issues.map((i) => i.field)).toContain('innerMadeMonth');
  });
});
