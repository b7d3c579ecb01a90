import { describe, test, expect } from 'vitest';
import { decideRunCommand, editableParts, runCommands, runProgress, RUN_STATUSES, type RunCommand, type RunFacts, type RunStatus } from '@/lib/planning/run-status';
import { runCreateSchema, runPatchSchema, runSuggestQuery } from '@/lib/planning/run-forms';

// Every expectation is written out by hand: the run's rule table in run-status.ts is what is tested.

const facts = (status: RunStatus, extra: Partial<RunFacts> = {}): RunFacts => ({ status, carrier: 'Haulier', stops: 2, received: 0, expected: 20, capacity: 26, ...extra });

type Row = [from: RunStatus, command: RunCommand, extra: Partial<RunFacts>, expected: RunStatus | RegExp];
const ROWS: Row[] = [
  ['planned', 'confirm', {}, 'confirmed'],
  ['planned', 'confirm', { carrier: null }, /Name the carrier/],
  ['planned', 'confirm', { stops: 0 }, /no stops/],
  // Hand-worked: 26 folded bins on the trailer, the stops expect 27 → one too many; exactly 26 fits; unknown capacity is not refused.
  ['planned', 'confirm', { expected: 27 }, /expect 27 bins but one truck takes 26: move 1 to another run or choose a larger trailer/],
  ['planned', 'confirm', { expected: 26 }, 'confirmed'],
  ['planned', 'confirm', { expected: 400, capacity: null }, 'confirmed'],
  ['planned', 'cancel', {}, 'cancelled'],
  ['planned', 'close', {}, /can only: confirm run, cancel run/],
  ['confirmed', 'confirm', {}, /can only: cancel run, close run/],
  ['confirmed', 'cancel', {}, 'cancelled'],
  ['confirmed', 'cancel', { received: 1 }, /1 bin has been received against this run; close it instead/],
  ['confirmed', 'close', { received: 3 }, 'done'],
  ['done', 'cancel', {}, /done and cannot change any more/],
  ['cancelled', 'confirm', {}, /cancelled and cannot change any more/],
];

describe('the run status table', () => {
  test.each(ROWS)('%s + %s %o → %s', (from, command, extra, expected) => {
    const d = decideRunCommand(facts(from, extra), command);
    if (typeof expected === 'string') expect(d).toEqual({ ok: true, to: expected });
    else {
      expect(d.ok).toBe(false);
      if (!d.ok) expect(d.reason).toMatch(expected);
    }
  });

  test('the buttons are the allowed commands', () => {
    expect(runCommands(facts('planned')).map((c) => c.command)).toEqual(['confirm', 'cancel']);
    expect(runCommands(facts('planned', { carrier: null })).map((c) => c.command)).toEqual(['cancel']);
    expect(runCommands(facts('planned', { expected: 30 })).map((c) => c.command)).toEqual(['cancel']);
    expect(runCommands(facts('confirmed', { received: 2 })).map((c) => c.command)).toEqual(['close']);
    for (const s of ['done', 'cancelled'] as const) expect(runCommands(facts(s))).toEqual([]);
    expect(RUN_STATUSES).toEqual(['planned', 'confirmed', 'done', 'cancelled']);
  });

  test('what may be edited', () => {
    expect(editableParts('planned')).toEqual({ stops: true, carrier: true });
    expect(editableParts('confirmed')).toEqual({ stops: false, carrier: true });
    expect(editableParts('done')).toEqual({ stops: false, carrier: false });
  });
});

describe('expected against received', () => {
  const stops = [
    { siteId: 1, expected: 4 },
    { siteId: 2, expected: 2 },
  ];
  test('per stop and in total; a stop that sends more does not make up for one that sent fewer', () => {
    // Hand-worked: stop 1 sent 5 of 4 (left 0), stop 2 sent 1 of 2 (left 1), one bin from nowhere known.
    const p = runProgress(
      stops,
      new Map<number | null, number>([
        [1, 5],
        [2, 1],
        [null, 1],
      ]),
    );
    expect(p.stops).toEqual([
      { siteId: 1, expected: 4, received: 5, left: 0 },
      { siteId: 2, expected: 2, received: 1, left: 1 },
    ]);
    expect(p).toMatchObject({ expected: 6, received: 7, fromElsewhere: 1, left: 1, complete: false });
  });
  test('complete when every stop has sent its bins', () => {
    expect(
      runProgress(
        stops,
        new Map([
          [1, 4],
          [2, 2],
        ]),
      ).complete,
    ).toBe(true);
    expect(runProgress([], new Map()).complete).toBe(false);
    expect(runProgress(stops, new Map([[9, 6]]))).toMatchObject({ received: 6, fromElsewhere: 6, left: 6, complete: false });
  });
});

describe('run forms', () => {
  test('a site is one stop; a run has at least one', () => {
    const twice = runCreateSchema.safeParse({
      depotId: 1,
      plannedOn: '2026-12-24',
      stops: [
        { siteId: 3, expectedBins: 2 },
        { siteId: 3, expectedBins: 1 },
      ],
    });
    expect(twice.success).toBe(false);
    expect(twice.error?.issues[0]?.message).toBe('A site is one stop; it is listed twice.');
    expect(runCreateSchema.safeParse({ depotId: 1, plannedOn: '2026-12-24', stops: [] }).success).toBe(false);
    expect(runCreateSchema.safeParse({ depotId: 1, plannedOn: '2026-02-30', stops: [{ siteId: 3, expectedBins: 2 }] }).success).toBe(false);
    expect(runPatchSchema.safeParse({ version: 0, stops: [{ siteId: 3, expectedBins: 0 }] }).success).toBe(false);
    expect(runPatchSchema.safeParse({ version: 0, extra: 1 }).success).toBe(false);
  });
  test('the suggestion query has defaults and limits', () => {
    expect(runSuggestQuery.parse({ depot: '4' })).toEqual({ depot: 4, window: 2, detour: 60, road: 1.3 });
    expect(runSuggestQuery.safeParse({ depot: '4', window: '15' }).success).toBe(false);
    expect(runSuggestQuery.safeParse({ depot: 'x' }).success).toBe(false);
  });
});
