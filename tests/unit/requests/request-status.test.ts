import { describe, test, expect } from 'vitest';
import { COLLECTION_STATUSES, DAMAGE_STATUSES, canMove, isStatusOf, needsConfirmation, nextStatuses, refusalReason, statusLook, stepLabel } from '@/lib/requests/request-status';

describe('collection request steps', () => {
  test('open → scheduled → done, or cancelled from either; collected on the spot is allowed too', () => {
    expect(nextStatuses('collection', 'open')).toEqual(['scheduled', 'done', 'cancelled']);
    expect(nextStatuses('collection', 'scheduled')).toEqual(['done', 'open', 'cancelled']);
  });
  test('done is final; a cancelled request can be reopened', () => {
    expect(nextStatuses('collection', 'done')).toEqual([]);
    expect(nextStatuses('collection', 'cancelled')).toEqual(['open']);
    expect(canMove('collection', 'done', 'scheduled')).toBe(false);
  });
  test('no status moves to itself', () => {
    for (const s of COLLECTION_STATUSES) expect(canMove('collection', s, s)).toBe(false);
    for (const s of DAMAGE_STATUSES) expect(canMove('damage', s, s)).toBe(false);
  });
});

describe('damage report steps', () => {
  test('open → triaged → closed, closed straight from open, and a closed report can be reopened', () => {
    expect(nextStatuses('damage', 'open')).toEqual(['triaged', 'closed']);
    expect(nextStatuses('damage', 'triaged')).toEqual(['closed', 'open']);
    expect(nextStatuses('damage', 'closed')).toEqual(['open']);
  });
  test('the kinds keep their own words: a damage report is never scheduled', () => {
    expect(canMove('damage', 'open', 'scheduled')).toBe(false);
    expect(isStatusOf('damage', 'scheduled')).toBe(false);
    expect(isStatusOf('collection', 'triaged')).toBe(false);
    expect(isStatusOf('collection', 'done')).toBe(true);
  });
  test('unknown and inherited names give no steps', () => {
    expect(nextStatuses('damage', 'toString')).toEqual([]);
    expect(nextStatuses('collection', 'nonsense')).toEqual([]);
  });
});

describe('words', () => {
  test('a refused step says why', () => {
    expect(refusalReason('collection', 'done', 'open')).toBe('It is collected and cannot change any more.');
    expect(refusalReason('collection', 'cancelled', 'done')).toBe('From cancelled it can only become open.');
    expect(refusalReason('damage', 'triaged', 'triaged')).toBe('It is already triaged.');
  });
  test('every status has a word and an icon; buttons say what they do', () => {
    for (const s of COLLECTION_STATUSES) expect(statusLook('collection', s).label).toMatch(/^[A-Z]/);
    for (const s of DAMAGE_STATUSES) expect(statusLook('damage', s).icon).toBeTruthy();
    expect(stepLabel('collection', 'open', 'scheduled')).toBe('Schedule collection');
    expect(stepLabel('collection', 'scheduled', 'open')).toBe('Unschedule');
    expect(stepLabel('damage', 'closed', 'open')).toBe('Reopen');
  });
  test('only cancelling a collection asks for confirmation', () => {
    expect(needsConfirmation('collection', 'cancelled')).toBe(true);
    expect(needsConfirmation('collection', 'done')).toBe(false);
    expect(needsConfirmation('damage', 'closed')).toBe(false);
  });
});
