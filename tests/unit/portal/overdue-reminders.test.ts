// Overdue reminders: at most one per contact per rolling week (common practice, REMINDER_INTERVAL_DAYS), listing
// all their overdue bins; opted-out contacts and contacts with nothing overdue get none. Hand-worked instants.
import { describe, test, expect } from 'vitest';
import { remindedThisWeek, remindersDue, REMINDER_INTERVAL_DAYS, type ReminderBin, type ReminderContact } from '@/lib/portal/overdue-reminders';

const NOW = new Date('2026-12-10T07:00:00Z');
const contact = (over: Partial<ReminderContact>): ReminderContact => ({
  userId: 1,
  email: 'a@x.example',
  name: 'A',
  organisationId: 10,
  siteIds: null,
  optedOut: false,
  lastRemindedAt: null,
  ...over,
});
const bin = (serial: string, over: Partial<ReminderBin> = {}): ReminderBin => ({
  grai: `G${serial}`,
  serial,
  organisationId: 10,
  siteId: 100,
  siteName: 'North',
  daysOver: 3,
  ...over,
});

describe('once a week at most', () => {
  test('the week is seven days to the millisecond since the last reminder', () => {
    expect(REMINDER_INTERVAL_DAYS).toBe(7);
    expect(remindedThisWeek(null, NOW)).toBe(false);
    expect(remindedThisWeek(new Date('2026-12-03T07:00:00.001Z'), NOW)).toBe(true); // 6 d 23:59:59.999 ago
    expect(remindedThisWeek(new Date('2026-12-03T07:00:00Z'), NOW)).toBe(false); // exactly 7 days ago
  });
});

describe('who gets what', () => {
  const bins = [bin('003', { daysOver: 1 }), bin('001', { daysOver: 9 }), bin('002', { daysOver: 9, siteId: 200, siteName: 'South' }), bin('777', { organisationId: 11 })];

  test("one reminder per contact listing all their organisation's overdue bins, worst first; never another organisation's", () => {
    const [r, ...rest] = remindersDue([contact({})], bins, NOW);
    expect(rest).toEqual([]);
    expect(r!.bins.map((b) => b.serial)).toEqual(['001', '002', '003']);
  });
  test("a site-limited contact gets only their sites' bins; the minimum days over is the setting", () => {
    expect(remindersDue([contact({ siteIds: [200] })], bins, NOW)[0]!.bins.map((b) => b.serial)).toEqual(['002']);
    expect(remindersDue([contact({})], bins, NOW, 5)[0]!.bins.map((b) => b.serial)).toEqual(['001', '002']);
    expect(remindersDue([contact({})], bins, NOW, 10)).toEqual([]);
  });
  test('opted out, reminded this week, or nothing overdue: no reminder', () => {
    const due = remindersDue(
      [
        contact({ userId: 1, optedOut: true }),
        contact({ userId: 2, lastRemindedAt: new Date('2026-12-08T07:00:00Z') }),
        contact({ userId: 3, organisationId: 12 }),
        contact({ userId: 4, lastRemindedAt: new Date('2026-12-01T07:00:00Z') }),
      ],
      bins,
      NOW,
    );
    expect(due.map((r) => r.contact.userId)).toEqual([4]);
  });
});
