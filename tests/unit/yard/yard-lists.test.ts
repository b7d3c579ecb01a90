// The yard start page's lists: which query the list page accepts, and the words and links the figures use.
import { describe, test, expect } from 'vitest';
import { parseYardList, yardListHref, yardListTitle, YARD_LISTS } from '@/lib/yard/yard-lists';

describe('the lists behind the yard figures', () => {
  test('each list, and "here" narrowed to one status, is accepted', () => {
    for (const list of YARD_LISTS) expect(parseYardList({ list })).toEqual({ list, status: null });
    expect(parseYardList({ list: 'here', status: 'prepared' })).toEqual({ list: 'here', status: 'prepared' });
    expect(parseYardList({ list: 'here', status: '' })).toEqual({ list: 'here', status: null });
  });
  test('no list named is every bin at the depot', () => {
    expect(parseYardList({})).toEqual({ list: 'here', status: null });
    expect(parseYardList({ status: 'available' })).toEqual({ list: 'here', status: 'available' });
  });
  test('anything else is no list: an unknown name, a status on another list, retired bins', () => {
    expect(parseYardList({ list: 'everything' })).toBeNull();
    expect(parseYardList({ list: 'held', status: 'quarantine' })).toBeNull();
    expect(parseYardList({ list: 'here', status: 'retired' })).toBeNull();
    expect(parseYardList({ list: 'here', status: 'on fire' })).toBeNull();
  });
  test('a link opens the list it names, and reads back as the same key', () => {
    for (const key of [
      { list: 'here', status: null },
      { list: 'here', status: 'quarantine' },
      { list: 'tests-due', status: null },
    ] as const) {
      const href = yardListHref(key);
      expect(href.startsWith('/yard/bins?')).toBe(true);
      expect(parseYardList(Object.fromEntries(new URL(href, 'http://x').searchParams))).toEqual(key);
    }
  });
  test('headings are the start page’s own words', () => {
    expect(yardListTitle({ list: 'here', status: null }, 'Rotterdam depot')).toBe('Bins at Rotterdam depot');
    expect(yardListTitle({ list: 'here', status: 'available' }, 'Rotterdam depot')).toBe('Available at Rotterdam depot');
    expect(yardListTitle({ list: 'tests-due', status: null }, 'x')).toBe('Due for a periodic test within 30 days');
    expect(yardListTitle({ list: 'held', status: null }, 'x')).toBe('Held in quarantine or repair');
  });
});
