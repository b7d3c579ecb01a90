/**
 * Shrinkage: how fast the pool loses bins, as a share of the pool per year.
 *
 *   shrinkageWindow(today, days = 365)  → { from, to } the last `days` days, today included
 *   shrinkage(input)                    → Shrinkage with the rate and the arithmetic behind it
 *
 * Definition (the operator's own measure; shown on the page with the numbers filled in):
 *   bins lost     = bins declared missing inside the window − those of them found again since
 *   average pool  = (bins in service at the window's start + bins in service at its end) / 2
 *   rate per year = bins lost / average pool × 365 / days in the window
 * "In service" means registered and neither retired nor missing. The default window is the last 365 days,
 * so the scaling factor is 1 and the rate is simply lost ÷ average pool. A window with no pool (an empty
 * database) has no rate (null), never a division by zero.
 */
import { addDays, daysBetween } from '@/lib/calendar';
import type { LocalDate } from '@/lib/calendar';

export interface Window {
  from: LocalDate;
  to: LocalDate;
}

export interface ShrinkageInput {
  window: Window;
  declaredMissing: number;
  foundAgain: number;
  poolAtStart: number;
  poolAtEnd: number;
}

export interface Shrinkage {
  windowDays: number;
  lost: number;
  averagePool: number;
  /** Fraction per year (0.012 = 1.2 % a year); null when the pool was empty. */
  ratePerYear: number | null;
}

const DAYS_PER_YEAR = 365;

export function shrinkageWindow(today: LocalDate, days = DAYS_PER_YEAR): Window {
  if (!Number.isInteger(days) || days < 1) throw new RangeError(`A window needs at least one day, got ${days}`);
  return { from: addDays(today, -(days - 1)), to: today };
}

function requireCount(value: number, name: string) {
  if (!Number.isInteger(value) || value < 0) throw new RangeError(`${name} must be a whole number ≥ 0, got ${value}`);
}

export function shrinkage({ window, declaredMissing, foundAgain, poolAtStart, poolAtEnd }: ShrinkageInput): Shrinkage {
  for (const [value, name] of [
    [declaredMissing, 'declaredMissing'],
    [foundAgain, 'foundAgain'],
    [poolAtStart, 'poolAtStart'],
    [poolAtEnd, 'poolAtEnd'],
  ] as const) {
    requireCount(value, name);
  }
  if (foundAgain > declaredMissing) throw new RangeError(`More bins found again (${foundAgain}) than declared missing (${declaredMissing})`);
  const windowDays = daysBetween(window.from, window.to) + 1;
  if (windowDays < 1) throw new RangeError(`Window ends before it starts: ${window.from} – ${window.to}`);
  const lost = declaredMissing - foundAgain;
  const averagePool = (poolAtStart + poolAtEnd) / 2;
  const ratePerYear = averagePool === 0 ? null : (lost / averagePool) * (DAYS_PER_YEAR / windowDays);
  return { windowDays, lost, averagePool, ratePerYear };
}
