import { describe, test, expect } from 'vitest';
import { DateTime } from 'luxon';
import { differenceInCalendarDays, parseISO } from 'date-fns';
import { allowedActions } from '@/lib/scans/lifecycle';
import { binStateOf, findInSnapshot, offlineActions, projectBin, todayIn, type ActingContext, type DepotSnapshot, type SnapshotBin } from '@/lib/yard/yard-offline';
import { localDate } from '@/lib/calendar';
import { dateWithHint as dateHint } from '@/lib/dates-display';

const DEPOT = { id: 1, name: 'Test depot', kind: 'depot' as const };
const ctx: ActingContext = { role: 'yard', today: '2026-12-01', site: { id: DEPOT.id, kind: 'depot' } };

function bin(extra: Partial<SnapshotBin> = {}): SnapshotBin {
  return {
    id: 10,
    grai: '09521234100102T00001',
    serial: 'T00001',
    binTypeId: 1,
    binType: 'Test 1000 L',
    status: 'available',
    siteId: DEPOT.id,
    siteKind: 'depot',
    leg: null,
    prepChecked: false,
    linerLotId: null,
    filled: false,
    tripOpen: false,
    nextDue: '2027-06-30',
    version: 3,
    where: 'here',
    ...extra,
  };
}

const snapshot = (bins: SnapshotBin[]): DepotSnapshot => ({
  depot: DEPOT,
  generatedAt: '2026-12-01T07:00:00Z',
  today: '2026-12-01',
  timeZone: 'Europe/Amsterdam',
  bins,
  lots: [],
  orders: [],
});

describe('finding a bin in the phone’s snapshot', () => {
  const a = bin();
  const b = bin({ id: 11, grai: '09521234100102T00002', serial: 'T00002' });
  const twin = bin({ id: 12, grai: '09521234100202T00002', serial: 'T00002' });
  test('by GRAI', () => {
    expect(findInSnapshot(snapshot([a, b]), { grai: b.grai, serial: null })?.id).toBe(11);
  });
  test('by serial, ignoring case, only when it is unambiguous', () => {
    expect(findInSnapshot(snapshot([a, b]), { grai: null, serial: 't00001' })?.id).toBe(10);
    expect(findInSnapshot(snapshot([a, b, twin]), { grai: null, serial: 'T00002' })).toBeNull();
  });
  test('an unknown bin is not found', () => {
    expect(findInSnapshot(snapshot([a]), { grai: '09521234100102T99999', serial: null })).toBeNull();
  });
});

describe('projecting waiting scans through the rule table', () => {
  test('a passed prep check, then a liner: the bin is prepared, and the offered actions follow', () => {
    const b = bin();
    expect(offlineActions(b, ctx)).toContain('prep_check');
    const afterCheck = projectBin(b, [{ assetId: 10, action: 'prep_check', prepResult: 'pass', siteId: 1 }], ctx);
    expect(afterCheck).toMatchObject({ applied: 1, blocked: null, bin: { status: 'available', prepChecked: true } });
    expect(offlineActions(afterCheck.bin, ctx)).toContain('fit_liner');
    const afterLiner = projectBin(
      b,
      [
        { assetId: 10, action: 'prep_check', prepResult: 'pass', siteId: 1 },
        { assetId: 10, action: 'fit_liner', linerLotId: 7, siteId: 1 },
      ],
      ctx,
    );
    expect(afterLiner.bin).toMatchObject({ status: 'prepared', linerLotId: 7 });
    expect(afterLiner.applied).toBe(2);
  });

  test('scans for other bins (by id or by GRAI) leave this one alone', () => {
    const b = bin();
    const p = projectBin(
      b,
      [
        { assetId: 99, action: 'quarantine' },
        { grai: '09521234100102T00009', action: 'quarantine' },
      ],
      ctx,
    );
    expect(p).toMatchObject({ applied: 0, blocked: null, bin: { status: 'available' } });
    expect(projectBin(b, [{ grai: b.grai, action: 'quarantine', siteId: 1 }], ctx).bin.status).toBe('quarantine');
  });

  test('a waiting scan the rule table would refuse stops the projection and says why', () => {
    const b = bin();
    const p = projectBin(b, [{ assetId: 10, action: 'fit_liner', linerLotId: 7, siteId: 1 }], ctx);
    expect(p.applied).toBe(0);
    expect(p.blocked).toEqual({ action: 'fit_liner', reason: expect.stringMatching(/prep check/i) });
    expect(p.bin.status).toBe('available');
  });

  test('a failed prep check sends the bin to quarantine, with no liner offered', () => {
    const p = projectBin(bin(), [{ assetId: 10, action: 'prep_check', prepResult: 'fail', siteId: 1 }], ctx);
    expect(p.bin.status).toBe('quarantine');
    expect(offlineActions(p.bin, ctx)).not.toContain('fit_liner');
  });

  test('the offline buttons are exactly what the bin page would offer (same rule table)', () => {
    for (const b of [
      bin(),
      bin({ prepChecked: true }),
      bin({ status: 'prepared', linerLotId: 4, prepChecked: true }),
      bin({ nextDue: '2026-11-01' }),
      bin({ status: 'in_transit', siteId: null, siteKind: null, leg: 'return', tripOpen: true, where: 'expected' }),
    ]) {
      expect(offlineActions(b, ctx)).toEqual(allowedActions(binStateOf(b), { role: 'yard', today: ctx.today, siteId: '1', siteKind: 'depot' }));
    }
  });

  test('a lapsed test: no liner offered (ADR 4.1.2.2 via the rule table)', () => {
    const lapsed = bin({ prepChecked: true, nextDue: '2026-11-30' });
    expect(offlineActions(lapsed, ctx)).not.toContain('fit_liner');
  });
});

// The offline bin card uses the shared calendar and dates-display formatters (no formatter of its own).
describe('dates on the phone', () => {
  // Luxon (not used by the code under test) as the reference for the zone arithmetic.
  test.each([
    ['2026-03-28T23:30:00Z', 'Europe/Amsterdam'], // before the spring change: +01:00 → next day
    ['2026-03-29T21:59:00Z', 'Europe/Amsterdam'], // after it: +02:00 → next day
    ['2026-12-01T04:59:00Z', 'America/New_York'], // still the previous evening there
    ['2026-12-31T23:59:59Z', 'Asia/Tokyo'],
    ['2026-07-01T12:00:00Z', 'UTC'],
  ])('todayIn(%s, %s) matches luxon', (iso, zone) => {
    expect(todayIn(zone, new Date(iso))).toBe(DateTime.fromISO(iso, { zone: 'utc' }).setZone(zone).toISODate());
    expect(todayIn(zone, new Date(iso))).toBe(localDate(iso, zone));
  });

  // date-fns (not used by the code under test) counts the calendar days.
  test.each([
    ['2027-03-14', '2026-12-01'],
    ['2026-12-01', '2026-12-01'],
    ['2026-11-30', '2026-12-01'],
    ['2026-10-02', '2026-12-01'],
  ])('dateHint(%s, today %s)', (date, today) => {
    const days = differenceInCalendarDays(parseISO(date), parseISO(today));
    const hint = dateHint(date, today);
    if (days === 0) expect(hint).toMatch(/· today$/);
    else if (days > 0) expect(hint).toMatch(new RegExp(`· in ${days} days?$`));
    else expect(hint).toMatch(new RegExp(`· ${-days} days? ago$`));
    expect(hint.startsWith(`${Number(date.slice(8))} `)).toBe(true);
  });
  test('the absolute part reads like the server pages: "14 Mar 2027"', () => {
    expect(dateHint('2027-03-14', '2026-12-01')).toBe('14 Mar 2027 · in 103 days');
  });
});
