import { describe, test, expect } from 'vitest';
import { canonicalTimeZone, parseMailbox, settingsSchema } from '@/lib/settings/settings-schema';
import { fractionToPercent, percentToFraction } from '@/lib/percent';

const valid = {
  version: 0,
  operatorName: 'Example Pool',
  gs1CompanyPrefix: '9521234',
  gs1PrefixLength: 7,
  digitalLinkBase: 'https://id.pool.example/',
  timeZone: 'Europe/Amsterdam',
  currency: 'eur',
  taxRate: '0.21',
  mailSender: 'Pool desk <pool@pool.example>',
  returnInstructions: ' Fold it. ',
  undoSeconds: 30,
};

describe('settings form', () => {
  test('a valid form is normalised', () => {
    expect(settingsSchema.parse(valid)).toMatchObject({ digitalLinkBase: 'https://id.pool.example', currency: 'EUR', returnInstructions: 'Fold it.' });
  });
  test('overdue-return reminders after 1 to 365 whole days; left out, the setting stays as it was', () => {
    expect(settingsSchema.parse({ ...valid, reminderDaysOver: 7 }).reminderDaysOver).toBe(7);
    expect(settingsSchema.parse(valid).reminderDaysOver).toBeUndefined();
    for (const d of [0, 366, 2.5]) expect(settingsSchema.safeParse({ ...valid, reminderDaysOver: d }).success).toBe(false);
  });
  test('time zones are checked against the IANA database (as shipped with the runtime)', () => {
    expect(canonicalTimeZone('Europe/Amsterdam')).toBe('Europe/Amsterdam');
    expect(canonicalTimeZone('america/new_york')).toBe('America/New_York');
    expect(canonicalTimeZone('UTC')).toBe('UTC');
    expect(canonicalTimeZone('Mars/Olympus')).toBeNull();
    expect(canonicalTimeZone('UTC+1')).toBeNull(); // an offset, not a zone
  });
  test('currencies: three letters that ISO 4217 lists (EUR, GBP, CHF yes; XYZ no)', () => {
    for (const c of ['EUR', 'GBP', 'CHF', 'USD']) expect(settingsSchema.safeParse({ ...valid, currency: c }).success).toBe(true);
    for (const c of ['XYZ', 'EURO', 'E1R']) expect(settingsSchema.safeParse({ ...valid, currency: c }).success).toBe(false);
  });
  test('GS1 company prefixes are 4 to 12 digits (GS1 General Specifications; range from memory) and the length must match', () => {
    expect(settingsSchema.safeParse({ ...valid, gs1CompanyPrefix: '952', gs1PrefixLength: 3 }).success).toBe(false);
    expect(settingsSchema.safeParse({ ...valid, gs1CompanyPrefix: '952123456789', gs1PrefixLength: 12 }).success).toBe(true);
    const mismatch = settingsSchema.safeParse({ ...valid, gs1PrefixLength: 8 });
    expect(mismatch.error!.issues.map((i) => i.path.join('.'))).toEqual(['gs1PrefixLength']);
  });
  test('tax rate is a fraction below 1 with up to 4 decimals', () => {
    for (const t of ['0', '0.2', '0.2100', '0.9999']) expect(settingsSchema.safeParse({ ...valid, taxRate: t }).success).toBe(true);
    for (const t of ['1', '21', '0.21000', '-0.1', '.21']) expect(settingsSchema.safeParse({ ...valid, taxRate: t }).success).toBe(false);
  });
  test('Digital Link base: http(s) only, no query or fragment', () => {
    for (const u of ['ftp://x.example', 'https://x.example/?a=1', 'https://x.example/#f', 'x.example']) {
      expect(settingsSchema.safeParse({ ...valid, digitalLinkBase: u }).success).toBe(false);
    }
  });
});

describe('mail sender', () => {
  test.each([
    ['pool@pool.example', { name: null, address: 'pool@pool.example' }],
    ['Pool desk <pool@pool.example>', { name: 'Pool desk', address: 'pool@pool.example' }],
    ['"Pool, desk" <pool@pool.example>', { name: 'Pool, desk', address: 'pool@pool.example' }],
    ['<pool@pool.example>', { name: null, address: 'pool@pool.example' }],
  ])('%s', (v, expected) => {
    expect(parseMailbox(v)).toEqual(expected);
  });
  test.each(['pool', 'Pool desk', 'Pool <pool>', 'a <b@c.example> d'])('%s is refused', (v) => {
    expect(parseMailbox(v)).toBeNull();
  });
});

describe('percent ↔ fraction, as decimal strings', () => {
  test.each([
    ['0.2100', '21'],
    ['0.0550', '5.5'],
    ['0.0700', '7'],
    ['0.0000', '0'],
    ['0', '0'],
    ['0.9999', '99.99'],
    ['0.2', '20'],
  ])('%s → %s %%', (f, p) => {
    expect(fractionToPercent(f)).toBe(p);
  });
  test.each([
    ['21', '0.2100'],
    ['5.5', '0.0550'],
    ['7', '0.0700'],
    ['0', '0.0000'],
    ['99,99', '0.9999'],
  ])('%s %% → %s', (p, f) => {
    expect(percentToFraction(p)).toBe(f);
  });
  test('out of range or too precise', () => {
    for (const p of ['100', '-1', '5.555', 'abc', '']) expect(percentToFraction(p)).toBeNull();
    expect(fractionToPercent('1.0')).toBeNull();
  });
});

describe('the undo window', () => {
  test('whole seconds from 0 (no undo) to 600', async () => {
    const { settingsSchema: s } = await import('@/lib/settings/settings-schema');
    for (const ok of [0, 30, 600]) expect(s.safeParse({ ...valid, undoSeconds: ok }).success).toBe(true);
    for (const bad of [-1, 601, 2.5, '30']) expect(s.safeParse({ ...valid, undoSeconds: bad }).success).toBe(false);
  });
});
