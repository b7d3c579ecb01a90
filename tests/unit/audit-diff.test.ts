import { describe, test, expect } from 'vitest';
import { changedFields } from '@/lib/audit-diff';

describe('what changed between two snapshots', () => {
  test('only differing fields, on both sides', () => {
    expect(changedFields({ role: 'planner', active: true, name: 'A' }, { role: 'admin', active: true, name: 'A' })).toEqual({
      before: { role: 'planner' },
      after: { role: 'admin' },
    });
  });
  test('nothing changed → null', () => {
    expect(changedFields({ a: 1, d: new Date(5), o: { x: [1] } }, { a: 1, d: new Date(5), o: { x: [1] } })).toBeNull();
  });
  test('missing and null are the same; added fields show as null before', () => {
    expect(changedFields({ a: null }, {})).toBeNull();
    expect(changedFields({}, { homeSiteId: 3 })).toEqual({ before: { homeSiteId: null }, after: { homeSiteId: 3 } });
  });
  test('dates and nested values compare by value', () => {
    expect(changedFields({ d: new Date(1) }, { d: new Date(2) })).not.toBeNull();
    expect(changedFields({ o: { x: 1 } }, { o: { x: 2 } })).toEqual({ before: { o: { x: 1 } }, after: { o: { x: 2 } } });
  });
});
