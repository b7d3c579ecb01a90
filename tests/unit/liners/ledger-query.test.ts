import { describe, test, expect } from 'vitest';
import { ledgerQuery, ledgerSearch } from '@/lib/liners/ledger-query';

describe('the stock-move filter', () => {
  test('empty fields are no filter; a kind, a lot prefix and dates are kept', () => {
    expect(ledgerQuery({ kind: '', lot: '', from: '', to: '' })).toEqual({ ok: true, value: {} });
    expect(ledgerQuery({ kind: 'fitted', lot: ' XP ', from: '2026-11-01', to: '2026-11-30' })).toEqual({
      ok: true,
      value: { kind: 'fitted', lot: 'XP', from: '2026-11-01', to: '2026-11-30' },
    });
  });
  test('a date not in the calendar, an unknown kind or a reversed range is a message', () => {
    expect(ledgerQuery({ from: '2026-13-45' })).toMatchObject({ ok: false, message: expect.stringMatching(/not a date/) });
    expect(ledgerQuery({ kind: 'stolen' })).toMatchObject({ ok: false });
    expect(ledgerQuery({ from: '2026-12-02', to: '2026-12-01' })).toMatchObject({ ok: false, message: expect.stringMatching(/after/) });
    expect(ledgerQuery({ from: '0001-01-01' })).toMatchObject({ ok: false });
  });
  test('back to a query string', () => {
    expect(ledgerSearch({ depot: 2, kind: 'receipt', lot: 'XP' })).toBe('?depot=2&kind=receipt&lot=XP');
    expect(ledgerSearch({})).toBe('');
  });
});
