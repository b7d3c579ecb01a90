// Moments (instants with a time of day: a sign-in, a sent message, a link's
// expiry) as people read them: absolute in the operator's time zone, with a
// relative hint — "14 Mar 2027, 09:12 · 3 days ago". Built on Intl only, so it
// runs the same on the server and in islands.

const RELATIVE = new Intl.RelativeTimeFormat('en', { numeric: 'auto' });

const STEPS: Array<[unit: Intl.RelativeTimeFormatUnit, seconds: number]> = [
  ['year', 365 * 24 * 3600],
  ['month', 30 * 24 * 3600],
  ['day', 24 * 3600],
  ['hour', 3600],
  ['minute', 60],
];

function toDate(instant: Date | string): Date {
  const d = instant instanceof Date ? instant : new Date(instant);
  if (Number.isNaN(d.getTime())) throw new RangeError(`not an instant: ${String(instant)}`);
  return d;
}

/** "just now", "5 minutes ago", "in 3 hours", "yesterday", "in 7 days" … */
export function relativeHint(instant: Date | string, now: Date = new Date()): string {
  const seconds = Math.round((toDate(instant).getTime() - now.getTime()) / 1000);
  const abs = Math.abs(seconds);
  if (abs < 60) return 'just now';
  for (const [unit, size] of STEPS) {
    if (abs >= size) return RELATIVE.format(Math.trunc(seconds / size), unit);
  }
  return 'just now';
}

const formatters = new Map<string, Intl.DateTimeFormat>();
function formatter(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', {
      timeZone,
      day: 'numeric',
      month: 'numeric',
      year: 'numeric',
      hour: '2-digit',
      minute: '2-digit',
      hourCycle: 'h23',
    });
    formatters.set(timeZone, f);
  }
  return f;
}

// Month names from a fixed list: ICU versions disagree on short names ("Sep" / "Sept").
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** "14 Mar 2027, 09:12" in the given IANA zone. */
export function formatMomentAbsolute(instant: Date | string, timeZone: string): string {
  const parts = formatter(timeZone).formatToParts(toDate(instant));
  const get = (type: Intl.DateTimeFormatPartTypes) => parts.find((p) => p.type === type)?.value ?? '';
  return `${get('day')} ${MONTHS[Number(get('month')) - 1]} ${get('year')}, ${get('hour')}:${get('minute')}`;
}

/** "14 Mar 2027, 09:12 · 3 days ago" */
export function formatMoment(instant: Date | string, timeZone: string, now: Date = new Date()): string {
  return `${formatMomentAbsolute(instant, timeZone)} · ${relativeHint(instant, now)}`;
}
