// Fill records as the trip pages show them (seal checks: seal-check.test.ts).
import { describe, test, expect } from 'vitest';
import { fillRecordText } from '@/lib/trips/trip-display.ts';

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
