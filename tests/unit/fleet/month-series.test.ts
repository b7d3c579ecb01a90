// Month series for the overview charts, against months counted by hand and date-fns eachMonthOfInterval
// (a date library the module does not use).
import { describe, test, expect } from 'vitest';
import { eachMonthOfInterval, format } from 'date-fns';
import { fillMonths, monthLabel, monthsFrom } from '@/lib/fleet/month-series.ts';

describe('month ranges', () => {
  test('Nov 2025 → Feb 2026 is four months across the year end', () => {
    expect(monthsFrom('2025-11', '2026-02')).toEqual(['2025-11', '2025-12', '2026-01', '2026-02']);
  });

  test('18 months agree with date-fns eachMonthOfInterval', () => {
    const theirs = eachMonthOfInterval({ start: new Date(2025, 6, 1), end: new Date(2026, 11, 1) }).map((d) => format(d, 'yyyy-MM'));
    expect(monthsFrom('2025-07', '2026-12')).toEqual(theirs);
    expect(theirs).toHaveLength(18);
  });

  test('a reversed range is empty; malformed months are refused', () => {
    expect(monthsFrom('2026-03', '2026-02')).toEqual([]);
    expect(() => monthsFrom('2026-13', '2027-01')).toThrow(RangeError);
  });

  test('labels: "Mar 2026"', () => {
    expect(monthLabel('2026-03')).toBe('Mar 2026');
    expect(monthLabel('2026-12')).toBe('Dec 2026');
  });
});

describe('filling the gaps', () => {
  test('months without rows count 0; rows outside the range are ignored; a month twice is added up', () => {
    const rows = [
      { month: '2026-01', dispatched: 4 },
      { month: '2026-03', dispatched: 2, returned: 5 },
      { month: '2026-03', dispatched: 1 },
      { month: '2025-12', dispatched: 99 },
    ];
    expect(fillMonths('2026-01', '2026-03', rows, ['dispatched', 'returned'])).toEqual([
      { month: '2026-01', label: 'Jan 2026', dispatched: 4, returned: 0 },
      { month: '2026-02', label: 'Feb 2026', dispatched: 0, returned: 0 },
      { month: '2026-03', label: 'Mar 2026', dispatched: 3, returned: 5 },
    ]);
  });
});
