import { describe, test, expect } from 'vitest';
import { connectionSize, specFitsBinType, specMeetsGrade, describeSpec, type SpecFacts } from '@/lib/liners/liner-specs';
import { specSchema, supplierSchema } from '@/lib/liners/liner-schemas';

const listed: SpecFacts = { id: 1, code: 'A', nominalCapacityL: 1000, valveType: 'butterfly', valveSize: 'DN50', glandSize: 'DN150' };

describe('connection sizes', () => {
  test.each([
    ['dn50', 'DN50'],
    [' DN 80 ', 'DN80'],
    ['s60x6', 'S60x6'],
    ['S60X6', 'S60x6'],
    ['60mm', null],
    ['DN5', null],
    ['S60', null],
  ])('%s → %s', (typed, written) => {
    expect(connectionSize(typed)).toBe(written);
  });
});

describe('does a spec fit a bin type', () => {
  test('listed, no list, or no spec: it fits', () => {
    expect(specFitsBinType(listed, 'Bin', [listed])).toEqual({ ok: true });
    expect(specFitsBinType({ ...listed, id: 2 }, 'Bin', [])).toEqual({ ok: true });
    expect(specFitsBinType(null, 'Bin', [listed])).toEqual({ ok: true });
  });
  test('the reason names capacity first, then valve, then gland', () => {
    const r = (s: Partial<SpecFacts>) => specFitsBinType({ ...listed, id: 9, code: 'Z', ...s }, 'Bin 1000', [listed]);
    expect(r({ nominalCapacityL: 1250, valveSize: 'DN80' })).toMatchObject({ ok: false, code: 'liner_capacity' });
    expect(r({ valveSize: 'DN80', glandSize: 'DN100' })).toMatchObject({ ok: false, code: 'liner_valve' });
    expect(r({ valveType: 'ball' })).toMatchObject({ ok: false, code: 'liner_valve' });
    expect(r({ glandSize: 'DN100' })).toMatchObject({ ok: false, code: 'liner_gland', reason: expect.stringContaining("its fill gland is DN100; this bin's lid takes DN150") });
    expect(r({})).toMatchObject({ ok: false, code: 'liner_not_listed' });
  });
});

describe('grades', () => {
  test('food contact and filling temperature', () => {
    expect(specMeetsGrade({ foodContact: true, maxFillTempC: 60 }, { foodContact: true, maxFillTempC: 45 })).toBe(true);
    expect(specMeetsGrade({ foodContact: false, maxFillTempC: 80 }, { foodContact: true, maxFillTempC: null })).toBe(false);
    expect(specMeetsGrade({ foodContact: true, maxFillTempC: null }, { foodContact: false, maxFillTempC: 40 })).toBe(false);
    expect(specMeetsGrade({ foodContact: false, maxFillTempC: null }, { foodContact: false, maxFillTempC: null })).toBe(true);
  });
  test('a one-line description', () => {
    expect(describeSpec({ ...listed, material: 'PE/PA', layers: 2, foodContact: true, maxFillTempC: 60 })).toBe(
      '1,000 L PE/PA, 2 layers, DN50 butterfly valve, gland DN150, food contact to 60 °C',
    );
  });
});

describe('the admin schemas', () => {
  const spec = {
    code: 'pv-1',
    name: 'Bag',
    material: 'PE',
    layers: 1,
    nominalCapacityL: 1000,
    valveType: 'butterfly',
    valveSize: 'dn50',
    glandSize: 's60x6',
    foodContact: false,
    maxFillTempC: null,
    supplierId: null,
    articleNumber: null,
    binTypeIds: [],
  };
  test('sizes are normalised, the code upper-cased', () => {
    expect(specSchema.parse(spec)).toMatchObject({ code: 'PV-1', valveSize: 'DN50', glandSize: 'S60x6' });
  });
  test('a valve size goes with a valve, and a size must be a size', () => {
    expect(specSchema.safeParse({ ...spec, valveType: 'none' }).success).toBe(false);
    expect(specSchema.safeParse({ ...spec, valveType: 'none', valveSize: null }).success).toBe(true);
    expect(specSchema.safeParse({ ...spec, valveSize: null }).success).toBe(false);
    expect(specSchema.safeParse({ ...spec, glandSize: '150 mm' }).success).toBe(false);
  });
  test('supplier terms are numbers in range', () => {
    const ok = { name: 'S', orderEmail: 'a@b.example', leadTimeDays: 10, orderCost: 80, packSize: 50, minOrderQty: 200, pricePerLiner: 6.4 };
    expect(supplierSchema.safeParse(ok).success).toBe(true);
    expect(supplierSchema.safeParse({ ...ok, packSize: 0 }).success).toBe(false);
    expect(supplierSchema.safeParse({ ...ok, orderEmail: 'nope' }).success).toBe(false);
    expect(supplierSchema.safeParse({ ...ok, orderCost: -1 }).success).toBe(false);
  });
});
