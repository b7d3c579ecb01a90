// Reading a carton label. Expected values worked by hand from the AI table of the GS1 General Specifications
// (01 = GTIN-14, 10 = batch/lot up to 20 characters, 11/17 = production/expiry date YYMMDD, 30 = count).
import { describe, test, expect } from 'vitest';
import { readCartonLabel, digitalLinkElements } from '@/lib/liners/carton-label';

const GS = '\u001d';

describe('carton labels', () => {
  test('a bracketed element string', () => {
    expect(readCartonLabel('(01)09501234567890(17)280901(11)260901(10)LOT-77(30)200')).toEqual({
      lotNumber: 'LOT-77',
      gtin: '09501234567890',
      manufacturedOn: '2026-09-01',
      expiryDate: '2028-09-01',
      quantity: 200,
      read: 'gs1',
    });
  });
  test('the same as a scanner sends it: no brackets, a group separator after the variable-length lot', () => {
    expect(readCartonLabel(`0109501234567890172809011126090110LOT77${GS}30200`)).toMatchObject({ lotNumber: 'LOT77', expiryDate: '2028-09-01', quantity: 200 });
  });
  test('a GS1 Digital Link URI with the lot in the path and the expiry in the query', () => {
    expect(digitalLinkElements('https://id.example.com/01/09501234567890/10/PV%2F2611?17=281130')).toBe('(01)09501234567890(10)PV/2611(17)281130');
    expect(readCartonLabel('https://id.example.com/01/09501234567890/10/PV-2611?17=281130&30=150')).toMatchObject({
      lotNumber: 'PV-2611',
      expiryDate: '2028-11-30',
      quantity: 150,
      read: 'digital_link',
    });
  });
  test('a printed lot number alone, and text that is none of these', () => {
    expect(readCartonLabel(' PVL-2611-04 ')).toEqual({ lotNumber: 'PVL-2611-04', gtin: null, manufacturedOn: null, expiryDate: null, quantity: null, read: 'plain' });
    expect(readCartonLabel('hello world!')).toBeNull();
    expect(readCartonLabel('')).toBeNull();
  });
});
