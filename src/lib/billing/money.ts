/**
 * Money as integer minor units (cents for EUR): every amount in billing is a whole number of minor units, so
 * sums are exact. The one place a fraction can arise is tax (a rate in basis points times a net amount); it is
 * rounded there, once, by `applyRate`.
 *
 *   ROUNDING                         → the rounding rule, in words (printed on statements)
 *   applyRate(minor, basisPoints)    → minor × basisPoints / 10 000, rounded half away from zero
 *   minorDigits(currency)            → decimals of the currency's minor unit (2 for EUR, 0 for JPY)
 *   formatMoney(minor, currency)     → "1,234.50 EUR" / "-7.50 EUR"
 *   isMinorAmount(value)             → a safe integer
 *   decimalToMinorUnits('12.5', 2)   → 1250 (exact, string arithmetic; null for a non-amount or too many decimals)
 *   minorUnitsToDecimal(-750, 2)     → "-7.50" (for NUMERIC columns, form fields and CSV)
 */

export const ROUNDING =
  'All amounts are whole cents (minor units) times whole numbers of days or items, so no line is rounded. ' +
  'Tax is computed once, on the net total of the statement, and rounded half away from zero to the cent.';

export function isMinorAmount(value: unknown): value is number {
  return typeof value === 'number' && Number.isSafeInteger(value);
}

/** minor × basisPoints / 10 000, rounded half away from zero; exact for any safe-integer amount (BigInt inside). */
export function applyRate(minor: number, basisPoints: number): number {
  if (!isMinorAmount(minor)) throw new RangeError(`Amount must be a whole number of minor units, got ${minor}`);
  if (!Number.isInteger(basisPoints) || basisPoints < 0 || basisPoints > 10_000) {
    throw new RangeError(`Rate must be whole basis points between 0 and 10000, got ${basisPoints}`);
  }
  const product = BigInt(minor) * BigInt(basisPoints);
  const negative = product < 0n;
  const magnitude = negative ? -product : product;
  let quotient = magnitude / 10_000n;
  if ((magnitude % 10_000n) * 2n >= 10_000n) quotient += 1n;
  return Number(negative ? -quotient : quotient);
}

const digitsCache = new Map<string, number>();

export function minorDigits(currency: string): number {
  let digits = digitsCache.get(currency);
  if (digits === undefined) {
    if (!/^[A-Z]{3}$/.test(currency)) throw new RangeError(`Not a currency code (ISO 4217, e.g. EUR): ${JSON.stringify(currency)}`);
    digits = new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2;
    digitsCache.set(currency, digits);
  }
  return digits;
}

/** 123450 EUR → "1,234.50 EUR". Fixed English grouping so statements read the same on every machine. */
export function formatMoney(minor: number, currency: string): string {
  if (!isMinorAmount(minor)) throw new RangeError(`Amount must be a whole number of minor units, got ${minor}`);
  const digits = minorDigits(currency);
  const sign = minor < 0 ? '-' : '';
  const text = String(Math.abs(minor)).padStart(digits + 1, '0');
  const whole = text.slice(0, text.length - digits).replace(/\B(?=(\d{3})+(?!\d))/g, ',');
  const fraction = digits > 0 ? `.${text.slice(text.length - digits)}` : '';
  return `${sign}${whole}${fraction} ${currency}`;
}

/** "12.5" / "12.50" / "-7.5" → minor units with `digits` decimals; exact (no floating point). Null for a non-amount. */
export function decimalToMinorUnits(value: string | number, digits: number): number | null {
  const text = typeof value === 'number' ? (Number.isFinite(value) ? String(value) : '') : value.trim();
  const m = /^(-?)(\d{1,15})(?:\.(\d+))?$/.exec(text);
  if (!m) return null;
  const frac = m[3] ?? '';
  if (frac.length > digits && /[1-9]/.test(frac.slice(digits))) return null; // more precision than the currency has
  const minor = Number(m[2]) * 10 ** digits + Number((frac.slice(0, digits) || '0').padEnd(digits, '0'));
  if (!Number.isSafeInteger(minor)) return null;
  return m[1] === '-' && minor !== 0 ? -minor : minor;
}

/** Minor units → a plain decimal with `digits` decimals: 1250 → "12.50", -5 → "-0.05", 1500 (0 digits) → "1500". */
export function minorUnitsToDecimal(minor: number, digits: number): string {
  const text = String(Math.abs(minor)).padStart(digits + 1, '0');
  const sign = minor < 0 ? '-' : '';
  return digits > 0 ? `${sign}${text.slice(0, -digits)}.${text.slice(-digits)}` : `${sign}${text}`;
}
