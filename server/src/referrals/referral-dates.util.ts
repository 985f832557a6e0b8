import { DateTime } from 'luxon';

/** Today's date (YYYY-MM-DD) on the wall calendar of `timeZone`. */
export function todayIn(timeZone: string, now: Date = new Date()): string {
  return DateTime.fromJSDate(now, { zone: timeZone }).toISODate()!;
}

/** The calendar date (YYYY-MM-DD) of an instant in `timeZone`. */
export function dateIn(instant: Date, timeZone: string): string {
  return DateTime.fromJSDate(instant, { zone: timeZone }).toISODate()!;
}

/** Whole calendar days from `from` to `to` (both YYYY-MM-DD); never negative. */
export function daysBetween(from: string, to: string): number {
  const d = DateTime.fromISO(to, { zone: 'utc' }).diff(DateTime.fromISO(from, { zone: 'utc' }), 'days').days;
  return Math.max(0, Math.round(d));
}

/** The date `days` calendar days before `date` (YYYY-MM-DD). */
export function daysBefore(date: string, days: number): string {
  return DateTime.fromISO(date, { zone: 'utc' }).minus({ days }).toISODate()!;
}
