/**
 * Numbers as the planner pages show them: thousands grouped with commas, a fixed number of decimals, a space
 * before the unit ("1.2 %", "14.5 days"), and a dash for "no value" rather than 0 or NaN.
 *
 *   formatCount(1234)              → '1,234'
 *   formatDecimal(2.345, 1)        → '2.3'
 *   formatPercent(0.0123, 1)       → '1.2 %'
 *   formatDays(14.25, 1)           → '14.3 days'   (formatDays(1) → '1 day')
 *   plainDecimal(2.345, 2)         → '2.35'  (no grouping: for CSV cells)
 */

import { formatDayCount } from './calendar';

const DASH = '—';

function finite(value: number | null | undefined): value is number {
  return typeof value === 'number' && Number.isFinite(value);
}

/** Rounds half away from zero on the decimal digits, not on the binary value (1.005 → 1.01 at 2 decimals). */
function roundTo(value: number, decimals: number): number {
  const shift = (x: number, by: number) => {
    const [mantissa, exponent = '0'] = String(x).split('e');
    return Number(`${mantissa}e${Number(exponent) + by}`);
  };
  return Math.sign(value) * shift(Math.round(shift(Math.abs(value), decimals)), -decimals);
}

export function formatDecimal(value: number | null | undefined, decimals = 1): string {
  if (!finite(value)) return DASH;
  const rounded = roundTo(value, decimals);
  return (Object.is(rounded, -0) ? 0 : rounded).toLocaleString('en-GB', { minimumFractionDigits: decimals, maximumFractionDigits: decimals });
}

export function formatCount(value: number | null | undefined): string {
  return finite(value) ? formatDecimal(value, 0) : DASH;
}

export function formatPercent(fraction: number | null | undefined, decimals = 1): string {
  return finite(fraction) ? `${formatDecimal(fraction * 100, decimals)} %` : DASH;
}

export function formatDays(value: number | null | undefined, decimals = 0): string {
  if (!finite(value)) return DASH;
  return formatDayCount(formatDecimal(value, decimals));
}

/** For machine-read files: '.' decimal point, no grouping, empty for no value. */
export function plainDecimal(value: number | null | undefined, decimals = 2): string {
  if (!finite(value)) return '';
  const rounded = roundTo(value, decimals);
  return (Object.is(rounded, -0) ? 0 : rounded).toFixed(decimals);
}
