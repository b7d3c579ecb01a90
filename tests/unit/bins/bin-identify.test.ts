import { describe, test, expect } from 'vitest';
import { identify, identifyDecoded, isIdentified } from '@/lib/bins/bin-identify';
import { makeGrai } from '@/lib/gs1';

// EPC Tag Data Standard translation test vector (REFERENCES §4, published): element string 00614141123452400
// = company prefix 0614141 (7 digits), asset type 12345, check digit 2, serial 400
// = urn:epc:id:grai:0614141.12345.400; its GS1 Digital Link URI is https://id.gs1.org/8003/00614141123452400.
const TDS_VALUE = '00614141123452400';
const TDS_EPC = 'urn:epc:id:grai:0614141.12345.400';
const TDS_LINK = 'https://id.gs1.org/8003/00614141123452400';
const PREFIX = 7;

describe('identify (typed or pasted text)', () => {
  test.each([
    ['the element string', TDS_VALUE],
    ['with the AI in brackets', `(8003)${TDS_VALUE}`],
    ['grouped for reading aloud', '0 0614141 12345 2 · 400'],
    ['a Digital Link URI pasted from a label', TDS_LINK],
    ['the EPC URI', TDS_EPC],
  ])('%s → the canonical GRAI', (_what, text) => {
    expect(identify(text, PREFIX)).toEqual({ grai: TDS_VALUE, serial: null });
  });

  test('a short code is taken as the serial printed under the QR', () => {
    expect(identify(' 100528 ', PREFIX)).toEqual({ grai: null, serial: '100528' });
  });

  test('a wrong check digit is caught, not taken as a serial', () => {
    const r = identify('00614141123453400', PREFIX); // check digit 3 instead of 2
    expect(isIdentified(r)).toBe(false);
    expect((r as { error: string }).error).toMatch(/check digit/i);
  });

  test('a GRAI without serial names a bin type, not a bin', () => {
    expect(isIdentified(identify('00614141123452', PREFIX))).toBe(false);
  });

  test('empty input asks for the GRAI', () => {
    expect(identify('   ', PREFIX)).toEqual({ error: expect.stringMatching(/Type the GRAI/) });
  });
});

describe('identifyDecoded (text from a QR code, camera or photo)', () => {
  test('a label QR (Digital Link on any host) identifies the bin', () => {
    expect(identifyDecoded(TDS_LINK, PREFIX)).toEqual({ grai: TDS_VALUE, serial: null });
    const demo = makeGrai('9521234', '10010', '100528');
    expect(identifyDecoded(`http://192.168.1.20:4321/8003/${demo}`, PREFIX)).toEqual({ grai: demo, serial: null });
  });

  test('a Digital Link with a query string or further segments still names the bin', () => {
    expect(identifyDecoded(`${TDS_LINK}?linkType=gs1:pip`, PREFIX)).toEqual({ grai: TDS_VALUE, serial: null });
  });

  test('some other QR code is refused and its text shown, never taken as a serial', () => {
    const r = identifyDecoded('WIFI:S:yard;T:WPA;P:secret;;', PREFIX);
    expect(isIdentified(r)).toBe(false);
    expect((r as { error: string }).error).toMatch(/not a bin label.*WIFI:S:yard/);
    // A short text that typed entry would accept as a serial is still not a label.
    expect(isIdentified(identifyDecoded('100528', PREFIX))).toBe(false);
  });

  test('a Digital Link without serial (an asset type) is refused', () => {
    expect(identifyDecoded('https://id.gs1.org/8003/00614141123452', PREFIX)).toEqual({ error: expect.stringMatching(/bin type, not one bin/) });
  });

  test('a long unrelated text is shortened in the message', () => {
    const r = identifyDecoded(`https://example.org/${'x'.repeat(200)}`, PREFIX) as { error: string };
    expect(r.error.length).toBeLessThan(300);
    expect(r.error).toContain('…');
  });
});
