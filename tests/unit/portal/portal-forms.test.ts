// The portal's forms as they arrive from an HTML form (strings), checked without a database.
// Dates are hand-worked: 2026-12-03 + 120 days = 2027-04-02 (28 days left in Dec, 31 Jan, 28 Feb, 31 Mar, 2 Apr).
import { describe, test, expect } from 'vitest';
import { collectionFields, damageFields, deliveryFields, portalOrderFields, PORTAL_HORIZON_DAYS } from '@/lib/portal/portal-forms';

const TODAY = '2026-12-03';

describe('the order form', () => {
  const form = portalOrderFields(TODAY);
  const base = { binTypeId: '2', quantity: '12', neededBy: '2026-12-20', deliverySiteId: '7' };
  test('strings become numbers, a ticked box true, empty optional fields null', () => {
    expect(form.parse({ ...base, linerFoodContact: 'yes', linerMaxFillTempC: '60', product: '  Syrup ', notes: '' })).toEqual({
      binTypeId: 2,
      quantity: 12,
      neededBy: '2026-12-20',
      deliverySiteId: 7,
      product: 'Syrup',
      linerFoodContact: true,
      linerMaxFillTempC: 60,
      notes: null,
    });
    expect(form.parse(base)).toMatchObject({ linerFoodContact: false, linerMaxFillTempC: null, product: null });
  });
  test('the horizon: today and day 120 are taken, yesterday and day 121 are not', () => {
    expect(PORTAL_HORIZON_DAYS).toBe(120);
    expect(form.safeParse({ ...base, neededBy: TODAY }).success).toBe(true);
    expect(form.safeParse({ ...base, neededBy: '2027-04-02' }).success).toBe(true);
    expect(form.safeParse({ ...base, neededBy: '2027-04-03' }).success).toBe(false);
    expect(form.safeParse({ ...base, neededBy: '2026-12-02' }).success).toBe(false);
  });
  test.each([
    [{ quantity: '0' }, 'quantity'],
    [{ quantity: '2.5' }, 'quantity'],
    [{ quantity: '201' }, 'quantity'],
    [{ neededBy: '2026-13-01' }, 'neededBy'],
    [{ linerMaxFillTempC: '101' }, 'linerMaxFillTempC'],
    [{ linerMaxFillTempC: 'hot' }, 'linerMaxFillTempC'],
    [{ deliverySiteId: '' }, 'deliverySiteId'],
    [{ product: 'a\u0000b' }, 'product'],
  ])('%o is refused at %s', (change, field) => {
    const r = form.safeParse({ ...base, ...change });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0]!.path[0]).toBe(field);
  });
  test('a field the form does not have is refused', () => {
    expect(form.safeParse({ ...base, customerId: '3' }).success).toBe(false);
  });
});

describe('the collection form', () => {
  const form = collectionFields(TODAY);
  test('a count, a site and a ready day from today', () => {
    expect(form.parse({ siteId: '4', quantity: '7', readyOn: '2026-12-05', note: 'Gate 2\nleft side' })).toEqual({
      siteId: 4,
      quantity: 7,
      readyOn: '2026-12-05',
      note: 'Gate 2\nleft side',
    });
    expect(form.safeParse({ siteId: '4', quantity: '501', readyOn: TODAY }).success).toBe(false);
    expect(form.safeParse({ siteId: '4', quantity: '7', readyOn: '2026-12-01' }).error!.issues[0]!.message).toMatch(/passed/);
    expect(form.safeParse({ siteId: '4', quantity: '7' }).error!.issues[0]!.path).toEqual(['readyOn']);
  });
});

describe('damage and delivery forms', () => {
  test('a bin and a description of at least a few letters; a receiver name of two', () => {
    expect(damageFields.safeParse({ grai: '09521234100102100013', description: 'ok' }).success).toBe(false);
    expect(damageFields.parse({ grai: ' 09521234100102100013 ', description: ' Bent post ' })).toEqual({ grai: '09521234100102100013', description: 'Bent post' });
    expect(deliveryFields.safeParse({ reference: 'LD-1', receivedByName: 'A' }).success).toBe(false);
    expect(deliveryFields.parse({ reference: 'LD-1', receivedByName: 'Ann' })).toEqual({ reference: 'LD-1', receivedByName: 'Ann' });
  });
});
