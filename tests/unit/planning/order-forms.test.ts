import { describe, test, expect } from 'vitest';
import { DEFAULT_ORDER_LIST, orderInputSchema, orderListSearch, parseOrderListQuery } from '@/lib/planning/order-forms';
import { inForce, periodsOverlap, planNewTariff, tariffInForce } from '@/lib/planning/tariffs';

describe('order list query', () => {
  test('defaults: wanted date ascending, 50 a page', () => {
    expect(parseOrderListQuery(new URLSearchParams(''))).toEqual({ ok: true, query: DEFAULT_ORDER_LIST });
  });
  test('filters and options are read; empty values mean not set', () => {
    const parsed = parseOrderListQuery(new URLSearchParams('status=demand&customer=3&depot=&type=2&from=2026-12-01&to=2026-12-31&ref=ho-26&sort=customer&dir=desc&page=2&size=25'));
    expect(parsed).toEqual({
      ok: true,
      query: { sort: 'customer', dir: 'desc', page: 2, size: 25, filters: { status: 'demand', customer: 3, type: 2, from: '2026-12-01', to: '2026-12-31', ref: 'ho-26' } },
    });
  });
  test('unknown names, bad values and reversed dates are issues, not ignored', () => {
    const bad = parseOrderListQuery(new URLSearchParams('colour=red&status=open&size=500&from=2026-13-01&sort=price'));
    expect(bad.ok).toBe(false);
    if (bad.ok) return;
    expect(bad.issues.map((i) => i.field).sort()).toEqual(['colour', 'from', 'size', 'sort', 'status']);
    expect(parseOrderListQuery(new URLSearchParams('from=2026-12-10&to=2026-12-01'))).toMatchObject({ ok: false, issues: [{ field: 'to' }] });
    expect(parseOrderListQuery(new URLSearchParams('page=1&page=2'))).toMatchObject({ ok: false });
  });
  test('links leave defaults out', () => {
    expect(orderListSearch(DEFAULT_ORDER_LIST)).toBe('');
    expect(orderListSearch(DEFAULT_ORDER_LIST, { page: 3, filters: { status: 'draft' } })).toBe('?status=draft&page=3');
  });
});

describe('order form', () => {
  const good = { customerId: 1, deliverySiteId: 2, depotSiteId: 3, binTypeId: 4, quantity: 24, neededBy: '2026-12-20' };
  test('minimal input: a draft, standard liner, no temperature limit', () => {
    expect(orderInputSchema.parse(good)).toEqual({ ...good, product: null, notes: null, linerFoodContact: false, linerMaxFillTempC: null, confirm: false });
  });
  test('refuses what does not fit, naming the field', () => {
    const r = orderInputSchema.safeParse({ ...good, quantity: 0, neededBy: '20.12.2026', linerMaxFillTempC: 150, extra: 1 });
    expect(r.success).toBe(false);
    if (r.success) return;
    const paths = r.error.issues.map((i) => i.path.join('.') || i.code).sort();
    expect(paths).toEqual(['linerMaxFillTempC', 'neededBy', 'quantity', 'unrecognized_keys']);
  });
});

describe('tariff in force (hand-worked dates, both ends included)', () => {
  const old = { id: 1, validFrom: '2025-01-01', validTo: '2026-06-30' };
  const current = { id: 2, validFrom: '2026-07-01', validTo: null };
  test('the last day of the old tariff and the first of the new one', () => {
    expect(tariffInForce([old, current], '2026-06-30')?.id).toBe(1);
    expect(tariffInForce([old, current], '2026-07-01')?.id).toBe(2);
    expect(tariffInForce([old, current], '2031-01-01')?.id).toBe(2);
    expect(tariffInForce([old, current], '2024-12-31')).toBeNull();
    expect(inForce(old, '2025-01-01')).toBe(true);
  });
  test('overlaps', () => {
    expect(periodsOverlap(old, current)).toBe(false);
    expect(periodsOverlap(old, { validFrom: '2026-06-30', validTo: null })).toBe(true);
    expect(periodsOverlap(current, { validFrom: '2030-01-01', validTo: '2030-12-31' })).toBe(true);
    expect(periodsOverlap({ validFrom: '2020-01-01', validTo: '2020-12-31' }, current)).toBe(false);
  });
});

describe('a new tariff among the old ones (hand-worked dates)', () => {
  const dayBefore = (d: string) => ({ '2027-01-01': '2026-12-31', '2026-07-01': '2026-06-30', '2026-03-01': '2026-02-28' })[d] ?? 'unexpected';
  const old = { id: 1, validFrom: '2025-01-01', validTo: '2026-06-30' };
  const current = { id: 2, validFrom: '2026-07-01', validTo: null };
  test('a price change from 1 Jan 2027 ends the open-ended tariff on 31 Dec 2026', () => {
    expect(planNewTariff([old, current], { validFrom: '2027-01-01', validTo: null }, dayBefore)).toEqual({ ok: true, endPrevious: { id: 2, validTo: '2026-12-31' } });
  });
  test('a first tariff, or one in a gap, ends nothing', () => {
    expect(planNewTariff([], { validFrom: '2026-03-01', validTo: null }, dayBefore)).toEqual({ ok: true, endPrevious: null });
    expect(planNewTariff([old], { validFrom: '2024-01-01', validTo: '2024-12-31' }, dayBefore)).toEqual({ ok: true, endPrevious: null });
  });
  test("an overlap with a closed period, or a start on the open one's first day, is refused with the period", () => {
    expect(planNewTariff([old, current], { validFrom: '2026-03-01', validTo: null }, dayBefore)).toEqual({
      ok: false,
      message: expect.stringContaining('1 Jan 2025 to 30 Jun 2026'),
    });
    expect(planNewTariff([current], { validFrom: '2026-07-01', validTo: null }, dayBefore)).toMatchObject({ ok: false });
    expect(planNewTariff([], { validFrom: '2026-07-01', validTo: '2026-06-01' }, dayBefore)).toMatchObject({ ok: false });
  });
});
