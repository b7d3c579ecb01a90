import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { resetDatabase, sequelize } from '../support/db';
import { seedDemo } from '@/db/seed/demo';
import { forgetSettings } from '@/lib/settings/settings.server';
import { loadTripHistory } from '@/lib/planning/returns-forecast.server';
import { backTestReturns, binsOutAsOf, fitReturnModel, forecastReturns } from '@/lib/planning/returns-forecast';
import { addDays } from '@/lib/calendar';

const NOW = new Date('2026-12-01T12:00:00Z');

beforeAll(async () => {
  await resetDatabase();
  forgetSettings();
  await seedDemo({ bins: 240, months: 14, now: NOW });
}, 600_000);
afterAll(async () => {
  await sequelize.close();
});

describe('returns forecast on the demo history', () => {
  it('reads every trip, open ones without a return date', async () => {
    const trips = await loadTripHistory();
    expect(trips.length).toBeGreaterThan(240);
    expect(trips.some((t) => t.returnedOn === null)).toBe(true);
    expect(trips.every((t) => t.returnedOn === null || t.returnedOn >= t.dispatchedOn)).toBe(true);
  });

  it('back-test: forecasts made at eight past dates, 14 days ahead — actual returns inside the 10–90 % band on ≥ 80 % of depot-days', async () => {
    const trips = await loadTripHistory();
    // Forecast dates every 3 weeks, the last one 15 days before the end of the history so its horizon is seen.
    const dates = Array.from({ length: 8 }, (_, i) => addDays('2026-11-16', -21 * (7 - i)));
    const { days, insideShare } = backTestReturns(trips, dates, { horizonDays: 14 });
    const below = days.filter((d) => d.actual < d.low).length;
    const above = days.filter((d) => d.actual > d.high).length;
    const expected = days.reduce((s, d) => s + d.expected, 0);
    const actual = days.reduce((s, d) => s + d.actual, 0);
    console.log(
      `returns back-test: ${days.length} depot-days from ${dates[0]} to ${dates[dates.length - 1]}, inside the 10–90 % band ${(insideShare * 100).toFixed(1)} % ` +
        `(below ${below}, above ${above}); expected ${expected.toFixed(1)} returns in all, actual ${actual}`,
    );
    expect(days.length).toBeGreaterThan(8 * 14);
    expect(actual).toBeGreaterThan(50); // enough returns for the figure to mean something
    expect(insideShare).toBeGreaterThanOrEqual(0.8);
    // The expectation is not biased by more than a tenth either way over the whole test.
    expect(Math.abs(expected - actual) / actual).toBeLessThan(0.1);
  });

  it('today: every bin on hire is forecast at some depot', async () => {
    const trips = await loadTripHistory();
    const today = '2026-12-01';
    const out = binsOutAsOf(trips, today);
    const forecast = forecastReturns(fitReturnModel(trips, today), out, { asOf: today, horizonDays: 21 });
    expect(forecast.reduce((s, d) => s + d.binsOut, 0)).toBe(out.length);
    for (const d of forecast) {
      for (const day of d.days) {
        expect(day.low).toBeLessThanOrEqual(day.high);
        expect(day.cumulativeExpected).toBeLessThanOrEqual(d.binsOut - d.beyondHistory + 1e-9);
      }
    }
  });
});
