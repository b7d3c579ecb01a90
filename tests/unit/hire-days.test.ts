import { describe, test, expect } from 'vitest';
import { differenceInCalendarDays, parseISO } from 'date-fns';
import { hireDays } from '../../src/lib/hire-days';

// Hand-worked (the delivery day is day 1 — common practice in hire terms), with
// date-fns's differenceInCalendarDays as an independent second opinion (REFERENCES §10).
describe('days on hire and free days left', () => {
  test.each([
    ['2026-11-20', '2026-11-20', 14, 1, 13, false],
    ['2026-11-20', '2026-12-03', 14, 14, 0, false],
    ['2026-11-20', '2026-12-04', 14, 15, -1, true],
    ['2024-02-28', '2024-03-01', 21, 3, 18, false], // leap year: 28, 29 Feb, 1 Mar
    ['2026-10-24', '2026-10-26', 0, 3, -3, true], // across the end of summer time in Europe
  ])('delivered %s, today %s, %i free days → %i days, %i left', (start, today, free, days, left, overdue) => {
    expect(hireDays(start, today, free)).toEqual({ daysOnHire: days, freeDaysLeft: left, overdue });
    expect(differenceInCalendarDays(parseISO(today), parseISO(start)) + 1).toBe(days);
  });
});
