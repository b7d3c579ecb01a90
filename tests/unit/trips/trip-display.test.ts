// Seal checks and fill records as the trip pages show them. Tamper-evident seal numbers recorded at filling
// and compared at discharge is common practice for sealed bulk loads (no single published source).
import { describe, test, expect } from 'vitest';
import { fillRecordText, sealCheck, sealState } from '@/lib/trips/trip-display.ts';

describe('seal check', () => {
  test('no seals yet; sealed but not checked; checked and equal (in any order)', () => {
    expect(sealState([], [], false)).toBe('not_sealed');
    expect(sealState(['TE1001', 'TE1002'], [], false)).toBe('awaiting_check');
    expect(sealState(['TE1001', 'TE1002'], ['TE1002', 'TE1001'], false)).toBe('match');
  });

  test('a replaced, missing or extra seal is a mismatch even when the scan did not flag it', () => {
    expect(sealState(['TE1001', 'TE1002'], ['TE1001', 'TE9999'], false)).toBe('mismatch');
    expect(sealState(['TE1001', 'TE1002'], ['TE1001'], false)).toBe('mismatch');
    expect(sealState(['TE1001'], ['TE1001', 'TE1002'], false)).toBe('mismatch');
    expect(sealState(['TE1001'], ['te1001'], false)).toBe('mismatch'); // compared exactly, as the discharge scan does
  });

  test('a flagged scan is a mismatch whatever the lists say', () => {
    expect(sealState(['TE1001'], ['TE1001'], true)).toBe('mismatch');
  });

  test('always a word and an icon', () => {
    expect(sealCheck(['TE1'], ['TE2'], false)).toEqual({ state: 'mismatch', label: 'Seal mismatch', icon: 'alert', tone: 'fault' });
    expect(sealCheck(['TE1'], ['TE1'], false)).toMatchObject({ label: 'Checked: seals match', icon: 'check' });
  });
});

describe('fill record', () => {
  test('product, volume, mass and temperature with units (after a no-break space); NUMERIC strings lose a trailing .0', () => {
    const nb = '\u00a0';
    expect(fillRecordText({ product: 'Rapeseed oil, refined', volumeL: '912.0', massKg: '839.0', temperatureC: '14.0' })).toBe(
      `Rapeseed oil, refined · 912${nb}L · 839${nb}kg · 14${nb}°C`,
    );
    expect(fillRecordText({ product: null, volumeL: 1000.5, massKg: null, temperatureC: '-3.5' })).toBe(`1,000.5${nb}L · -3.5${nb}°C`);
  });

  test('nothing recorded: null', () => {
    expect(fillRecordText({ product: ' ', volumeL: null, massKg: '', temperatureC: null })).toBeNull();
  });
});
