import { STATUS_LABELS, type Status } from '@/lib/scans/lifecycle';
import type { IconName } from './icons';

export type Tone = 'good' | 'info' | 'attention' | 'fault' | 'neutral';

/** How a status is shown: always a word and an icon; the tone only adds a tint. */
export const STATUS_DISPLAY: Record<Status, { label: string; icon: IconName; tone: Tone }> = {
  available: { label: STATUS_LABELS.available, icon: 'folded', tone: 'neutral' },
  prepared: { label: STATUS_LABELS.prepared, icon: 'lined', tone: 'good' },
  in_transit: { label: STATUS_LABELS.in_transit, icon: 'truck', tone: 'info' },
  on_hire: { label: STATUS_LABELS.on_hire, icon: 'handover', tone: 'info' },
  awaiting_collection: { label: STATUS_LABELS.awaiting_collection, icon: 'waiting', tone: 'attention' },
  quarantine: { label: STATUS_LABELS.quarantine, icon: 'hold', tone: 'fault' },
  in_repair: { label: STATUS_LABELS.in_repair, icon: 'wrench', tone: 'attention' },
  missing: { label: STATUS_LABELS.missing, icon: 'question', tone: 'fault' },
  retired: { label: STATUS_LABELS.retired, icon: 'retired', tone: 'neutral' },
};

/** Tailwind classes per tone (tints behind ink text keep AA contrast). */
export const TONE_CLASSES: Record<Tone, string> = {
  good: 'bg-moss-tint text-ink border-moss',
  info: 'bg-harbour-tint text-ink border-harbour',
  attention: 'bg-ochre-tint text-ink border-ochre',
  fault: 'bg-brick-tint text-ink border-brick',
  neutral: 'bg-paper-deep text-ink border-ink-faint',
};
