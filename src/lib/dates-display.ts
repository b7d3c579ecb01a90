import { formatLongDate, formatRelative } from './calendar';
import { formatMomentAbsolute } from './moment-text';

/** "14 Mar 2027 · in 103 days": absolute first, with a relative hint (DESIGN §9). */
export function dateWithHint(date: string | null, today: string): string {
  if (!date) return '—';
  return `${formatLongDate(date)} · ${formatRelative(date, today)}`;
}

/** An instant as local date and time in the operator's zone ("14 Mar 2027, 08:05"), or a dash. */
export function instantLabel(iso: string | Date | null, timeZone: string): string {
  if (!iso) return '—';
  return formatMomentAbsolute(typeof iso === 'string' ? iso : iso.toISOString(), timeZone);
}
