import { daysBetween } from './calendar';

/**
 * Days on hire and free days left for one bin, counted in calendar days in the
 * operator's time zone from the day it was delivered (or dispatched, when the
 * delivery was never confirmed). The delivery day counts as day 1 (common
 * practice in hire terms: a bin delivered and collected the same day is one
 * hire day).
 */
export function hireDays(startDay: string, today: string, freeDays: number): { daysOnHire: number; freeDaysLeft: number; overdue: boolean } {
  const daysOnHire = Math.max(1, daysBetween(startDay, today) + 1);
  const freeDaysLeft = freeDays - daysOnHire;
  return { daysOnHire, freeDaysLeft, overdue: freeDaysLeft < 0 };
}
