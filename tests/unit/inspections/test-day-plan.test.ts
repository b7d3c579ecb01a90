// Checks the test-day planner: capacity respected, nothing after its due date or before the bin is back,
// as late as allowed, the impossible flagged. Hand-worked cases (calendar worked in the comments; weekdays
// checked with date-fns, which the code does not use), and on random small instances the number of bins
// placed equals a maximum bipartite matching of bins to day slots (an independent computation in this file).
import { describe, test, expect } from 'vitest';
import fc from 'fast-check';
import { getDay, addDays as dfAddDays, format } from 'date-fns';
import { planTestDays, capacityOn, type BinToTest, type TestCapacity } from '@/lib/inspections/test-day-plan';
import { dayOfWeek } from '@/lib/calendar';

const WEEKDAYS_2: TestCapacity = { perWeekday: [0, 2, 2, 2, 2, 2, 0] };

describe('dayOfWeek (date-fns getDay as second opinion)', () => {
  test('known days and a sweep', () => {
    expect(dayOfWeek('2026-12-03')).toBe(4); // a Thursday
    expect(dayOfWeek('2028-02-29')).toBe(2); // a Tuesday
    expect(dayOfWeek('1970-01-01')).toBe(4);
    for (let i = -800; i < 800; i += 7) {
      const d = dfAddDays(new Date(2026, 0, 1), i * 3 + 1);
      expect(dayOfWeek(format(d, 'yyyy-MM-dd'))).toBe(getDay(d));
    }
  });
});

describe('planTestDays: hand-worked', () => {
  test('as late as allowed, never after due, weekends closed', () => {
    // From Thu 2026-12-03. A due Mon 2026-12-07, B due Sun 2026-12-06 → Fri 12-04 (Sat/Sun closed),
    // C due Thu 2026-12-31 (a month end) → 12-31.
    const plan = planTestDays({
      from: '2026-12-03',
      capacity: WEEKDAYS_2,
      bins: [
        { id: 'A', dueOn: '2026-12-07', availableFrom: '2026-12-03' },
        { id: 'B', dueOn: '2026-12-06', availableFrom: '2026-12-03' },
        { id: 'C', dueOn: '2026-12-31', availableFrom: '2026-12-03' },
      ],
    });
    expect(plan.days).toEqual([
      { date: '2026-12-04', binIds: ['B'] },
      { date: '2026-12-07', binIds: ['A'] },
      { date: '2026-12-31', binIds: ['C'] },
    ]);
    expect(plan.flagged).toEqual([]);
  });

  test('capacity pushes the overflow to earlier days; a bin back late goes on the late day', () => {
    // Five bins due Fri 2027-01-29, capacity 2: Fri 29 takes 2, Thu 28 takes 2, Wed 27 takes 1.
    // E is back only on Thu 28, so it must be on 28 or 29: it takes a slot on the 29th first (latest available).
    const bins: BinToTest[] = ['A', 'B', 'C', 'D'].map((id) => ({ id, dueOn: '2027-01-29', availableFrom: '2027-01-04' }));
    bins.push({ id: 'E', dueOn: '2027-01-29', availableFrom: '2027-01-28' });
    const plan = planTestDays({ from: '2027-01-04', capacity: WEEKDAYS_2, bins });
    expect(plan.days).toEqual([
      { date: '2027-01-27', binIds: ['D'] },
      { date: '2027-01-28', binIds: ['B', 'C'] },
      { date: '2027-01-29', binIds: ['E', 'A'] },
    ]);
  });

  test('flags the impossible with why', () => {
    const plan = planTestDays({
      from: '2026-12-03',
      capacity: { perWeekday: [0, 1, 1, 1, 1, 1, 0], closed: ['2026-12-04'] },
      bins: [
        { id: 'lapsed', dueOn: '2026-11-30', availableFrom: '2026-11-01' },
        { id: 'late', dueOn: '2026-12-15', availableFrom: '2026-12-20' },
        // Two bins due Fri 12-04, which is closed, only Thu 12-03 is left, with one slot.
        { id: 'x1', dueOn: '2026-12-04', availableFrom: '2026-12-01' },
        { id: 'x2', dueOn: '2026-12-04', availableFrom: '2026-12-01' },
      ],
    });
    expect(plan.days).toEqual([{ date: '2026-12-03', binIds: ['x1'] }]);
    expect(plan.flagged.map((f) => [f.id, f.code])).toEqual([
      ['lapsed', 'lapsed'],
      ['late', 'back_after_due'],
      ['x2', 'no_capacity'],
    ]);
    expect(plan.flagged[1]!.reason).toMatch(/2026-12-20, after its due date 2026-12-15/);
  });

  test('across the 2028 leap day', () => {
    // Due Tue 2028-02-29, capacity 1 on weekdays: 29 Feb, Mon 28 Feb, Fri 25 Feb.
    const plan = planTestDays({
      from: '2028-02-01',
      capacity: { perWeekday: [0, 1, 1, 1, 1, 1, 0] },
      bins: ['a', 'b', 'c'].map((id) => ({ id, dueOn: '2028-02-29', availableFrom: '2028-02-01' })),
    });
    expect(plan.days.map((d) => d.date)).toEqual(['2028-02-25', '2028-02-28', '2028-02-29']);
  });

  test('capacityOn and bad capacity', () => {
    expect(capacityOn(WEEKDAYS_2, '2026-12-05')).toBe(0); // a Saturday
    expect(capacityOn({ ...WEEKDAYS_2, closed: ['2026-12-07'] }, '2026-12-07')).toBe(0);
    expect(() => planTestDays({ from: '2026-12-03', capacity: { perWeekday: [1, 2] }, bins: [] })).toThrow(/7 weekdays/);
  });
});

/** Maximum matching of bins to (day, slot) pairs by augmenting paths: the most bins any plan can place. */
function maxPlaceable(from: string, capacity: TestCapacity, bins: BinToTest[]): number {
  const slots: string[] = [];
  const last = bins.reduce((l, b) => (b.dueOn > l ? b.dueOn : l), from);
  for (let d = new Date(`${from}T12:00:00`); format(d, 'yyyy-MM-dd') <= last; d = dfAddDays(d, 1)) {
    const day = format(d, 'yyyy-MM-dd');
    for (let k = 0; k < capacityOn(capacity, day); k++) slots.push(day);
  }
  const owner = new Array<number>(slots.length).fill(-1);
  const fits = (b: BinToTest, day: string) => day >= from && day >= b.availableFrom && day <= b.dueOn;
  const tryBin = (i: number, seen: boolean[]): boolean => {
    for (let s = 0; s < slots.length; s++) {
      if (seen[s] || !fits(bins[i]!, slots[s]!)) continue;
      seen[s] = true;
      if (owner[s] === -1 || tryBin(owner[s]!, seen)) {
        owner[s] = i;
        return true;
      }
    }
    return false;
  };
  let n = 0;
  for (let i = 0; i < bins.length; i++) if (tryBin(i, new Array(slots.length).fill(false))) n++;
  return n;
}

describe('planTestDays: properties on random instances', () => {
  test('capacity, windows and the most bins placed', () => {
    const from = '2026-12-01';
    const day = fc.integer({ min: 0, max: 40 }).map((n) => format(dfAddDays(new Date(2026, 11, 1), n), 'yyyy-MM-dd'));
    const bin = fc.record({ due: day, back: day });
    fc.assert(
      fc.property(fc.array(bin, { maxLength: 25 }), fc.array(fc.integer({ min: 0, max: 3 }), { minLength: 7, maxLength: 7 }), (raw, perWeekday) => {
        const bins = raw.map((b, i) => ({ id: `b${i}`, dueOn: b.due, availableFrom: b.back }));
        const capacity = { perWeekday };
        const plan = planTestDays({ from, capacity, bins });
        const byId = new Map(bins.map((b) => [b.id, b]));
        let placed = 0;
        for (const d of plan.days) {
          expect(d.binIds.length).toBeLessThanOrEqual(capacityOn(capacity, d.date));
          for (const id of d.binIds) {
            const b = byId.get(id)!;
            expect(d.date <= b.dueOn && d.date >= b.availableFrom && d.date >= from).toBe(true);
            placed++;
          }
        }
        expect(placed + plan.flagged.length).toBe(bins.length);
        expect(placed).toBe(maxPlaceable(from, capacity, bins));
      }),
      { numRuns: 300 },
    );
  });
});

describe('when a bin out on hire is expected back (returns forecast curve)', () => {
  // Hand-worked on four returned trips of 10, 20, 30 and 40 days (Kaplan–Meier without censoring: S steps down
  // by a quarter at each). Out 15 days: S(15) = 0.75; back within k needs S(15 + k) ≤ 0.375 → S = 0.25 from day 30,
  // so k = 15 (of the trips still possible, 20, 30 and 40 days, the middle one: day 30). Out 45 days: longer than any
  // trip seen → null.
  test('the conditional median, and nothing beyond the history', async () => {
    const { kaplanMeier } = await import('@/lib/planning/returns-forecast');
    const { expectedBackInDays } = await import('@/lib/inspections/test-day-plan');
    const curve = kaplanMeier([10, 20, 30, 40].map((days) => ({ days, returned: true })));
    expect(expectedBackInDays(curve, 0)).toBe(20);
    expect(expectedBackInDays(curve, 15)).toBe(15);
    expect(expectedBackInDays(curve, 45)).toBeNull();
  });
});
