// The shared text type and date range (src/lib/text-input.ts), and the places
// that are no zod schema but use the same rule: grid filters and the trip list.
// Control characters: Unicode general category Cc (U+0000–U+001F, U+007F–U+009F),
// per the Unicode Character Database; PostgreSQL cannot store U+0000 in text at all
// (PostgreSQL manual, "Character Types").
import { describe, test, expect } from 'vitest';
import { z } from 'zod';
import { hasControlCharacter, inDateRange, multilineText, text } from '@/lib/text-input';
import { GridQueryError, parseFilterModel } from '@/lib/fleet/grid-query';
import { parseTripListQuery } from '@/lib/trips/trip-list-query';
import { collectionRequestFields } from '@/lib/requests/report-forms';
import { scanEventSchema } from '@/lib/scans/scan-schema';

describe('control characters', () => {
  test.each([
    ['Probe\u0000Tester', true, true],
    ['bell\u0007', true, true],
    ['esc\u001B[31m', true, true],
    ['del\u007F', true, true],
    ['c1\u0085', true, true],
    ['line\nbreak', true, false],
    ['cr\r\nlf', true, false],
    ['tab\there', true, false],
    ['Mila de Boer', false, false],
    ['Zürich — “quotes” ✓', false, false],
    ['\u00A0no-break space', false, false],
  ] as const)('%j: one-line refuses %j, multi-line refuses %j', (value, single, multi) => {
    expect(hasControlCharacter(value)).toBe(single);
    expect(hasControlCharacter(value, { multiline: true })).toBe(multi);
    expect(text().safeParse(value).success).toBe(!single);
    expect(multilineText().safeParse(value).success).toBe(!multi);
  });
  test('text() chains like z.string()', () => {
    const schema = text().trim().min(2).max(5);
    expect(schema.parse('  abc ')).toBe('abc');
    expect(schema.safeParse('a').success).toBe(false);
    expect(z.object({ n: text().email() }).safeParse({ n: 'x@example.org' }).success).toBe(true);
  });
  test('the public form refuses "Probe\\0Tester" with a message, the scan schema a NUL note or checklist key', () => {
    const r = collectionRequestFields.safeParse({ quantity: '2', contactName: 'Probe\u0000Tester', contactPhone: '+44 1632 960000' });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0]!.message).toMatch(/control characters/);
    const base = { clientEventId: '2f1d3c4b-5a69-4788-9a0b-1c2d3e4f5a6b', grai: '(8003)09521234100102999999', action: 'receive' };
    expect(scanEventSchema.safeParse({ ...base, note: 'ok' }).success).toBe(true);
    expect(scanEventSchema.safeParse({ ...base, note: 'a\u0000b' }).success).toBe(false);
    expect(scanEventSchema.safeParse({ ...base, checklist: { 'valve\u0000': true } }).success).toBe(false);
  });
});

describe('dates between 1900 and 2200', () => {
  test.each([
    ['1900-01-01', true],
    ['2200-12-31', true],
    ['2026-12-02', true],
    ['1899-12-31', false],
    ['2201-01-01', false],
    ['0000-01-01', false],
    ['9999-12-31', false],
    ['26-12-02', false],
  ] as const)('%s → %j', (day, ok) => expect(inDateRange(day)).toBe(ok));

  test.each(['0000-01-01', '9999-12-31'])('a grid date filter of %s is refused, not sent to the database', (day) => {
    expect(() => parseFilterModel({ lastScanAt: { filterType: 'date', type: 'lessThan', dateFrom: day } })).toThrow(GridQueryError);
    expect(() => parseFilterModel({ nextDue: { filterType: 'date', type: 'inRange', dateFrom: '2026-01-01', dateTo: day } })).toThrow(/between 1900 and 2200/);
  });
  test('a grid text filter with NUL is refused', () => {
    expect(() => parseFilterModel({ serial: { filterType: 'text', type: 'contains', filter: 'a\u0000' } })).toThrow(/control characters/);
  });
  test.each([
    ['to', '9999-12-31'],
    ['from', '0000-01-01'],
  ])('the trip list refuses %s=%s', (key, day) => {
    const r = parseTripListQuery({ [key]: day });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.issues.map((i) => i.field)).toContain(key);
  });
});
