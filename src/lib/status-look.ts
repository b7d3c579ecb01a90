// How a bin status is shown: always the word and an icon (src/lib/icons.ts), with a
// tone from the palette as a third cue, never the only one.
import type { Status } from '@/lib/scans/lifecycle';
import type { IconName } from './icons';

export type Tone = 'good' | 'info' | 'attention' | 'fault' | 'quiet';

export const STATUS_LOOK: Record<Status, { icon: IconName; tone: Tone }> = {
  available: { icon: 'folded', tone: 'good' },
  prepared: { icon: 'lined', tone: 'good' },
  in_transit: { icon: 'truck', tone: 'info' },
  on_hire: { icon: 'handover', tone: 'info' },
  awaiting_collection: { icon: 'waiting', tone: 'attention' },
  quarantine: { icon: 'hold', tone: 'fault' },
  in_repair: { icon: 'wrench', tone: 'attention' },
  missing: { icon: 'question', tone: 'fault' },
  retired: { icon: 'retired', tone: 'quiet' },
};

/** Text colour classes per tone (Tailwind palette tokens; each passes WCAG AA on white). */
export const TONE_TEXT: Record<Tone, string> = {
  good: 'text-moss',
  info: 'text-harbour',
  attention: 'text-ochre-text',
  fault: 'text-brick',
  quiet: 'text-ink-faint',
};
