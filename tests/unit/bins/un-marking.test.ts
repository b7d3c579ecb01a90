import { describe, test, expect } from 'vitest';
import { describeUnCode, ibcsStackableOnTop, parseUnMarking, parseUnTypeCode } from '@/lib/bins/un-marking.ts';
import type { UnMarkingResult } from '@/lib/bins/un-marking.ts';

function okMarking(result: UnMarkingResult) {
  if (!result.ok) throw new Error(`expected a marking, got ${result.error.code}: ${result.error.message}`);
  return result.marking;
}

function errorCode(result: UnMarkingResult): string {
  return result.ok ? 'ok' : result.error.code;
}

// The two complete marks published as examples in UN Model Regulations
// 6.5.2.1.2 (REFERENCES §2), quoted verbatim.
const PUBLISHED_STEEL = '11A/Y/02 99/NL/Mulder 007/5500/1500';
const PUBLISHED_COMPOSITE = '31HA1/Y/05 01/D/Muller 1683/10800/1200';

// Invented marks for the other cases.
const DEMO = '31HA1/Y/03 24/D/Faltwerk 12/10800/1200';

describe('UN Model Regulations 6.5.2.1.2 examples', () => {
  test(`steel IBC for solids by gravity: ${PUBLISHED_STEEL}`, () => {
    const marking = okMarking(parseUnMarking(PUBLISHED_STEEL));
    expect(marking.typeCode.code).toBe('11A');
    expect(marking.typeCode.kind.digits).toBe('11');
    expect(marking.typeCode.kind.form).toBe('rigid');
    expect(marking.typeCode.kind.contents).toBe('solids-by-gravity');
    expect(marking.typeCode.family).toBe('metal');
    expect(marking.typeCode.material).toBe('A');
    expect(marking.typeCode.materialName).toBe('steel');
    expect(marking.typeCode.category).toBeUndefined();
    expect(marking.packingGroup.letter).toBe('Y');
    expect(marking.packingGroup.packingGroups).toEqual([2, 3]);
    expect(marking.manufacture).toEqual({ month: 2, year: 1999 });
    expect(marking.state).toBe('NL');
    expect(marking.manufacturer).toBe('Mulder 007');
    expect(marking.stackingTestLoadKg).toBe(5500);
    expect(marking.maxGrossMassKg).toBe(1500);
    // [computed, 6.5.6.6.4] 5500 / (1.8 × 1500) = 2.04 → 2
    expect(marking.maxIbcsStackedOnTop).toBe(2);
  });

  test(`composite IBC, rigid plastics inner, steel outer, liquids: ${PUBLISHED_COMPOSITE}`, () => {
    const marking = okMarking(parseUnMarking(PUBLISHED_COMPOSITE));
    expect(marking.typeCode.code).toBe('31HA1');
    expect(marking.typeCode.kind.contents).toBe('liquids');
    expect(marking.typeCode.family).toBe('composite');
    expect(marking.typeCode.innerMaterial).toBe('H');
    expect(marking.typeCode.material).toBe('A');
    expect(marking.typeCode.category).toBe(1);
    expect(marking.typeCode.meaning).toBe('Composite IBC for liquids: rigid plastics inner receptacle, steel outer casing');
    expect(marking.manufacture).toEqual({ month: 5, year: 2001 });
    expect(marking.state).toBe('D');
    expect(marking.manufacturer).toBe('Muller 1683');
    expect(marking.stackingTestLoadKg).toBe(10800);
    expect(marking.maxGrossMassKg).toBe(1200);
    // [computed, 6.5.6.6.4, REFERENCES §2] 10800 / (1.8 × 1200) = 5
    expect(marking.maxIbcsStackedOnTop).toBe(5);
  });

  test.each([
    [`UN ${PUBLISHED_COMPOSITE}`],
    [`(u n) ${PUBLISHED_COMPOSITE}`],
    [`(UN)${PUBLISHED_COMPOSITE}`],
    [`u n ${PUBLISHED_COMPOSITE}`],
    ['31HA1 / Y / 05 01 / D / Muller 1683 / 10800 / 1200'],
    ['31HA1/Y/05/01/D/Muller 1683/10800/1200'],
    ['UN\n31HA1/Y/05 01\nD/Muller 1683/10800/1200'],
    ['31ha1/y/05 01/d/Muller 1683/10800/1200'],
  ])('the 6.5.2.1.2 composite example also reads as %j', (text) => {
    const marking = okMarking(parseUnMarking(text));
    expect(marking.typeCode.code).toBe('31HA1');
    expect(marking.manufacture).toEqual({ month: 5, year: 2001 });
    expect(marking.state).toBe('D');
    expect(marking.manufacturer).toBe('Muller 1683');
    expect(marking.maxIbcsStackedOnTop).toBe(5);
  });

  test('without slashes, fields are taken by position (6.5.2.1.2 steel example)', () => {
    const marking = okMarking(parseUnMarking('UN 11A Y 02 99 NL Mulder 007 5500 1500'));
    expect(marking.manufacturer).toBe('Mulder 007');
    expect(marking.stackingTestLoadKg).toBe(5500);
    expect(marking.maxGrossMassKg).toBe(1500);
  });
});

describe('type codes (UN Model Regulations 6.5.1.4; code table partly from memory)', () => {
  test.each([
    ['11A', 'Metal IBC for solids filled or discharged by gravity: steel'],
    ['21B', 'Metal IBC for solids filled or discharged under pressure of more than 10 kPa: aluminium'],
    ['31N', 'Metal IBC for liquids: metal other than steel or aluminium'],
    ['31H1', 'Rigid plastics IBC for liquids: fitted with structural equipment'],
    ['31H2', 'Rigid plastics IBC for liquids: freestanding'],
    ['31HA1', 'Composite IBC for liquids: rigid plastics inner receptacle, steel outer casing'],
    ['31HA2', 'Composite IBC for liquids: flexible plastics inner receptacle, steel outer casing'],
    ['11HG1', 'Composite IBC for solids filled or discharged by gravity: rigid plastics inner receptacle, fibreboard outer casing'],
    ['11G', 'Fibreboard IBC for solids filled or discharged by gravity: fibreboard'],
    ['11C', 'Wooden IBC for solids filled or discharged by gravity: natural wood, with inner liner'],
    ['13H3', 'Flexible IBC for solids: woven plastics, with liner'],
    ['13L4', 'Flexible IBC for solids: textile, coated and with liner'],
    ['13M2', 'Flexible IBC for solids: paper, multiwall, water resistant'],
  ])('describeUnCode(%s)', (code, meaning) => {
    expect(describeUnCode(code)).toBe(meaning);
  });

  test('6.5.1.4.4: a trailing W marks an equivalent specification', () => {
    const result = parseUnTypeCode('31HA1W');
    expect(result.ok && result.typeCode.equivalentSpecification).toBe(true);
    expect(result.ok && result.typeCode.category).toBe(1);
    expect(describeUnCode('11AW')).toMatch(/^Metal IBC .*: steel \(W: /);
  });

  test.each([
    ['41A', /41 is not an IBC type/],
    ['31X', /X is not an IBC material letter/],
    ['31C', /codes with C: 11C/],
    ['11A1', /codes with A: 11A, 21A, 31A/],
    ['31HA3', /not an IBC code assigned/],
    ['31HL1', /not an IBC code assigned/],
    ['13H6', /codes with H:.*13H5/],
    ['A11', /not shaped like an IBC code/],
  ])('refuses %s', (code, reason) => {
    const result = parseUnTypeCode(code);
    expect(result.ok).toBe(false);
    expect(!result.ok && result.error.code).toBe('unknown-type-code');
    expect(!result.ok && result.error.message).toMatch(reason);
    expect(describeUnCode(code)).toBeUndefined();
  });
});

describe('fields of the mark (UN Model Regulations 6.5.2.1.1)', () => {
  test('packing-group letters X, Y, Z', () => {
    const x = okMarking(parseUnMarking('11A/X/03 24/D/Faltwerk 12/5500/1500'));
    expect(x.packingGroup).toEqual({ letter: 'X', packingGroups: [1, 2, 3], meaning: 'packing groups I, II and III (IBCs for solids only)' });
    const z = okMarking(parseUnMarking('31H2/Z/03 24/D/Faltwerk 12/0/1000'));
    expect(z.packingGroup.packingGroups).toEqual([3]);
  });

  test('X is for IBCs for solids only: refused on an IBC for liquids', () => {
    expect(errorCode(parseUnMarking('31HA1/X/03 24/D/Faltwerk 12/10800/1200'))).toBe('packing-group-not-allowed');
  });

  test('stacking test load 0 = not designed for stacking, so none on top', () => {
    const marking = okMarking(parseUnMarking('13H3/Y/03 24/D/Faltwerk 12/0/1000'));
    expect(marking.stackingTestLoadKg).toBe(0);
    expect(marking.maxIbcsStackedOnTop).toBe(0);
  });

  test('two-digit year: fixed window without a reference year, latest year not after it with one', () => {
    expect(okMarking(parseUnMarking(DEMO)).manufacture).toEqual({ month: 3, year: 2024 });
    expect(okMarking(parseUnMarking('31HA1/Y/03 89/D/Faltwerk 12/10800/1200')).manufacture.year).toBe(2089);
    expect(okMarking(parseUnMarking('31HA1/Y/03 90/D/Faltwerk 12/10800/1200')).manufacture.year).toBe(1990);
    const opts = { referenceYear: 2026 };
    expect(okMarking(parseUnMarking('31HA1/Y/03 26/D/Faltwerk 12/10800/1200', opts)).manufacture.year).toBe(2026);
    expect(okMarking(parseUnMarking('31HA1/Y/03 27/D/Faltwerk 12/10800/1200', opts)).manufacture.year).toBe(1927);
    expect(okMarking(parseUnMarking('31HA1/Y/03 2024/D/Faltwerk 12/10800/1200')).manufacture.year).toBe(2024);
  });

  test('a slash inside the manufacturer field is kept', () => {
    expect(okMarking(parseUnMarking('31HA1/Y/03 24/D/Faltwerk/Werk 2/10800/1200')).manufacturer).toBe('Faltwerk/Werk 2');
  });
});

describe('6.5.6.6.4 stacking: load = 1.8 × combined gross mass on top', () => {
  test.each([
    [10800, 1200, 5], // [computed] REFERENCES §2
    [10799, 1200, 4], // one kilogram short of five
    [5500, 1500, 2],
    [2160, 1200, 1],
    [2159, 1200, 0],
    [0, 1200, 0],
  ])('load %i kg, gross %i kg → %i on top', (load, gross, onTop) => {
    expect(ibcsStackableOnTop(load, gross)).toBe(onTop);
  });
});

describe('malformed marks are refused with the reason', () => {
  test.each([
    ['', 'empty'],
    ['UN', 'empty'],
    ['41A/Y/03 24/D/Faltwerk 12/5500/1500', 'unknown-type-code'],
    ['31HA1/W/03 24/D/Faltwerk 12/10800/1200', 'bad-packing-group'],
    ['31HA1/YZ/03 24/D/Faltwerk 12/10800/1200', 'bad-packing-group'],
    ['31HA1/Y/13 24/D/Faltwerk 12/10800/1200', 'bad-month'],
    ['31HA1/Y/00 24/D/Faltwerk 12/10800/1200', 'bad-month'],
    ['31HA1/Y/ab 24/D/Faltwerk 12/10800/1200', 'bad-month'],
    ['31HA1/Y/03 4/D/Faltwerk 12/10800/1200', 'bad-year'],
    ['31HA1/Y/03 2x/D/Faltwerk 12/10800/1200', 'bad-year'],
    ['31HA1/Y/03 24/D4/Faltwerk 12/10800/1200', 'bad-state'],
    ['31HA1/Y/03 24/D/Faltwerk 12/10800', 'missing-field'],
    ['31HA1/Y/03 24/D/10800/1200', 'missing-field'],
    ['31HA1/Y/03 24//Faltwerk 12/10800/1200', 'missing-field'],
    ['31HA1/03 24/D/Faltwerk 12/10800/1200', 'missing-field'],
    ['31HA1/Y/03 24/D/Faltwerk 12/10,800/1200', 'non-numeric-mass'],
    ['31HA1/Y/03 24/D/Faltwerk 12/10800/1200kg', 'non-numeric-mass'],
    ['31HA1/Y/03 24/D/Faltwerk 12/10800/0', 'stack-load-without-gross-mass'],
    ['31HA1/Y/03 24/D/Faltwerk 12/0/0', 'zero-gross-mass'],
  ])('%j → %s', (text, code) => {
    const result = parseUnMarking(text);
    expect(errorCode(result)).toBe(code);
    expect(!result.ok && result.error.message.length).toBeGreaterThan(10);
  });

  test('the month-13 refusal names the month', () => {
    const result = parseUnMarking('31HA1/Y/13 24/D/Faltwerk 12/10800/1200');
    expect(!result.ok && result.error.message).toMatch(/13 is outside 01–12/);
  });
});
