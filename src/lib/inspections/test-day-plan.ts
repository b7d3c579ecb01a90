/**
 * Test days planned ahead: bins due for their periodic test grouped into days within a depot's daily testing
 * capacity, each test as late as allowed and never after its due date.
 *
 *   planTestDays({ from, capacity, bins }) → { days: [{ date, binIds }], flagged: [{ id, code, reason }] }
 *   capacityOn(capacity, date)             → how many tests the depot can do that day
 *
 * How: a bin can be tested on any day from max(from, the day it is expected at the depot) up to its due date.
 * The planner walks the days backwards from the latest due date and fills each day up to its capacity with
 * the bins whose window contains it, taking first those that become available latest (they cannot go any
 * earlier), then the nearest due date, then the id. For tests of one day each this backward greedy places every
 * bin that any plan could place (the mirror of earliest-deadline-first), and as late as the capacity lets it.
 * Bins that cannot be placed are flagged with why: already lapsed, back only after the due date, or no free
 * slot in the window.
 */
import { addDays, dayOfWeek, isLocalDate, type LocalDate } from '@/lib/calendar';
import { probabilityBackBy, type SurvivalCurve } from '@/lib/planning/returns-forecast';

export interface TestCapacity {
  /** Tests per day by weekday, Sunday first: [0, 8, 8, 8, 8, 6, 0]. */
  perWeekday: readonly number[];
  /** Days the bench is closed (holidays, stock-taking). */
  closed?: readonly LocalDate[];
}

export interface BinToTest {
  id: string;
  dueOn: LocalDate;
  /** The first day it is (expected to be) at the depot: `from` for bins already there. */
  availableFrom: LocalDate;
}

export type PlanFlagCode = 'lapsed' | 'back_after_due' | 'no_capacity';

export interface TestDayPlan {
  days: Array<{ date: LocalDate; binIds: string[] }>;
  flagged: Array<{ id: string; code: PlanFlagCode; reason: string }>;
}

export function capacityProblems(capacity: TestCapacity): string[] {
  if (capacity.perWeekday.length !== 7) return ['give a capacity for each of the 7 weekdays'];
  if (capacity.perWeekday.some((c) => !Number.isInteger(c) || c < 0)) return ['each day’s capacity must be a whole number of tests, 0 or more'];
  return [];
}

export function capacityOn(capacity: TestCapacity, date: LocalDate): number {
  if (capacity.closed?.includes(date)) return 0;
  return capacity.perWeekday[dayOfWeek(date)]!;
}

export function planTestDays(input: { from: LocalDate; capacity: TestCapacity; bins: readonly BinToTest[] }): TestDayPlan {
  const { from, capacity, bins } = input;
  const problems = capacityProblems(capacity);
  if (problems.length) throw new RangeError(`Unusable capacity: ${problems.join('; ')}`);
  if (!isLocalDate(from)) throw new RangeError(`from must be a date: ${JSON.stringify(from)}`);
  const flagged: TestDayPlan['flagged'] = [];
  const open: Array<BinToTest & { start: LocalDate }> = [];
  for (const bin of bins) {
    if (!isLocalDate(bin.dueOn) || !isLocalDate(bin.availableFrom)) throw new RangeError(`bin ${bin.id}: dates must be YYYY-MM-DD`);
    if (bin.dueOn < from) {
      flagged.push({ id: bin.id, code: 'lapsed', reason: `Its test lapsed after ${bin.dueOn}; test it as soon as it is at the depot (it may travel empty to its test).` });
    } else if (bin.availableFrom > bin.dueOn) {
      flagged.push({
        id: bin.id,
        code: 'back_after_due',
        reason: `Expected back on ${bin.availableFrom}, after its due date ${bin.dueOn}: ask for it back sooner or test it where it is.`,
      });
    } else {
      open.push({ ...bin, start: bin.availableFrom > from ? bin.availableFrom : from });
    }
  }
  const byDay = new Map<LocalDate, string[]>();
  let waiting = open;
  if (waiting.length) {
    let day = waiting.reduce((latest, b) => (b.dueOn > latest ? b.dueOn : latest), from);
    const earliest = waiting.reduce((e, b) => (b.start < e ? b.start : e), day);
    while (day >= earliest && waiting.length) {
      const slots = capacityOn(capacity, day);
      if (slots > 0) {
        const fits = waiting
          .filter((b) => b.start <= day && b.dueOn >= day)
          .sort((a, b) => (a.start === b.start ? (a.dueOn === b.dueOn ? a.id.localeCompare(b.id) : a.dueOn < b.dueOn ? -1 : 1) : a.start > b.start ? -1 : 1))
          .slice(0, slots);
        if (fits.length) {
          const taken = new Set(fits.map((b) => b.id));
          byDay.set(
            day,
            fits.map((b) => b.id),
          );
          waiting = waiting.filter((b) => !taken.has(b.id));
        }
      }
      day = addDays(day, -1);
    }
  }
  for (const bin of waiting) {
    flagged.push({ id: bin.id, code: 'no_capacity', reason: `No free test slot between ${bin.start} and its due date ${bin.dueOn}: add a test day or raise the capacity.` });
  }
  const days = [...byDay.entries()].sort(([a], [b]) => (a < b ? -1 : 1)).map(([date, binIds]) => ({ date, binIds }));
  return { days, flagged };
}

/**
 * When a bin out on hire is expected back, from the returns forecast's Kaplan–Meier curve (returns-forecast.ts,
 * not restated here): the fewest further days k with P(back within k days | out `daysOut` days) ≥ `share`
 * (0.5: the conditional median). Null when the curve has nothing to say (out longer than any trip it saw, or
 * the curve never reaches the share): the caller falls back to the trip history's usual days on hire.
 */
export function expectedBackInDays(curve: SurvivalCurve, daysOut: number, share = 0.5): number | null {
  const last = curve.rows.at(-1)?.day ?? 0;
  for (let k = 1; daysOut + k <= last + 1; k += 1) {
    const p = probabilityBackBy(curve, daysOut, k);
    if (p === null) return null;
    if (p >= share) return k;
  }
  return null;
}
