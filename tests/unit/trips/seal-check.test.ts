// The seal check. Tamper-evident seal numbers recorded at filling and compared at discharge is common practice
// for sealed bulk loads (no single published source). Expected values below are worked by hand.
import { describe, expect, test } from 'vitest';
import { repeatedSeals, sealCheck, sealDifference, sealsMatch, sealState } from '@/lib/trips/seal-check';
import { scanEventSchema } from '@/lib/scans/scan-schema';
import { sealMismatchMail } from '@/lib/mail/mail-templates';

describe('sealState', () => {
  test('no seals yet; sealed but not checked; checked and equal', () => {
    expect(sealState([], [], false)).toBe('not_sealed');
    expect(sealState(['TE1001', 'TE1002'], [], false)).toBe('awaiting_check');
    expect(sealState(['TE1001', 'TE1002'], ['TE1001', 'TE1002'], false)).toBe('match');
  });

  test('order does not matter', () => {
    expect(sealState(['TE1001', 'TE1002'], ['TE1002', 'TE1001'], false)).toBe('match');
    expect(sealState(['A', 'B', 'C'], ['C', 'A', 'B'], false)).toBe('match');
  });

  test('a replaced, missing or extra seal is a mismatch even when the scan did not flag it', () => {
    expect(sealState(['TE1001', 'TE1002'], ['TE1001', 'TE9999'], false)).toBe('mismatch');
    expect(sealState(['TE1001', 'TE1002'], ['TE1001'], false)).toBe('mismatch');
    expect(sealState(['TE1001'], ['TE1001', 'TE1002'], false)).toBe('mismatch');
    expect(sealState(['TE1001'], ['te1001'], false)).toBe('mismatch'); // compared exactly
  });

  test('duplicated numbers count as often as they appear (multisets, not sets)', () => {
    expect(sealState(['TE1', 'TE2'], ['TE1', 'TE1'], false)).toBe('mismatch'); // a set comparison said "match" here
    expect(sealState(['TE1', 'TE1'], ['TE1'], false)).toBe('mismatch');
    expect(sealState(['TE1'], ['TE1', 'TE1'], false)).toBe('mismatch');
    expect(sealState(['TE1', 'TE1', 'TE2'], ['TE2', 'TE1', 'TE1'], false)).toBe('match');
  });

  test('a flagged scan is a mismatch whatever the lists say', () => {
    expect(sealState(['TE1001'], ['TE1001'], true)).toBe('mismatch');
    expect(sealState([], [], true)).toBe('mismatch');
  });

  test('always a word and an icon', () => {
    expect(sealCheck(['TE1'], ['TE2'], false)).toEqual({ state: 'mismatch', label: 'Seal mismatch', icon: 'alert', tone: 'fault' });
    expect(sealCheck(['TE1'], ['TE1'], false)).toMatchObject({ label: 'Checked: seals match', icon: 'check' });
  });
});

describe('sealsMatch, sealDifference, repeatedSeals', () => {
  test('difference as multisets', () => {
    expect(sealDifference(['TE1', 'TE2'], ['TE1', 'TE1'])).toEqual({ missing: ['TE2'], unexpected: ['TE1'] });
    expect(sealDifference(['TE1', 'TE2'], ['TE2', 'TE1'])).toEqual({ missing: [], unexpected: [] });
    expect(sealDifference(['A', 'B'], ['C'])).toEqual({ missing: ['A', 'B'], unexpected: ['C'] });
    expect(sealsMatch(['B', 'A'], ['A', 'B'])).toBe(true);
    expect(sealsMatch(['A', 'B'], ['A', 'A'])).toBe(false);
    expect(sealsMatch([], [])).toBe(true);
  });

  test('repeats are named once each', () => {
    expect(repeatedSeals(['TE1', 'TE2', 'TE1', 'TE3', 'TE2', 'TE1'])).toEqual(['TE1', 'TE2']);
    expect(repeatedSeals(['TE1', 'te1'])).toEqual([]);
  });
});

describe('a repeated number within one list is refused at input', () => {
  const base = { clientEventId: '2b1f6c1e-8a41-4c5e-9d2e-3f4a5b6c7d8e', assetId: 1 };

  test('fill and seal', () => {
    const r = scanEventSchema.safeParse({ ...base, action: 'fill_seal', fill: { product: 'Oil', seals: ['TE1', 'TE2', 'TE1'] } });
    expect(r.success).toBe(false);
    expect(r.error!.issues).toEqual([
      expect.objectContaining({ path: ['fill', 'seals'], message: 'Seal number TE1 is listed twice; each seal has its own number, so enter every seal once.' }),
    ]);
  });

  test('discharge', () => {
    const r = scanEventSchema.safeParse({ ...base, action: 'discharge', sealsVerified: ['TE1', 'TE1'] });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0]).toMatchObject({ path: ['sealsVerified'], message: expect.stringContaining('TE1 is listed twice') });
  });

  test('re-ordered distinct numbers are accepted; after trimming " TE1" and "TE1" are the same number', () => {
    expect(scanEventSchema.safeParse({ ...base, action: 'discharge', sealsVerified: ['TE2', 'TE1'] }).success).toBe(true);
    expect(scanEventSchema.safeParse({ ...base, action: 'discharge', sealsVerified: [' TE1', 'TE1'] }).success).toBe(false);
  });
});

describe('the planners alert names what differs, counted as multisets', () => {
  test('[TE1, TE2] fitted, [TE1, TE1] found: TE2 not found, one TE1 unexpected', () => {
    const mail = sealMismatchMail({
      operatorName: 'Op',
      serial: '17',
      grai: '0 9520123 45678 8 · 17',
      siteName: null,
      customerName: null,
      applied: ['TE1', 'TE2'],
      found: ['TE1', 'TE1'],
      at: new Date('2027-03-14T09:00:00Z'),
      timeZone: 'UTC',
      link: 'https://x/b',
    });
    expect(mail.text).toContain('Not found: TE2');
    expect(mail.text).toContain('Unexpected: TE1');
  });
});
