// Rates are stored as fractions with four decimals (NUMERIC(5,4): 0.2100) and
// shown as percentages with up to two (21 %, 5.5 %). Converted as decimal
// strings, never through binary floating point, so 0.07 stays 7 and not 7.000000000000001.

/** "0.2100" → "21", "0.0550" → "5.5"; null when it is not a fraction in [0, 1). */
export function fractionToPercent(fraction: string): string | null {
  const m = /^0?\.(\d{1,4})$|^0$/.exec(fraction.trim());
  if (!m) return null;
  const digits = (m[1] ?? '').padEnd(4, '0'); // hundredths of a percent
  const whole = String(Number(digits.slice(0, 2)));
  const decimals = digits.slice(2).replace(/0+$/, '');
  return decimals ? `${whole}.${decimals}` : whole;
}

/** "21" → "0.2100", "5.5" → "0.0550", "0" → "0.0000"; null when not a percentage in [0, 100) with ≤ 2 decimals. */
export function percentToFraction(percent: string): string | null {
  const m = /^(\d{1,2})(?:[.,](\d{1,2}))?$/.exec(percent.trim());
  if (!m) return null;
  const whole = m[1]!.padStart(2, '0');
  const decimals = (m[2] ?? '').padEnd(2, '0');
  return `0.${whole}${decimals}`;
}
