// Report periods chosen on the statistics and reuse pages, against dates worked by hand and date-fns
// (subDays, differenceInCalendarDays), which the module does not use.
import { describe, test, expect } from 'vitest';
import { differenceInCalendarDays, format, parseISO, subDays } from 'date-fns';
import { lastDays, parseReportPeriod, periodPresets } from '@/lib/trips/report-period.ts';

const today = '2026-12-01';

describe('report period', () => {
  test('nothing chosen: the last 365 days, today included (2 Dec 2025 – 1 Dec 2026)', () => {
    expect(parseReportPeriod({}, today)).toEqual({ ok: true, period: { from: '2025-12-02', to: today } });
    expect(format(subDays(parseISO(today), 364), 'yyyy-MM-dd')).toBe('2025-12-02'); // date-fns agrees
  });

  test('only an end: the 365 days before it; only a start: up to today', () => {
    expect(parseReportPeriod({ to: '2026-06-30' }, today)).toEqual({ ok: true, period: { from: '2025-07-01', to: '2026-06-30' } });
    expect(parseReportPeriod({ from: '2026-11-01' }, today)).toEqual({ ok: true, period: { from: '2026-11-01', to: today } });
  });

  test('a period reaching past today, a reversed one, a malformed date or more than 3660 days is refused with the default kept', () => {
    for (const input of [{ to: '2026-12-02' }, { from: '2026-11-02', to: '2026-11-01' }, { from: '2026-02-30' }, { from: '2016-01-01', to: '2026-01-31' }]) {
      const r = parseReportPeriod(input, today);
      expect(r.ok, JSON.stringify(input)).toBe(false);
      expect(r.period).toEqual({ from: '2025-12-02', to: today });
    }
    // 1 Jan 2016 – 31 Jan 2026: 10 × 365 + 3 leap days (2016, 2020, 2024) + 30 + 1 = 3684 days, over the
    // limit; date-fns agrees.
    expect(differenceInCalendarDays(parseISO('2026-01-31'), parseISO('2016-01-01')) + 1).toBe(3684);
  });

  test('presets: last 90 days (3 Sep – 1 Dec), this year so far, the previous calendar year', () => {
    expect(lastDays(today, 90)).toEqual({ from: '2026-09-03', to: today });
    expect(differenceInCalendarDays(parseISO(today), parseISO('2026-09-03')) + 1).toBe(90);
    expect(periodPresets(today).map((p) => [p.label, p.from, p.to])).toEqual([
      ['Last 90 days', '2026-09-03', today],
      ['Last 365 days', '2025-12-02', today],
      ['2026 so far', '2026-01-01', today],
      ['2025', '2025-01-01', '2025-12-31'],
    ]);
  });
});
