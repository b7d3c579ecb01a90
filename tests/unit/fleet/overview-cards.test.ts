// The overview's cards as grid filters: the one rule each number and its list share.
import { describe, test, expect } from 'vitest';
import { OVERVIEW_CARDS, cardDays, cardHref, cardViewState, isOverviewCardId } from '@/lib/fleet/overview-cards';
import { BUILTIN_VIEWS } from '@/lib/fleet/grid-views';
import { IN_SERVICE_STATUSES, notScannedForSql } from '@/lib/fleet/scan-age';
import { parseFilterModel } from '@/lib/fleet/grid-query';

describe('overview cards', () => {
  test('every card filter is one the grid accepts', () => {
    for (const card of Object.values(OVERVIEW_CARDS)) expect(() => parseFilterModel(card.filter(30), 'filterModel')).not.toThrow();
  });
  test('in service leaves out retired and missing bins, in the card, the silent SQL and the ready-made view alike', () => {
    expect(IN_SERVICE_STATUSES).not.toContain('retired');
    expect(IN_SERVICE_STATUSES).not.toContain('missing');
    expect(notScannedForSql('$2', '$1')).toContain("NOT IN ('missing', 'retired')");
    const view = BUILTIN_VIEWS.find((v) => v.id === 'builtin:silent-30')!;
    expect(view.state.filterModel).toEqual(OVERVIEW_CARDS.silent.filter(30));
    expect(BUILTIN_VIEWS.find((v) => v.id === 'builtin:overdue-returns')!.state.filterModel).toEqual(OVERVIEW_CARDS.overdue.filter(30));
  });
  test('the silent card carries its days to the list', () => {
    expect(cardHref('silent', 7)).toBe('/fleet/bins?card=silent&days=7');
    expect(cardViewState('silent', 7).filterModel.daysSilent).toMatchObject({ filter: 7 });
    expect([cardDays('7'), cardDays('0'), cardDays('x'), cardDays(null), cardDays('3651')]).toEqual([7, 30, 30, 30, 30]);
    expect(isOverviewCardId('overdue')).toBe(true);
    expect(isOverviewCardId('shrinkage')).toBe(false);
  });
});
