/**
 * A hire order's status: the one rule table of who may move it where, and how
 * its loads move it. Pure.
 *
 *   draft ──confirm──▶ confirmed ──(first bin loaded)──▶ loading ──(all bins dispatched)──▶ dispatched ──close──▶ closed
 *     └──cancel──▶ cancelled ◀──cancel── confirmed, loading (nothing loaded yet)
 *   loading ──close short──▶ closed (the planner ends an order that will get no more bins)
 *   and back, when scans are voided: dispatched ──(a bin no longer dispatched)──▶ loading ──(none loaded)──▶ confirmed
 *
 * Drafts count nowhere: not as demand at the depot, not on the yard's list,
 * not for loads. Only `DEMAND_STATUSES` do.
 */

export const ORDER_STATUSES = ['draft', 'confirmed', 'loading', 'dispatched', 'closed', 'cancelled'] as const;
export type OrderStatus = (typeof ORDER_STATUSES)[number];

/** Orders that are demand: counted at the depot, on the yard's list, and loadable. */
export const DEMAND_STATUSES = ['confirmed', 'loading'] as const satisfies readonly OrderStatus[];

export function countsAsDemand(status: OrderStatus): boolean {
  return (DEMAND_STATUSES as readonly OrderStatus[]).includes(status);
}

/** `'confirmed', 'loading'` for SQL `IN (…)` (fixed words from this table, never user input). */
export const DEMAND_STATUSES_SQL = DEMAND_STATUSES.map((s) => `'${s}'`).join(', ');

export type OrderCommand = 'confirm' | 'cancel' | 'close';

export interface OrderTransition {
  from: OrderStatus;
  to: OrderStatus;
  /** 'planner': a command on the order page; 'loads': follows from the order's loads. */
  by: 'planner' | 'loads';
  command?: OrderCommand;
  label: string;
  /** Extra condition, checked against the order's progress. */
  when?: 'nothing-loaded' | 'something-loaded' | 'all-dispatched' | 'not-all-dispatched';
}

/** The whole table. Anything not here is refused. */
export const ORDER_TRANSITIONS: readonly OrderTransition[] = [
  { from: 'draft', to: 'confirmed', by: 'planner', command: 'confirm', label: 'Confirm order' },
  { from: 'draft', to: 'cancelled', by: 'planner', command: 'cancel', label: 'Cancel draft' },
  { from: 'confirmed', to: 'cancelled', by: 'planner', command: 'cancel', label: 'Cancel order', when: 'nothing-loaded' },
  { from: 'confirmed', to: 'loading', by: 'loads', label: 'First bin loaded', when: 'something-loaded' },
  { from: 'loading', to: 'cancelled', by: 'planner', command: 'cancel', label: 'Cancel order', when: 'nothing-loaded' },
  { from: 'loading', to: 'dispatched', by: 'loads', label: 'All bins dispatched', when: 'all-dispatched' },
  { from: 'loading', to: 'closed', by: 'planner', command: 'close', label: 'Close short', when: 'something-loaded' },
  // A voided dispatch takes its bin off the order again: the status steps back with it.
  { from: 'dispatched', to: 'loading', by: 'loads', label: 'A dispatch voided', when: 'not-all-dispatched' },
  { from: 'loading', to: 'confirmed', by: 'loads', label: 'Every loaded bin voided', when: 'nothing-loaded' },
  { from: 'dispatched', to: 'closed', by: 'planner', command: 'close', label: 'Close order' },
];

export const STATUS_WORDS: Readonly<Record<OrderStatus, string>> = {
  draft: 'Draft',
  confirmed: 'Confirmed',
  loading: 'Loading',
  dispatched: 'Dispatched',
  closed: 'Closed',
  cancelled: 'Cancelled',
};

export interface OrderProgress {
  quantity: number;
  /** Bins scanned onto loads for the order (dispatch scans, not voided). */
  loaded: number;
  /** Of those, bins on loads that have left the depot. */
  dispatched: number;
}

function holds(when: OrderTransition['when'], p: OrderProgress): boolean {
  if (when === undefined) return true;
  if (when === 'nothing-loaded') return p.loaded === 0;
  if (when === 'something-loaded') return p.loaded > 0;
  if (when === 'not-all-dispatched') return p.dispatched < p.quantity;
  return p.dispatched >= p.quantity;
}

const CONDITION_REASONS: Record<NonNullable<OrderTransition['when']>, string> = {
  'nothing-loaded': 'bins are already loaded for it; void those scans first',
  'something-loaded': 'no bin has been loaded for it yet',
  'all-dispatched': 'not every bin has been dispatched yet',
  'not-all-dispatched': 'every bin has been dispatched',
};

export type CommandDecision = { ok: true; to: OrderStatus; label: string } | { ok: false; reason: string };

/** May a planner give this command now? */
export function decideCommand(status: OrderStatus, command: OrderCommand, progress: OrderProgress): CommandDecision {
  const rows = ORDER_TRANSITIONS.filter((t) => t.from === status && t.by === 'planner' && t.command === command);
  const allowed = rows.find((t) => holds(t.when, progress));
  if (allowed) return { ok: true, to: allowed.to, label: allowed.label };
  const blocked = rows[0];
  if (blocked?.when) return { ok: false, reason: `A ${STATUS_WORDS[status].toLowerCase()} order cannot be ${PAST[command]}: ${CONDITION_REASONS[blocked.when]}.` };
  return { ok: false, reason: `A ${STATUS_WORDS[status].toLowerCase()} order cannot be ${PAST[command]}.` };
}

const PAST: Record<OrderCommand, string> = { confirm: 'confirmed', cancel: 'cancelled', close: 'closed' };

/** The commands a planner can give now (for the order page's buttons). */
export function availableCommands(status: OrderStatus, progress: OrderProgress): { command: OrderCommand; label: string }[] {
  return ORDER_TRANSITIONS.filter((t) => t.from === status && t.by === 'planner' && t.command && holds(t.when, progress)).map((t) => ({
    command: t.command!,
    label: t.label,
  }));
}

/**
 * The status the order's loads give it: a confirmed order with a bin loaded is
 * loading; a loading one with every bin dispatched is dispatched; and back when
 * voided scans take bins off it (dispatched → loading → confirmed). Applied
 * repeatedly until nothing changes; planner-owned statuses are left alone.
 */
export function statusFromLoads(status: OrderStatus, progress: OrderProgress): OrderStatus {
  let current = status;
  for (;;) {
    const next = ORDER_TRANSITIONS.find((t) => t.from === current && t.by === 'loads' && holds(t.when, progress));
    if (!next) return current;
    current = next.to;
  }
}

/** Bins still to send (never below 0). */
export function remaining(progress: OrderProgress): number {
  return Math.max(0, progress.quantity - progress.dispatched);
}

/** How a status is shown: a word and an icon, with a tone as a third cue (never colour alone). */
export const ORDER_STATUS_LOOK: Readonly<
  Record<OrderStatus, { icon: 'plusBox' | 'check' | 'truck' | 'route' | 'retired' | 'hold'; tone: 'good' | 'info' | 'attention' | 'fault' | 'neutral' }>
> = {
  draft: { icon: 'plusBox', tone: 'neutral' },
  confirmed: { icon: 'check', tone: 'attention' },
  loading: { icon: 'truck', tone: 'info' },
  dispatched: { icon: 'route', tone: 'good' },
  closed: { icon: 'retired', tone: 'neutral' },
  cancelled: { icon: 'hold', tone: 'neutral' },
};
