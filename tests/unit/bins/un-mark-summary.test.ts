import { describe, test, expect } from 'vitest';
import { decodeUnMark } from '@/lib/bins/un-mark-summary';

// Published example marks, UN Model Regulations 6.5.2.1.2 (REFERENCES §2).
const COMPOSITE_MARK = '31HA1/Y/05 01/D/Muller 1683/10800/1200';
const STEEL_MARK = '11A/Y/02 99/NL/Mulder 007/5500/1500';

function fields(mark: string): Record<string, string> {
  const r = decodeUnMark(mark);
  if (!r.ok) throw new Error(r.message);
  return Object.fromEntries(r.fields.map((f) => [f.key, f.value]));
}

describe('decodeUnMark', () => {
  test('the published composite example reads field by field', () => {
    const f = fields(COMPOSITE_MARK);
    expect(f.typeCode).toMatch(/^31HA1: Composite IBC for liquids: rigid plastics inner receptacle, steel outer casing/);
    expect(f.packingGroup).toBe('Y: packing groups II and III');
    expect(f.manufacture).toBe('May 2001');
    expect(f.state).toBe('D');
    expect(f.manufacturer).toBe('Muller 1683');
    expect(f.stackingLoad).toBe('10,800 kg');
    expect(f.maxGross).toBe('1,200 kg');
    // [computed, 6.5.6.6.4 via REFERENCES §2] 10800 / (1.8 × 1200) = 5
    expect(f.onTop).toBe('5 bins of up to 1,200 kg each');
    expect(decodeUnMark(COMPOSITE_MARK)).toMatchObject({ ok: true, manufactureMonth: '2001-05', typeCode: '31HA1' });
  });
  test('the published steel example: 5500 / (1.8 × 1500) = 2.04, so 2 on top [computed, 6.5.6.6.4]', () => {
    expect(fields(STEEL_MARK).onTop).toBe('2 bins of up to 1,500 kg each');
    expect(fields(STEEL_MARK).manufacture).toBe('February 1999');
  });
  test('a stacking test load of 0 means not designed for stacking (6.5.2.1.1)', () => {
    const f = fields('31HA1/Y/05 01/D/Maker 7/0/1200');
    expect(f.stackingLoad).toBe('0 kg (not for stacking)');
    expect(f.onTop).toBe('None: not designed for stacking');
  });
  test("a malformed mark gives the parser's reason", () => {
    expect(decodeUnMark('31HA1/Y/13 01/D/Maker 7/10800/1200')).toEqual({ ok: false, message: 'Month of manufacture 13 is outside 01–12' });
    expect(decodeUnMark('31HA1/Y')).toMatchObject({ ok: false, message: expect.stringContaining('fields') });
  });
});
