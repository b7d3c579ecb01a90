import { formatLongDate, formatRelative, localDate } from './calendar';

/** "14 Mar 2027 · in 103 days": absolute first, with a relative hint (DESIGN §9). */
export function dateWithHint(date: string | null, today: string): string {
  if (!date) return '—';
  return `${formatLongDate(date)} · ${formatRelative(date, today)}`;
}

/** An instant as local date and time in the operator's zone: "14 Mar 2027, 08:05". */
export function instantLabel(iso: string | null, timeZone: string): string {
  if (!iso) return '—';
  const d = new Date(iso);
  const time = new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', hour12: false }).format(d);
  return `${formatLongDate(localDate(d, timeZone))}, ${time}`;
}
