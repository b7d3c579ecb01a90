/**
 * A truck run's status and what the yard has received against it. Pure.
 *
 *   planned ──confirm──▶ confirmed ──(every expected bin received, or the planner closes it)──▶ done
 *      └──cancel──▶ cancelled ◀──cancel── confirmed (nothing received yet)
 *
 * Only a planned run's stops are edited; carrier and trailer may change until the run is done. Confirming needs
 * a carrier, at least one stop and no more bins expected than one truck carries (`capacity`, from the load plan
 * with the run's trailer and bin type), and puts the run's day on the requests it serves (the customer sees it).
 */
import type { IconName } from '@/lib/icons';
import type { Tone } from '@/lib/status-look';

export const RUN_STATUSES = ['planned', 'confirmed', 'done', 'cancelled'] as const;
export type RunStatus = (typeof RUN_STATUSES)[number];
export type RunCommand = 'confirm' | 'cancel' | 'close';

export interface RunFacts {
  status: RunStatus;
  carrier: string | null;
  stops: number;
  received: number;
  /** Bins the stops expect in total. */
  expected: number;
  /** Folded bins one truck of the run's trailer takes (null: not known, e.g. no bin type to plan with). */
  capacity: number | null;
}

interface RunTransition {
  from: RunStatus;
  to: RunStatus;
  command: RunCommand;
  label: string;
}

/** The planner's steps. Anything not here is refused. (confirmed → done also follows from the receive scans.) */
export const RUN_TRANSITIONS: readonly RunTransition[] = [
  { from: 'planned', to: 'confirmed', command: 'confirm', label: 'Confirm run' },
  { from: 'planned', to: 'cancelled', command: 'cancel', label: 'Cancel run' },
  { from: 'confirmed', to: 'cancelled', command: 'cancel', label: 'Cancel run' },
  { from: 'confirmed', to: 'done', command: 'close', label: 'Close run' },
];

export const RUN_STATUS_LOOK: Readonly<Record<RunStatus, { label: string; icon: IconName; tone: Tone }>> = {
  planned: { label: 'Planned', icon: 'route', tone: 'attention' },
  confirmed: { label: 'Confirmed', icon: 'truck', tone: 'info' },
  done: { label: 'Done', icon: 'check', tone: 'good' },
  cancelled: { label: 'Cancelled', icon: 'retired', tone: 'neutral' },
};

export type RunDecision = { ok: true; to: RunStatus } | { ok: false; reason: string };

export function decideRunCommand(run: RunFacts, command: RunCommand): RunDecision {
  const step = RUN_TRANSITIONS.find((t) => t.from === run.status && t.command === command);
  const word = RUN_STATUS_LOOK[run.status].label.toLowerCase();
  if (!step) {
    const options = RUN_TRANSITIONS.filter((t) => t.from === run.status).map((t) => t.label.toLowerCase());
    return { ok: false, reason: options.length ? `A ${word} run can only: ${options.join(', ')}.` : `The run is ${word} and cannot change any more.` };
  }
  if (command === 'confirm' && !run.carrier) return { ok: false, reason: 'Name the carrier before confirming the run.' };
  if (command === 'confirm' && run.stops === 0) return { ok: false, reason: 'The run has no stops; add one before confirming it.' };
  if (command === 'confirm') {
    const over = overCapacity(run);
    if (over) return { ok: false, reason: over };
  }
  if (command === 'cancel' && run.received > 0) {
    return { ok: false, reason: `${run.received} ${run.received === 1 ? 'bin has' : 'bins have'} been received against this run; close it instead.` };
  }
  return { ok: true, to: step.to };
}

/**
 * Why the stops do not fit on one truck, or null when they do (or the capacity is not known). Also refuses a
 * smaller trailer on a confirmed run.
 */
export function overCapacity(run: Pick<RunFacts, 'expected' | 'capacity'>): string | null {
  if (run.capacity === null || run.expected <= run.capacity) return null;
  return `The stops expect ${run.expected} bins but one truck takes ${run.capacity}: move ${run.expected - run.capacity} to another run or choose a larger trailer.`;
}

/** The commands a planner can give now (the run page's buttons). */
export function runCommands(run: RunFacts): Array<{ command: RunCommand; label: string }> {
  return RUN_TRANSITIONS.filter((t) => t.from === run.status && decideRunCommand(run, t.command).ok).map((t) => ({ command: t.command, label: t.label }));
}

/** Stops are edited only while the run is planned; carrier and trailer until it is done or cancelled. */
export function editableParts(status: RunStatus): { stops: boolean; carrier: boolean } {
  return { stops: status === 'planned', carrier: status === 'planned' || status === 'confirmed' };
}

export interface StopProgress {
  siteId: number;
  expected: number;
  received: number;
  /** Bins still expected at this stop (never below 0). */
  left: number;
}

export interface RunProgress {
  stops: StopProgress[];
  expected: number;
  /** Every bin received against the run, including those from no stop of it. */
  received: number;
  /** Received bins whose last site was none of the stops. */
  fromElsewhere: number;
  left: number;
  /** Every expected bin is in: the run is done. */
  complete: boolean;
}

/**
 * Expected against received, per stop and in total. `receivedBySite` counts receive scans against the run by the
 * site the bin stood at before (null: unknown or not a stop). A stop that sends more than expected does not make
 * up for one that sent fewer: the run is complete when every stop has sent what it was expected to.
 */
export function runProgress(stops: ReadonlyArray<{ siteId: number; expected: number }>, receivedBySite: ReadonlyMap<number | null, number>): RunProgress {
  const stopIds = new Set(stops.map((s) => s.siteId));
  const per = stops.map((s) => {
    const received = receivedBySite.get(s.siteId) ?? 0;
    return { siteId: s.siteId, expected: s.expected, received, left: Math.max(0, s.expected - received) };
  });
  let received = 0;
  let fromElsewhere = 0;
  for (const [site, n] of receivedBySite) {
    received += n;
    if (site === null || !stopIds.has(site)) fromElsewhere += n;
  }
  const expected = per.reduce((n, s) => n + s.expected, 0);
  const left = per.reduce((n, s) => n + s.left, 0);
  return { stops: per, expected, received, fromElsewhere, left, complete: stops.length > 0 && left === 0 };
}
