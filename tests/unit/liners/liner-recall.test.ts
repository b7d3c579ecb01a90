// Hold/recall rules, checked against hand-worked cases (each written out beside its check).
import { describe, test, expect } from 'vitest';
import { fitBeforeStopKnown, nextLotStatus, noticeRecipients, QUEUED_AFTER_MS } from '@/lib/liners/liner-recall';
import { linerLotNoticeMail } from '@/lib/mail/mail-templates';

const t = (hhmm: string) => new Date(`2026-12-01T${hhmm}:00Z`);

describe('lot status changes', () => {
  test.each([
    ['released', 'hold', 'on_hold'],
    ['released', 'recall', 'recalled'],
    ['on_hold', 'recall', 'recalled'],
    ['on_hold', 'release', 'released'],
  ] as const)('%s + %s → %s', (from, action, to) => {
    expect(nextLotStatus(from, action)).toEqual({ ok: true, status: to });
  });
  test.each([
    ['on_hold', 'hold'],
    ['recalled', 'hold'],
    ['recalled', 'recall'],
    ['recalled', 'release'], // a recall is final
    ['released', 'release'],
  ] as const)('%s + %s is refused', (from, action) => {
    expect(nextLotStatus(from, action).ok).toBe(false);
  });
});

describe('a fit from a stopped lot that the phone could not know of', () => {
  // Recall recorded at 10:30.
  const stop = t('10:30');
  test('fitted at 10:00, sent at 12:00: it happened before the recall — kept', () => {
    expect(fitBeforeStopKnown({ statusChangedAt: stop, occurredAt: t('10:00'), receivedAt: t('12:00') })).toBe(true);
  });
  test('fitted offline at 11:00 from a snapshot taken at 09:55, sent at 12:00: the phone could not know — kept', () => {
    expect(fitBeforeStopKnown({ statusChangedAt: stop, occurredAt: t('11:00'), receivedAt: t('12:00'), lotsAsOf: t('09:55') })).toBe(true);
  });
  test('fitted at 11:00 from a snapshot of 10:45 (after the recall): the phone knew — refused', () => {
    expect(fitBeforeStopKnown({ statusChangedAt: stop, occurredAt: t('11:00'), receivedAt: t('12:00'), lotsAsOf: t('10:45') })).toBe(false);
  });
  test('sent within a minute of the fit, the phone was online: an old snapshot does not excuse it — refused', () => {
    const occurredAt = t('11:00');
    const receivedAt = new Date(occurredAt.getTime() + QUEUED_AFTER_MS - 1000);
    expect(fitBeforeStopKnown({ statusChangedAt: stop, occurredAt, receivedAt, lotsAsOf: t('09:55') })).toBe(false);
  });
  test('a stopped lot without a date refuses every fit', () => {
    expect(fitBeforeStopKnown({ statusChangedAt: null, occurredAt: t('08:00'), receivedAt: t('12:00') })).toBe(false);
  });
});

describe('notice recipients', () => {
  test('distinct lower-case addresses per customer, an address only once, customers without one listed apart', () => {
    const out = noticeRecipients([
      { organisationId: 1, organisationName: 'A', addresses: ['Buyer@A.example', 'buyer@a.example', 'qa@a.example'], uses: 3 },
      { organisationId: 2, organisationName: 'B', addresses: [null, 'not-an-address'], uses: 1 },
      { organisationId: 3, organisationName: 'C', addresses: ['qa@a.example', 'c@c.example'], uses: 2 },
    ]);
    expect(out.to.map((r) => [r.organisationId, r.email])).toEqual([
      [1, 'buyer@a.example'],
      [1, 'qa@a.example'],
      [3, 'c@c.example'],
    ]);
    expect(out.unreachable).toEqual([{ organisationId: 2, organisationName: 'B' }]);
  });

  test('the notice lists the customer’s bins and the planner’s words', () => {
    const m = linerLotNoticeMail({
      operatorName: 'Pool',
      customerName: 'A',
      lotNumber: 'L-1',
      supplier: 'S',
      status: 'recalled',
      message: 'Keep the product aside.',
      uses: [{ serial: '00012', what: 'trip, order HO-1', fillDay: '2 Dec 2026', product: 'Oil', site: 'Plant' }],
    });
    expect(m.subject).toBe('Liner lot L-1 recalled: 1 of your bins concerned');
    expect(m.text).toContain('• 00012: trip, order HO-1, filled 2 Dec 2026, Oil, Plant');
    expect(m.text).toContain('Keep the product aside.');
  });
});
