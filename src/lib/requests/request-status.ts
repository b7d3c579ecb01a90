// Where a collection request or a damage report stands, and the steps a
// planner may take with it. Pure; the service refuses any other step.
//   collection: open → scheduled → done, or cancelled (a booking can be undone,
//               a cancelled request reopened; a done collection is final)
//   damage:     open → triaged → closed (a closed report can be reopened)
import type { IconName } from '@/lib/icons';
import type { Tone } from '@/lib/status-look';

export type RequestKind = 'collection' | 'damage';

export const COLLECTION_STATUSES = ['open', 'scheduled', 'done', 'cancelled'] as const;
export const DAMAGE_STATUSES = ['open', 'triaged', 'closed'] as const;
export type CollectionStatus = (typeof COLLECTION_STATUSES)[number];
export type DamageStatus = (typeof DAMAGE_STATUSES)[number];
export type RequestStatus = CollectionStatus | DamageStatus;

const STEPS: { collection: Record<CollectionStatus, CollectionStatus[]>; damage: Record<DamageStatus, DamageStatus[]> } = {
  collection: { open: ['scheduled', 'done', 'cancelled'], scheduled: ['done', 'open', 'cancelled'], done: [], cancelled: ['open'] },
  damage: { open: ['triaged', 'closed'], triaged: ['closed', 'open'], closed: ['open'] },
};

export function isStatusOf(kind: RequestKind, value: unknown): value is RequestStatus {
  return typeof value === 'string' && (kind === 'collection' ? (COLLECTION_STATUSES as readonly string[]) : (DAMAGE_STATUSES as readonly string[])).includes(value);
}

/** The statuses a request of this kind may move to from `from` (none for an unknown status). */
export function nextStatuses(kind: RequestKind, from: string): RequestStatus[] {
  const table = STEPS[kind] as Record<string, RequestStatus[]>;
  return Object.hasOwn(table, from) ? [...table[from]!] : [];
}

export function canMove(kind: RequestKind, from: string, to: string): boolean {
  return nextStatuses(kind, from).includes(to as RequestStatus);
}

/** Why a step is refused, in words for the planner. */
export function refusalReason(kind: RequestKind, from: string, to: string): string {
  const word = (s: string) => statusLook(kind, s).label.toLowerCase();
  if (from === to) return `It is already ${word(to)}.`;
  const options = nextStatuses(kind, from);
  if (options.length === 0) return `It is ${word(from)} and cannot change any more.`;
  return `From ${word(from)} it can only become ${options.map(word).join(' or ')}.`;
}

export interface StatusLook {
  label: string;
  icon: IconName;
  tone: Tone;
}

const LOOKS: Record<RequestKind, Record<string, StatusLook>> = {
  collection: {
    open: { label: 'Open', icon: 'inbox', tone: 'attention' },
    scheduled: { label: 'Scheduled', icon: 'truck', tone: 'info' },
    done: { label: 'Collected', icon: 'check', tone: 'good' },
    cancelled: { label: 'Cancelled', icon: 'retired', tone: 'neutral' },
  },
  damage: {
    open: { label: 'Open', icon: 'alert', tone: 'fault' },
    triaged: { label: 'Triaged', icon: 'wrench', tone: 'attention' },
    closed: { label: 'Closed', icon: 'check', tone: 'neutral' },
  },
};

/** A status as shown: a word and an icon, the tone only a tint. */
export function statusLook(kind: RequestKind, status: string): StatusLook {
  return LOOKS[kind][status] ?? { label: status, icon: 'question', tone: 'neutral' };
}

/** The button that moves a request to `to`, worded from where it is now. */
export function stepLabel(kind: RequestKind, from: string, to: string): string {
  if (to === 'open') return from === 'scheduled' ? 'Unschedule' : 'Reopen';
  if (kind === 'collection') {
    return { scheduled: 'Schedule collection', done: 'Mark collected', cancelled: 'Cancel request' }[to] ?? to;
  }
  return { triaged: 'Mark triaged', closed: 'Close report' }[to] ?? to;
}

/** Steps that throw away work someone asked for: the page asks before taking them. */
export function needsConfirmation(kind: RequestKind, to: string): boolean {
  return kind === 'collection' && to === 'cancelled';
}
