import { describe, test, expect } from 'vitest';
import {
  collectionRequestFields,
  damageReportFields,
  fieldProblems,
  isHoneypotFilled,
  phoneProblem,
  textFields,
  HONEYPOT_FIELD,
  MAX_EMAIL_CHARS,
  plannerCollectionRequest,
} from '@/lib/requests/report-forms';

const good = { quantity: '6', locationNote: '', contactName: 'Mila de Boer', contactPhone: '+31 6 1234 5678', contactEmail: '', note: '' };

function problems(schema: typeof collectionRequestFields | typeof damageReportFields, values: Record<string, string>) {
  const r = schema.safeParse(values);
  return r.success ? {} : fieldProblems(r.error);
}

describe('"empty and ready for collection" form', () => {
  test('a filled form becomes typed values; empty optional fields become null', () => {
    const r = collectionRequestFields.parse({ ...good, locationNote: '  Gate 3  ' });
    expect(r).toEqual({ quantity: 6, locationNote: 'Gate 3', contactName: 'Mila de Boer', contactPhone: '+31 6 1234 5678', contactEmail: null, note: null });
  });
  test.each([
    ['', /how many/i],
    ['0', /at least one/i],
    ['501', /at most 500/i],
    ['6.5', /whole number/i],
    ['-2', /whole number/i],
    ['six', /whole number/i],
    ['1e2', /whole number/i],
  ])('quantity %j is refused', (quantity, message) => {
    expect(problems(collectionRequestFields, { ...good, quantity }).quantity).toMatch(message);
  });
  test('the bounds 1 and 500 are accepted (the column allows 1–500)', () => {
    expect(collectionRequestFields.parse({ ...good, quantity: '1' }).quantity).toBe(1);
    expect(collectionRequestFields.parse({ ...good, quantity: ' 500 ' }).quantity).toBe(500);
  });
  test('a name is needed, and a phone number or an e-mail address', () => {
    expect(problems(collectionRequestFields, { ...good, contactName: ' ' }).contactName).toMatch(/your name/i);
    const none = problems(collectionRequestFields, { ...good, contactPhone: '', contactEmail: '' });
    expect(none.contactPhone).toMatch(/phone number or an e-mail/);
    expect(collectionRequestFields.parse({ ...good, contactPhone: '', contactEmail: 'mila@example.org' }).contactEmail).toBe('mila@example.org');
  });
  test('missing fields (not sent at all) are refused with the same words, not a crash', () => {
    const p = problems(collectionRequestFields, {});
    expect(p.quantity).toMatch(/how many/i);
    expect(p.contactName).toMatch(/your name/i);
  });
  test('over-long text is refused per field', () => {
    const p = problems(collectionRequestFields, { ...good, locationNote: 'x'.repeat(301), note: 'y'.repeat(1001), contactEmail: `${'a'.repeat(250)}@b.example` });
    expect(Object.keys(p).sort()).toEqual(['contactEmail', 'locationNote', 'note']);
  });
  test('fieldProblems keeps the first message per field', () => {
    const p = problems(collectionRequestFields, { ...good, quantity: 'x', contactPhone: 'abc' });
    expect(p.quantity).toMatch(/whole number/);
    expect(p.contactPhone).toMatch(/digits/);
  });
});

describe('phone numbers', () => {
  // ITU-T Recommendation E.164 §6: at most 15 digits in an international number.
  test('E.164 allows at most 15 digits', () => {
    expect(phoneProblem('+123 456 789 012 345')).toBeNull(); // 15 digits
    expect(phoneProblem('+123 456 789 012 3456')).toMatch(/at most 15/);
  });
  test('the usual written forms are accepted; letters are not', () => {
    for (const p of ['+31 (0)10 000 0000', '010-000.0000', '0031 6 12345678', '06/12345678']) expect(phoneProblem(p)).toBeNull();
    expect(phoneProblem('call me')).toMatch(/digits/);
    expect(phoneProblem('12345')).toMatch(/too short/);
  });
});

describe('"report damage" form', () => {
  test('a description is required (at least 3 characters, as the column demands)', () => {
    expect(problems(damageReportFields, { description: '  ' }).description).toMatch(/what is wrong/i);
    expect(problems(damageReportFields, { description: 'ok' }).description).toMatch(/few words/);
    expect(damageReportFields.parse({ description: ' Cracked floor panel ' })).toEqual({ description: 'Cracked floor panel', contactName: null, contactEmail: null });
  });
  test('contact is optional but an e-mail must look like one', () => {
    expect(problems(damageReportFields, { description: 'Bent leg', contactEmail: 'not-an-address' }).contactEmail).toMatch(/e-mail/);
    // RFC 5321 §4.5.3.1.3: a forward-path is at most 256 octets with its angle brackets, so 254 for the address.
    expect(MAX_EMAIL_CHARS).toBe(256 - 2);
  });
});

describe('form plumbing', () => {
  test("textFields keeps only the form's own text fields, first value wins, files are left out", () => {
    const file = new File(['x'], 'x.png');
    const out = textFields('damage', [
      ['description', 'Leak'],
      ['description', 'second'],
      ['photo', file],
      ['quantity', '9'],
      ['contactName', 'Ann'],
    ]);
    expect(out).toEqual({ description: 'Leak', contactName: 'Ann' });
  });
  test('the honeypot counts only when something was typed into it', () => {
    expect(isHoneypotFilled([[HONEYPOT_FIELD, '']])).toBe(false);
    expect(isHoneypotFilled([[HONEYPOT_FIELD, '  ']])).toBe(false);
    expect(isHoneypotFilled([['contactName', 'x']])).toBe(false);
    expect(isHoneypotFilled([[HONEYPOT_FIELD, 'http://spam.example']])).toBe(true);
  });
});

describe('a collection request the planner records', () => {
  const ok = { siteId: 4, quantity: 12, readyOn: '2027-01-14', contactName: 'Gate office', contactPhone: '', note: '' };
  test('the customer site, a whole number of bins, the ready day and who to ask for', () => {
    expect(plannerCollectionRequest.parse(ok)).toEqual({ ...ok, contactPhone: null, note: null });
  });
  test.each([
    [{ siteId: undefined }, 'siteId', 'Choose the customer site.'],
    [{ quantity: 0 }, 'quantity', 'At least one bin.'],
    [{ quantity: 2.5 }, 'quantity', 'Give the number of bins as a whole number.'],
    [{ quantity: 501 }, 'quantity', 'At most 500 bins in one request.'],
    [{ readyOn: '14/01/2027' }, 'readyOn', 'must be a date like 2027-01-14'],
    [{ readyOn: '2027-02-30' }, 'readyOn', 'must be a date like 2027-01-14'],
    [{ contactName: ' ' }, 'contactName', 'Name the person to ask for at the site.'],
    [{ contactPhone: '12' }, 'contactPhone', phoneProblem('12')!],
  ])('%o is refused on %s', (change, field, message) => {
    const r = plannerCollectionRequest.safeParse({ ...ok, ...change });
    expect(r.success).toBe(false);
    if (!r.success) expect(fieldProblems(r.error)[field]).toBe(message);
  });
  test('unknown fields are refused (the customer follows from the site, it is not sent)', () => {
    expect(plannerCollectionRequest.safeParse({ ...ok, customerId: 9 }).success).toBe(false);
  });
});
