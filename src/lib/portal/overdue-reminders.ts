// Overdue-return reminders to customers. Pure: who gets a reminder now and which bins it lists.
//
// The rule: a bin is in a reminder once it is overdue back (the one overdue rule of lib/fleet/overdue-return.ts)
// by at least `minDaysOver` days (the operator's setting). Each contact — a customer user — gets at most one reminder
// per week (a rolling 7 days since their last one), and that one lists every overdue bin they may see (all their
// organisation's, or only those at their sites when they are limited). A contact who opted out of non-essential
// mail gets none; a contact with nothing overdue gets none.

export const REMINDER_INTERVAL_DAYS = 7;
const DAY_MS = 86_400_000;

export interface ReminderBin {
  grai: string;
  serial: string;
  organisationId: number;
  siteId: number | null;
  siteName: string | null;
  daysOver: number;
}

export interface ReminderContact {
  userId: number;
  email: string;
  name: string;
  organisationId: number;
  /** The sites the user is limited to; null = every site of their organisation. */
  siteIds: number[] | null;
  /** Opted out of non-essential mail (reminders are non-essential). */
  optedOut: boolean;
  /** When their last overdue reminder went out, if ever. */
  lastRemindedAt: Date | null;
}

export interface Reminder {
  contact: ReminderContact;
  bins: ReminderBin[];
}

/** True when the contact had a reminder less than a week ago. */
export function remindedThisWeek(lastRemindedAt: Date | null, now: Date): boolean {
  return lastRemindedAt !== null && now.getTime() - lastRemindedAt.getTime() < REMINDER_INTERVAL_DAYS * DAY_MS;
}

/** The reminders to send now: one per contact at most, listing all their overdue bins, worst first. */
export function remindersDue(contacts: readonly ReminderContact[], bins: readonly ReminderBin[], now: Date, minDaysOver = 1): Reminder[] {
  const over = bins.filter((b) => b.daysOver >= Math.max(1, minDaysOver));
  const out: Reminder[] = [];
  for (const contact of contacts) {
    if (contact.optedOut || remindedThisWeek(contact.lastRemindedAt, now)) continue;
    const theirs = over
      .filter((b) => b.organisationId === contact.organisationId && (contact.siteIds === null || (b.siteId !== null && contact.siteIds.includes(b.siteId))))
      .sort((a, b) => b.daysOver - a.daysOver || a.serial.localeCompare(b.serial));
    if (theirs.length > 0) out.push({ contact, bins: theirs });
  }
  return out;
}
