/**
 * How a trip's fill record and tamper-evident seals read on the planner pages.
 *
 *   fillRecordText(fill)                   → 'Rapeseed oil · 912 L · 839 kg · 14 °C' (no-break space before each unit),
 *                                            or null when nothing was recorded
 *
 * The seal check lives in ./seal-check.ts.
 */
import type { IconName } from '@/lib/icons';
import type { Tone } from '@/lib/status-look';

export interface FillRecord {
  product: string | null;
  volumeL: number | string | null;
  massKg: number | string | null;
  temperatureC: number | string | null;
}

/** NUMERIC columns arrive as strings ("912.0"); shown without a trailing ".0", kept on one line with the unit. */
function quantity(value: number | string | null, unit: string): string | null {
  if (value === null || value === '') return null;
  const n = Number(value);
  if (!Number.isFinite(n)) return null;
  return `${n.toLocaleString('en-GB', { maximumFractionDigits: 1 })}\u00a0${unit}`;
}

export function fillRecordText(fill: FillRecord): string | null {
  const parts = [fill.product?.trim() || null, quantity(fill.volumeL, 'L'), quantity(fill.massKg, 'kg'), quantity(fill.temperatureC, '°C')];
  const present = parts.filter((p): p is string => p !== null);
  return present.length ? present.join(' · ') : null;
}

/** A trip is open from dispatch until the bin is received back at a depot. Word and icon, as for bins. */
export const TRIP_STATUS_LOOK: Record<'open' | 'closed', { label: string; icon: IconName; tone: Tone }> = {
  open: { label: 'Out', icon: 'route', tone: 'info' },
  closed: { label: 'Back', icon: 'check', tone: 'good' },
};
