// The trip list's query string: whitelisted sort columns and filters, paging, links that round-trip.
import { describe, test, expect } from 'vitest';
import { DEFAULT_TRIP_LIST, TRIP_SORT_KEYS, nextSort, pageCount, parseTripListQuery, tripListSearch } from '@/lib/trips/trip-list-query.ts';

describe('parsing', () => {
  test('nothing given: newest dispatch first, page 1 of 50', () => {
    expect(parseTripListQuery({})).toEqual({ ok: true, query: DEFAULT_TRIP_LIST });
    expect(DEFAULT_TRIP_LIST).toMatchObject({ sort: 'dispatched', dir: 'desc', page: 1, size: 50 });
  });

  test('every filter and option, from a URL', () => {
    const r = parseTripListQuery(
      new URLSearchParams('sort=dwell&dir=asc&page=3&size=25&status=closed&customer=4&depot=2&bin=100017&lot=PV26&from=2026-01-01&to=2026-06-30&mismatch=1'),
    );
    expect(r).toEqual({
      ok: true,
      query: {
        sort: 'dwell',
        dir: 'asc',
        page: 3,
        size: 25,
        filters: { status: 'closed', customer: 4, depot: 2, bin: '100017', lot: 'PV26', from: '2026-01-01', to: '2026-06-30', mismatch: true },
      },
    });
  });

  test('empty values mean "not set" (a form with empty selects)', () => {
    expect(parseTripListQuery({ status: '', customer: '', bin: '  ', sort: '' })).toEqual({ ok: true, query: DEFAULT_TRIP_LIST });
  });

  test('an unknown sort column is refused, with the allowed ones named', () => {
    const r = parseTripListQuery({ sort: 'password_hash' });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.issues[0]).toEqual({ field: 'sort', message: `"sort" must be one of: ${TRIP_SORT_KEYS.join(', ')}.` });
  });

  test('an unknown filter column is refused rather than ignored', () => {
    const r = parseTripListQuery({ customer_name: 'x', status: 'open' });
    expect(r).toMatchObject({ ok: false, issues: [{ field: 'customer_name' }] });
  });

  test('malformed values: a SQL fragment as a direction, a letter id, a page 0, a huge page size, a bad date, a reversed range', () => {
    for (const bad of [
      { dir: 'asc; drop table trips' },
      { customer: 'abc' },
      { customer: '1.5' },
      { page: '0' },
      { size: '5000' },
      { from: '2026-02-30' },
      { status: 'lost' },
      { mismatch: 'yes' },
      { bin: 'x'.repeat(81) },
    ]) {
      expect(parseTripListQuery(bad).ok, JSON.stringify(bad)).toBe(false);
    }
    expect(parseTripListQuery({ from: '2026-03-01', to: '2026-02-01' })).toMatchObject({ ok: false, issues: [{ field: 'to' }] });
  });

  test('a parameter given twice is refused', () => {
    expect(parseTripListQuery(new URLSearchParams('status=open&status=closed')).ok).toBe(false);
  });
});

describe('links', () => {
  test('defaults are left out; filters come back as they went in', () => {
    expect(tripListSearch(DEFAULT_TRIP_LIST)).toBe('');
    const query = { ...DEFAULT_TRIP_LIST, sort: 'customer' as const, dir: 'asc' as const, page: 2, filters: { customer: 4, mismatch: true as const } };
    const search = tripListSearch(query);
    expect(search).toBe('?customer=4&mismatch=1&sort=customer&dir=asc&page=2');
    expect(parseTripListQuery(new URLSearchParams(search))).toEqual({ ok: true, query });
  });

  test('changing the page keeps sort and filters', () => {
    const query = { ...DEFAULT_TRIP_LIST, filters: { status: 'open' as const } };
    expect(tripListSearch(query, { page: 4 })).toBe('?status=open&page=4');
  });

  test('a header click: a new column starts in its natural order, the same column flips, back to page 1', () => {
    const onPage3 = { ...DEFAULT_TRIP_LIST, page: 3 };
    expect(nextSort(onPage3, 'customer')).toEqual({ sort: 'customer', dir: 'asc', page: 1 });
    expect(nextSort(onPage3, 'returned')).toEqual({ sort: 'returned', dir: 'desc', page: 1 });
    expect(nextSort(onPage3, 'dispatched')).toEqual({ sort: 'dispatched', dir: 'asc', page: 1 });
  });

  test('page count: at least one page, rounded up', () => {
    expect(pageCount(0, 50)).toBe(1);
    expect(pageCount(50, 50)).toBe(1);
    expect(pageCount(51, 50)).toBe(2);
  });
});
