// How a monthly count's states read on screen: a word and an icon (never colour alone). Pure.
import type { IconName } from '@/lib/icons';
import type { Tone } from '@/lib/status-look';
import type { CountStanding, Resolution } from './count-confirmation';

export type CountStatus = 'agreed' | 'disputed' | 'resolved';
type Look = { label: string; icon: IconName; tone: Tone };

export const COUNT_LOOK: Record<CountStatus | CountStanding | Resolution | 'unresolved', Look> = {
  agreed: { label: 'Agreed', icon: 'check', tone: 'good' },
  disputed: { label: 'Difference open', icon: 'alert', tone: 'attention' },
  resolved: { label: 'Settled', icon: 'check', tone: 'good' },
  counted: { label: 'Counted', icon: 'check', tone: 'good' },
  due: { label: 'Count due', icon: 'waiting', tone: 'info' },
  overdue: { label: 'Count overdue', icon: 'alert', tone: 'attention' },
  found: { label: 'Found', icon: 'check', tone: 'good' },
  moved: { label: 'Moved', icon: 'route', tone: 'info' },
  lost: { label: 'Lost', icon: 'question', tone: 'fault' },
  unresolved: { label: 'To settle', icon: 'waiting', tone: 'attention' },
};

export const LINE_KIND_WORDS = { missing: 'not seen at the site', unexpected: 'seen at the site, not on the list' } as const;

export { monthLabel as monthName } from '@/lib/fleet/month-series';
