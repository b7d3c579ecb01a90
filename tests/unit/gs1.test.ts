import { describe, test, expect } from 'vitest';
import fc from 'fast-check';
import { formatGrai, graiToDigitalLink, graiToEpcUri, groupGrai, gs1CheckDigit, isGs1Cs82Char, makeGrai, parseGrai, parseSerialisedGrai } from '@/lib/gs1.ts';
import type { GraiParseResult } from '@/lib/gs1.ts';

/** Narrows a parse result for the assertions that follow. */
function okParts(result: GraiParseResult) {
  if (!result.ok) throw new Error(`expected a GRAI, got ${result.error.code}: ${result.error.message}`);
  return result.grai;
}

function errorCode(result: GraiParseResult): string {
  return result.ok ? 'ok' : result.error.code;
}

// EPC Tag Data Standard translation test vector (REFERENCES §4).
const TDS_ELEMENT_VALUE = '00614141123452400';
const TDS_EPC_URI = 'urn:epc:id:grai:0614141.12345.400';

// Demo identifiers use GS1 prefix 952, which GS1 keeps for demonstrations and
// examples (from memory, not confirmed). Check digit 8 worked by hand:
// 952012345678, weights 1,3,…,3 from the left: 9+15+2+0+1+6+3+12+5+18+7+24 = 102 → 8.
const DEMO_VALUE = '0952012345678' + '8' + '000417';

describe('gs1CheckDigit (GS1 General Specifications, mod-10 check digit)', () => {
  test('published example 730001100001 → 7', () => {
    expect(gs1CheckDigit('730001100001')).toBe(7);
  });
  test('published example 890400021003 → 7', () => {
    expect(gs1CheckDigit('890400021003')).toBe(7);
  });
  test('EPC Tag Data Standard vector: 061414112345 → 2', () => {
    expect(gs1CheckDigit('061414112345')).toBe(2);
  });
  test('worked by hand for the demo prefix: 952012345678 → 8', () => {
    expect(gs1CheckDigit('952012345678')).toBe(8);
  });
  test('refuses non-digits', () => {
    expect(() => gs1CheckDigit('12a4')).toThrow(RangeError);
    expect(() => gs1CheckDigit('')).toThrow(RangeError);
  });
});

describe('GS1 AI encodable character set 82 (GS1 General Specifications)', () => {
  test('exactly 82 printable ASCII characters belong to the set', () => {
    const members: string[] = [];
    for (let code = 0x20; code < 0x7f; code++) {
      const ch = String.fromCharCode(code);
      if (isGs1Cs82Char(ch)) members.push(ch);
    }
    expect(members).toHaveLength(82);
    for (const outside of [' ', '#', '$', '@', '[', '\\', ']', '^', '`', '{', '|', '}', '~']) {
      expect(isGs1Cs82Char(outside)).toBe(false);
    }
  });
});

describe('parseGrai: element string (GS1 General Specifications, AI 8003)', () => {
  test('EPC Tag Data Standard translation test vector: 00614141123452400 with a 7-digit prefix', () => {
    const grai = okParts(parseGrai(TDS_ELEMENT_VALUE, { companyPrefixLength: 7 }));
    expect(grai).toEqual({
      value: TDS_ELEMENT_VALUE,
      prefixAndAssetType: '061414112345',
      companyPrefix: '0614141',
      assetType: '12345',
      checkDigit: 2,
      serial: '400',
    });
  });

  test('without a prefix length, prefix and asset type stay together', () => {
    const grai = okParts(parseGrai(TDS_ELEMENT_VALUE));
    expect(grai.companyPrefix).toBeUndefined();
    expect(grai.assetType).toBeUndefined();
    expect(grai.prefixAndAssetType).toBe('061414112345');
  });

  test.each([
    ['(8003)00614141123452400'],
    ['(8003) 00614141123452400'],
    ['8003 00614141123452400'],
    ['800300614141123452400'],
    ['0 0614141 12345 2 · 400'],
    ['(8003) 0 0614141 12345 2 · 400'],
    ['0.0614141.12345.2.400'],
    ['0-0614141-12345-2-400'],
    ['  00614141123452400\n'],
    [']C1800300614141123452400'],
    ['800300614141123452400\u001D17261231'],
  ])('accepts %j as the TDS test vector value', (text) => {
    expect(okParts(parseGrai(text)).value).toBe(TDS_ELEMENT_VALUE);
  });

  test('a GRAI without serial is valid (the serial is optional in AI 8003)', () => {
    const grai = okParts(parseGrai('00614141123452'));
    expect(grai.serial).toBe('');
    expect(grai.value).toBe('00614141123452');
  });

  test('an ungrouped serial may start with a dot or hyphen (both are in set 82)', () => {
    expect(okParts(parseGrai('00614141123452.A-1')).serial).toBe('.A-1');
  });

  test('grouped input keeps a serial that starts with a dot or hyphen', () => {
    expect(okParts(parseGrai('0 0614141 12345 2 · -40')).serial).toBe('-40');
    expect(okParts(parseGrai('0 0614141 12345 2 .40')).serial).toBe('.40');
    expect(okParts(parseGrai('0.0614141.12345.2..40')).serial).toBe('.40');
    expect(okParts(parseGrai('0-0614141-12345-2-.40')).serial).toBe('.40');
  });

  test('a 12-digit company prefix leaves an empty asset type', () => {
    const grai = okParts(parseGrai(TDS_ELEMENT_VALUE, { companyPrefixLength: 12 }));
    expect(grai.companyPrefix).toBe('061414112345');
    expect(grai.assetType).toBe('');
  });
});

describe('parseGrai: refusals say what is wrong', () => {
  test('too short', () => {
    const result = parseGrai('0061414112345');
    expect(errorCode(result)).toBe('too-short');
    expect(!result.ok && result.error.message).toMatch(/14 digits/);
  });
  test('too long: a serial over 16 characters', () => {
    const result = parseGrai(`00614141123452${'A'.repeat(17)}`);
    expect(errorCode(result)).toBe('too-long');
    expect(!result.ok && result.error.message).toMatch(/17 characters/);
  });
  test('16 serial characters are still fine', () => {
    expect(errorCode(parseGrai(`00614141123452${'A'.repeat(16)}`))).toBe('ok');
  });
  test('non-digit in the fixed part', () => {
    const result = parseGrai('00614141A23452400');
    expect(errorCode(result)).toBe('non-digit');
    expect(!result.ok && result.error.message).toMatch(/"A" at position 9/);
  });
  test.each([['#'], ['~'], ['é'], ['@']])('serial character %j outside set 82', (ch) => {
    const result = parseGrai(`00614141123452AB${ch}`);
    expect(errorCode(result)).toBe('bad-serial-char');
    expect(!result.ok && result.error.message).toMatch(/position 3 of the serial/);
  });
  test('missing filler digit 0', () => {
    const result = parseGrai('6141411234522400');
    expect(errorCode(result)).toBe('missing-filler');
  });
  test('wrong check digit names the expected digit', () => {
    const result = parseGrai('00614141123455400');
    expect(errorCode(result)).toBe('check-digit');
    expect(!result.ok && result.error.message).toMatch(/5 given, 2 expected/);
  });
  test('another AI in parentheses', () => {
    expect(errorCode(parseGrai('(01)09520123456788'))).toBe('wrong-ai');
  });
  test('empty input and an AI without value', () => {
    expect(errorCode(parseGrai('   '))).toBe('empty');
    expect(errorCode(parseGrai('(8003)'))).toBe('empty');
  });
  test('company prefix length outside 6–12', () => {
    expect(errorCode(parseGrai(TDS_ELEMENT_VALUE, { companyPrefixLength: 5 }))).toBe('bad-company-prefix-length');
    expect(errorCode(parseGrai(TDS_ELEMENT_VALUE, { companyPrefixLength: 13 }))).toBe('bad-company-prefix-length');
  });
  test('parseSerialisedGrai refuses a GRAI without serial', () => {
    expect(errorCode(parseSerialisedGrai('00614141123452'))).toBe('serial-required');
    expect(errorCode(parseSerialisedGrai(TDS_ELEMENT_VALUE))).toBe('ok');
    expect(errorCode(parseSerialisedGrai('00614141123459'))).toBe('check-digit');
  });
});

describe('GS1 Digital Link (AI 8003 value as one path segment)', () => {
  const PUBLISHED_LINK = 'https://id.gs1.org/8003/00614141123452400';

  test('published form https://id.gs1.org/8003/00614141123452400', () => {
    expect(graiToDigitalLink(TDS_ELEMENT_VALUE, 'https://id.gs1.org')).toBe(PUBLISHED_LINK);
    expect(okParts(parseGrai(PUBLISHED_LINK)).value).toBe(TDS_ELEMENT_VALUE);
  });

  test('no double slash when the base ends with /; a path prefix is kept', () => {
    expect(graiToDigitalLink(TDS_ELEMENT_VALUE, 'https://id.gs1.org/')).toBe(PUBLISHED_LINK);
    expect(graiToDigitalLink(TDS_ELEMENT_VALUE, 'https://bins.example.test/r/')).toBe('https://bins.example.test/r/8003/00614141123452400');
  });

  test.each([
    ['https://bins.example.test/8003/00614141123452400'],
    ['http://bins.example.test:8080/r/8003/00614141123452400'],
    ['https://bins.example.test/8003/00614141123452400/more/segments'],
    ['https://bins.example.test/8003/00614141123452400?linkType=all'],
    ['https://bins.example.test/8003/00614141123452400#top'],
  ])('any host, extra path or query: %s', (uri) => {
    expect(okParts(parseGrai(uri)).value).toBe(TDS_ELEMENT_VALUE);
  });

  test('serial characters outside the unreserved set are percent-encoded and decoded back', () => {
    const value = makeGrai('0614141', '12345', 'A/B!(1)');
    const link = graiToDigitalLink(value, 'https://bins.example.test');
    expect(link).toBe('https://bins.example.test/8003/00614141123452A%2FB%21%281%29');
    expect(okParts(parseGrai(link)).serial).toBe('A/B!(1)');
  });

  test('refusals: no 8003 segment, nothing after it, broken escape, bad value, bad base', () => {
    expect(errorCode(parseGrai('https://bins.example.test/01/09520123456788'))).toBe('bad-digital-link');
    expect(errorCode(parseGrai('https://bins.example.test/8003/'))).toBe('empty');
    expect(errorCode(parseGrai('https://bins.example.test/8003/00614141123452%E0%A4%A'))).toBe('bad-digital-link');
    expect(errorCode(parseGrai('https://bins.example.test/8003/00614141123453400'))).toBe('check-digit');
    expect(errorCode(parseGrai('https://bins.example.test/8003/00614141123452A%20B'))).toBe('bad-serial-char');
    expect(() => graiToDigitalLink(TDS_ELEMENT_VALUE, 'bins.example.test')).toThrow(RangeError);
    expect(() => graiToDigitalLink(TDS_ELEMENT_VALUE, 'https://bins.example.test/?x=1')).toThrow(RangeError);
    expect(() => graiToDigitalLink('00614141123453400', 'https://bins.example.test')).toThrow(/check digit/);
  });
});

describe('EPC URI (EPC Tag Data Standard)', () => {
  test('translation test vector: 00614141123452400 ↔ urn:epc:id:grai:0614141.12345.400', () => {
    expect(graiToEpcUri(TDS_ELEMENT_VALUE, 7)).toBe(TDS_EPC_URI);
    const grai = okParts(parseGrai(TDS_EPC_URI));
    expect(grai).toEqual({
      value: TDS_ELEMENT_VALUE,
      prefixAndAssetType: '061414112345',
      companyPrefix: '0614141',
      assetType: '12345',
      checkDigit: 2,
      serial: '400',
    });
  });

  test("the URI's own prefix split wins over the option", () => {
    expect(okParts(parseGrai(TDS_EPC_URI, { companyPrefixLength: 9 })).companyPrefix).toBe('0614141');
  });

  test('serial escapes (TDS GS3A3 component, from memory): " % & / < > ? are written %HH', () => {
    const value = makeGrai('0614141', '12345', 'a"%&/<>?b');
    const uri = graiToEpcUri(value, 7);
    expect(uri).toBe('urn:epc:id:grai:0614141.12345.a%22%25%26%2F%3C%3E%3Fb');
    expect(okParts(parseGrai(uri)).serial).toBe('a"%&/<>?b');
  });

  test("the other set-82 punctuation stands as is: ! ' ( ) * + , - . : ; = _", () => {
    const serial = "!'()*+,-.:;=_";
    const uri = graiToEpcUri(makeGrai('0614141', '12345', serial), 7);
    expect(uri).toBe(`urn:epc:id:grai:0614141.12345.${serial}`);
    expect(okParts(parseGrai(uri)).serial).toBe(serial);
  });

  test('a 12-digit prefix gives an empty asset type field', () => {
    expect(graiToEpcUri(TDS_ELEMENT_VALUE, 12)).toBe('urn:epc:id:grai:061414112345..400');
    expect(okParts(parseGrai('urn:epc:id:grai:061414112345..400')).value).toBe(TDS_ELEMENT_VALUE);
  });

  test('refusals', () => {
    expect(errorCode(parseGrai('urn:epc:id:grai:0614141.12345.'))).toBe('serial-required');
    expect(errorCode(parseGrai('urn:epc:id:grai:06141.1234567.400'))).toBe('bad-company-prefix-length');
    expect(errorCode(parseGrai('urn:epc:id:grai:0614141.1234.400'))).toBe('too-short');
    expect(errorCode(parseGrai('urn:epc:id:grai:0614141.123456.400'))).toBe('too-long');
    expect(errorCode(parseGrai('urn:epc:id:grai:0614141.12A45.400'))).toBe('bad-epc-uri');
    expect(errorCode(parseGrai('urn:epc:id:grai:0614141.12345.a/b'))).toBe('bad-epc-uri');
    expect(errorCode(parseGrai('urn:epc:id:grai:0614141.12345.a%2'))).toBe('bad-epc-uri');
    expect(errorCode(parseGrai('urn:epc:id:grai:0614141.12345.a%7E'))).toBe('bad-serial-char');
    expect(errorCode(parseGrai('urn:epc:id:sgtin:0614141.112345.400'))).toBe('bad-epc-uri');
    expect(() => graiToEpcUri('00614141123452', 7)).toThrow(/without serial/);
  });
});

describe('formatGrai, makeGrai, groupGrai', () => {
  test('makeGrai computes the check digit (TDS vector)', () => {
    expect(makeGrai('0614141', '12345', '400')).toBe(TDS_ELEMENT_VALUE);
  });
  test('formatGrai accepts parsed parts and prefix/asset type apart', () => {
    const parts = okParts(parseGrai(TDS_ELEMENT_VALUE));
    expect(formatGrai(parts)).toBe(TDS_ELEMENT_VALUE);
    expect(formatGrai({ companyPrefix: '0614141', assetType: '12345' })).toBe('00614141123452');
  });
  test('refuses a body that is not 12 digits and a bad serial', () => {
    expect(() => makeGrai('061414', '12345', '400')).toThrow(/12 digits/);
    expect(() => makeGrai('0614141', '1234X', '400')).toThrow(/12 digits/);
    expect(() => makeGrai('0614141', '12345', 'has space')).toThrow(/character set 82/);
    expect(() => makeGrai('0614141', '12345', 'X'.repeat(17))).toThrow(/at most 16/);
  });
  test('groups for reading aloud: 0 9520123 45678 8 · 000417 (demo prefix 952)', () => {
    expect(makeGrai('9520123', '45678', '000417')).toBe(DEMO_VALUE);
    expect(groupGrai(DEMO_VALUE, 7)).toBe('0 9520123 45678 8 · 000417');
    expect(okParts(parseGrai('0 9520123 45678 8 · 000417')).value).toBe(DEMO_VALUE);
  });
  test('grouping without serial, and with a 12-digit prefix', () => {
    expect(groupGrai('09520123456788', 7)).toBe('0 9520123 45678 8');
    expect(groupGrai(DEMO_VALUE, 12)).toBe('0 952012345678 8 · 000417');
    expect(() => groupGrai('09520123456789', 7)).toThrow(/check digit/);
  });
});

describe('properties (fast-check)', () => {
  // GS1 AI encodable character set 82, listed again here from the standard's table.
  const SET_82 = `!"%&'()*+,-./0123456789:;<=>?ABCDEFGHIJKLMNOPQRSTUVWXYZ_abcdefghijklmnopqrstuvwxyz`;
  const digit = fc.constantFrom(...'0123456789');
  const body = fc.string({ unit: digit, minLength: 12, maxLength: 12 });
  const serial = fc.string({ unit: fc.constantFrom(...SET_82), minLength: 1, maxLength: 16 });
  const prefixLength = fc.integer({ min: 6, max: 12 });

  test('the set listed in this test has 82 characters', () => {
    expect(SET_82).toHaveLength(82);
  });

  test('makeGrai → parseGrai round-trips', () => {
    fc.assert(
      fc.property(body, serial, prefixLength, (b, s, n) => {
        const value = makeGrai(b.slice(0, n), b.slice(n), s);
        const grai = okParts(parseGrai(value, { companyPrefixLength: n }));
        expect(grai.value).toBe(value);
        expect(grai.companyPrefix).toBe(b.slice(0, n));
        expect(grai.assetType).toBe(b.slice(n));
        expect(grai.serial).toBe(s);
      }),
    );
  });

  test('the check digit makes the weighted sum of all 13 digits a multiple of 10', () => {
    fc.assert(
      fc.property(body, (b) => {
        const all = b + String(gs1CheckDigit(b));
        let sum = 0;
        for (let i = 0; i < all.length; i++) sum += Number(all[i]) * (i % 2 === 0 ? 1 : 3);
        expect(sum % 10).toBe(0);
      }),
    );
  });

  test('→ EPC URI → parseGrai round-trips', () => {
    fc.assert(
      fc.property(body, serial, prefixLength, (b, s, n) => {
        const value = makeGrai(b.slice(0, n), b.slice(n), s);
        const grai = okParts(parseGrai(graiToEpcUri(value, n)));
        expect(grai.value).toBe(value);
        expect(grai.serial).toBe(s);
        expect(grai.companyPrefix).toBe(b.slice(0, n));
      }),
    );
  });

  test('→ Digital Link → parseGrai round-trips', () => {
    fc.assert(
      fc.property(body, serial, (b, s) => {
        const value = makeGrai(b.slice(0, 7), b.slice(7), s);
        const link = graiToDigitalLink(value, 'https://bins.example.test/');
        expect(link.split('/')).toHaveLength(5); // the whole value is one path segment
        expect(okParts(parseGrai(link)).value).toBe(value);
      }),
    );
  });

  test('→ groupGrai → parseGrai round-trips', () => {
    fc.assert(
      fc.property(body, serial, prefixLength, (b, s, n) => {
        const value = makeGrai(b.slice(0, n), b.slice(n), s);
        expect(okParts(parseGrai(groupGrai(value, n))).value).toBe(value);
      }),
    );
  });

  test('any single-digit change in the fixed 13 digits is caught by the check digit', () => {
    fc.assert(
      fc.property(body, serial, fc.integer({ min: 1, max: 13 }), fc.integer({ min: 1, max: 9 }), (b, s, at, shift) => {
        const value = makeGrai(b.slice(0, 7), b.slice(7), s);
        const changed = String((Number(value[at]) + shift) % 10);
        const typo = value.slice(0, at) + changed + value.slice(at + 1);
        expect(errorCode(parseGrai(typo))).toBe('check-digit');
      }),
    );
  });
});
