import { describe, test, expect } from 'vitest';
import { idParams, recordId } from '@/lib/route-params';

describe('route parameters', () => {
  test('an [id] is a positive whole number within PostgreSQL integer (2^31 − 1)', () => {
    expect(recordId('Scan').parse('42')).toBe(42);
    expect(recordId('Scan').parse('2147483647')).toBe(2_147_483_647);
    for (const bad of ['0', '-1', '1.5', 'abc', '', '2147483648', '99999999999', '1e3x']) expect(recordId('Scan').safeParse(bad).success, bad).toBe(false);
  });
  test('the refusal names what the id is of', () => {
    const r = idParams('Attachment').safeParse({ id: 'abc' });
    expect(r.success).toBe(false);
    if (!r.success) expect(r.error.issues[0]!.message).toBe('Attachment ids are positive whole numbers.');
  });
});
