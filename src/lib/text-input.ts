// The one string type for text that arrives from outside (JSON bodies, query
// strings, forms). Pure. Control characters are refused at the schema: NUL
// cannot be stored by PostgreSQL at all (a 500 before this), and the other C0
// and C1 controls (Unicode general category Cc: U+0000–U+001F, U+007F–U+009F)
// have no business in a name, a note or a filter. Multi-line fields (notes,
// descriptions, pasted lists) may hold line breaks and tabs, nothing else.
import { z } from 'zod';

/** Any Cc control character. */
const CONTROL_CHARACTER = /[\u0000-\u001F\u007F-\u009F]/;
/** A Cc control character other than tab, line feed and carriage return. */
const CONTROL_CHARACTER_EXCEPT_LINE_BREAKS = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F-\u009F]/;

export const CONTROL_MESSAGE = 'Remove the control characters (invisible characters such as NUL) from this text.';

export function hasControlCharacter(value: string, { multiline = false } = {}): boolean {
  return (multiline ? CONTROL_CHARACTER_EXCEPT_LINE_BREAKS : CONTROL_CHARACTER).test(value);
}

const SINGLE_LINE = /^[^\u0000-\u001F\u007F-\u009F]*$/;
const MULTI_LINE = /^[^\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F-\u009F]*$/;

/** A one-line text field: no control characters at all. Chain .trim(), .min(), .max(), .email() … as on z.string(). */
export function text(params?: Parameters<typeof z.string>[0]): z.ZodString {
  return z.string(params).regex(SINGLE_LINE, CONTROL_MESSAGE);
}

/** A multi-line text field: line breaks and tabs allowed, other control characters refused. */
export function multilineText(params?: Parameters<typeof z.string>[0]): z.ZodString {
  return z.string(params).regex(MULTI_LINE, CONTROL_MESSAGE);
}

// Calendar dates people and filters may name. Outside this range a date is a
// typing slip or a probe (0000-01-01, 9999-12-31), and PostgreSQL's date
// arithmetic near its own limits fails; common practice, not a standard.
const EARLIEST_DAY = '1900-01-01';
const LATEST_DAY = '2200-12-31';
export const DATE_RANGE_MESSAGE = `must be a date between ${EARLIEST_DAY.slice(0, 4)} and ${LATEST_DAY.slice(0, 4)}`;

/** A YYYY-MM-DD text inside the sane range (string order is date order for this form). */
export function inDateRange(day: string): boolean {
  return /^\d{4}-\d{2}-\d{2}$/.test(day) && day >= EARLIEST_DAY && day <= LATEST_DAY;
}
