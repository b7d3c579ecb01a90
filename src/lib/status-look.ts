// How a bin status is shown, in one table: always the word and an icon (src/lib/icons.ts), with a tone
// from the palette as a third cue, never the only one. Badges (StatusBadge), the fleet grid's status cell
// and the fleet page's legend all read this table.
import { STATUS_LABELS, type Status } from '@/lib/scans/lifecycle';
import type { IconName } from './icons';

export type Tone = 'good' | 'info' | 'attention' | 'fault' | 'neutral';

/**
 * good: in the pool and usable (folded and empty, or lined and ready); info: out with a customer or on the
 * road; attention: needs someone to act soon; fault: held or unaccounted for; neutral: out of the pool.
 */
export const STATUS_LOOK: Record<Status, { label: string; icon: IconName; tone: Tone }> = {
  available: { label: STATUS_LABELS.available, icon: 'folded', tone: 'good' },
  prepared: { label: STATUS_LABELS.prepared, icon: 'lined', tone: 'good' },
  in_transit: { label: STATUS_LABELS.in_transit, icon: 'truck', tone: 'info' },
  on_hire: { label: STATUS_LABELS.on_hire, icon: 'handover', tone: 'info' },
  awaiting_collection: { label: STATUS_LABELS.awaiting_collection, icon: 'waiting', tone: 'attention' },
  quarantine: { label: STATUS_LABELS.quarantine, icon: 'hold', tone: 'fault' },
  in_repair: { label: STATUS_LABELS.in_repair, icon: 'wrench', tone: 'attention' },
  missing: { label: STATUS_LABELS.missing, icon: 'question', tone: 'fault' },
  retired: { label: STATUS_LABELS.retired, icon: 'retired', tone: 'neutral' },
};

/**
 * The mark shown beside a status when the bin's periodic test has lapsed (ADR/RID 4.1.2.2: it may not be
 * filled or dispatched for hire): a word and an icon of its own, so it never rests on colour.
 */
export const TEST_LAPSED_LOOK: { label: string; icon: IconName; tone: Tone } = { label: 'Test lapsed', icon: 'alert', tone: 'fault' };

/** How a liner lot's state on the stock page is shown (the same badge: word, icon, tone). */
export const LOT_STATES = ['in_time', 'at_risk', 'expires_soon', 'on_hold', 'recalled', 'expired', 'released'] as const;
export type LotState = (typeof LOT_STATES)[number];
export const LOT_LOOK: Record<LotState, { label: string; icon: IconName; tone: Tone }> = {
  in_time: { label: 'Used in time', icon: 'check', tone: 'good' },
  at_risk: { label: 'Expires before use', icon: 'alert', tone: 'fault' },
  expires_soon: { label: 'Expires within 60 days', icon: 'waiting', tone: 'attention' },
  on_hold: { label: 'On hold', icon: 'hold', tone: 'attention' },
  recalled: { label: 'Recalled', icon: 'hold', tone: 'fault' },
  expired: { label: 'Expired', icon: 'retired', tone: 'fault' },
  released: { label: 'Released', icon: 'check', tone: 'good' },
};

/** Badge classes per tone (tints behind ink text keep AA contrast). */
export const TONE_CLASSES: Record<Tone, string> = {
  good: 'bg-moss-tint text-ink border-moss',
  info: 'bg-harbour-tint text-ink border-harbour',
  attention: 'bg-ochre-tint text-ink border-ochre',
  fault: 'bg-brick-tint text-ink border-brick',
  neutral: 'bg-paper-deep text-ink border-ink-faint',
};

/** Text colour classes per tone, for an icon beside ink text (Tailwind palette tokens; each passes WCAG AA on white). */
export const TONE_TEXT: Record<Tone, string> = {
  good: 'text-moss',
  info: 'text-harbour',
  attention: 'text-ochre-text',
  fault: 'text-brick',
  neutral: 'text-ink-faint',
};
