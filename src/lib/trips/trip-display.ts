/**
 * How a trip's fill record and tamper-evident seals read on the planner pages.
 *
 *   sealCheck(applied, verified, flagged)  → { state, label, icon, tone } — always a word and an icon
 *   fillRecordText(fill)                   → 'Rapeseed oil · 912 L · 839 kg · 14 °C' (no-break space before each unit),
 *                                            or null when nothing was recorded
 *
 * Seals: numbers applied at filling travel with the load and are checked at discharge. The check is a
 * mismatch when the discharge scan flagged one, or when the two lists are not the same set of numbers —
 * compared exactly, as the scan does (a seal missing, added, replaced or typed differently is reason to look
 * at the load before anything else). The trip list's "mismatch only" filter applies the same rule in SQL.
 */
import type { IconName } from '@/lib/icons';
import type { Tone } from '@/lib/status-look';

export type SealState = 'not_sealed' | 'awaiting_check' | 'match' | 'mismatch';

export interface SealCheck {
  state: SealState;
  label: string;
  icon: IconName;
  tone: Tone;
}

const SEAL_DISPLAY: Record<SealState, Omit<SealCheck, 'state'>> = {
  not_sealed: { label: 'Not sealed yet', icon: 'waiting', tone: 'neutral' },
  awaiting_check: { label: 'Sealed, not checked yet', icon: 'waiting', tone: 'info' },
  match: { label: 'Checked: seals match', icon: 'check', tone: 'good' },
  mismatch: { label: 'Seal mismatch', icon: 'alert', tone: 'fault' },
};

function asSet(seals: readonly string[]): Set<string> {
  return new Set(seals.filter((s) => s !== ''));
}

function sameSet(a: Set<string>, b: Set<string>): boolean {
  return a.size === b.size && [...a].every((x) => b.has(x));
}

export function sealState(applied: readonly string[], verified: readonly string[], flagged: boolean): SealState {
  const a = asSet(applied);
  const v = asSet(verified);
  if (flagged) return 'mismatch';
  if (v.size > 0) return sameSet(a, v) ? 'match' : 'mismatch';
  return a.size > 0 ? 'awaiting_check' : 'not_sealed';
}

export function sealCheck(applied: readonly string[], verified: readonly string[], flagged: boolean): SealCheck {
  const state = sealState(applied, verified, flagged);
  return { state, ...SEAL_DISPLAY[state] };
}

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
