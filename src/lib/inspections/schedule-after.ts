/**
 * The test columns a recorded test sets on a bin, from what the bin's columns say now (pure; used by the
 * inspection service and the demo history alike, so both write the same thing).
 *
 *   scheduleAfterTest(bin, test, policy) → { schedule, restarted }: schedule null when no clock moves
 */
import { clocksRestartedBy, historyAfter, nextDue, type InspectionPolicy, type TestRecord } from './inspection-due';
import type { Schedule } from '@/lib/scans/lifecycle';

export interface BinTestColumns {
  manufactureMonth: string; // 'YYYY-MM' or 'YYYY-MM-01'
  lastInspectionOn: string | null;
  lastLeakTestOn: string | null;
  lastFullInspectionOn: string | null;
}

const day = (d: string | null) => (d ? d.slice(0, 10) : null);

export function scheduleAfterTest(
  bin: BinTestColumns,
  test: TestRecord & { performedOn: string },
  policy: InspectionPolicy,
): { schedule: Schedule | null; restarted: { intermediate: boolean; full: boolean } } {
  const none = { intermediate: false, full: false };
  const restarted = clocksRestartedBy(test);
  if (!restarted.intermediate && !restarted.full) return { schedule: null, restarted: none };
  const before = {
    manufactureMonth: bin.manufactureMonth.slice(0, 7),
    lastIntermediateTestMonth: bin.lastLeakTestOn?.slice(0, 7) ?? null,
    lastFullInspectionMonth: bin.lastFullInspectionOn?.slice(0, 7) ?? null,
  };
  const month = test.performedOn.slice(0, 7);
  const after = historyAfter(before, { ...test, month });
  // A clock counts as restarted by this test when it now stands at this test's month (historyAfter never
  // moves one backwards, so an older test entered late restarts nothing).
  const now = { intermediate: restarted.intermediate && after.lastIntermediateTestMonth === month, full: restarted.full && after.lastFullInspectionMonth === month };
  if (!now.intermediate && !now.full) return { schedule: null, restarted: none };
  const due = nextDue(after, policy);
  const lastAny = day(bin.lastInspectionOn);
  return {
    restarted: now,
    schedule: {
      lastInspectionOn: lastAny && lastAny > test.performedOn ? lastAny : test.performedOn,
      lastLeakTestOn: now.intermediate ? test.performedOn : day(bin.lastLeakTestOn),
      lastFullInspectionOn: now.full ? test.performedOn : day(bin.lastFullInspectionOn),
      nextIntermediateDue: due.intermediateDue,
      nextFullDue: due.fullDue,
      nextDue: due.nextDue,
    },
  };
}
