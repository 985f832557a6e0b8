import type { Level } from '@ostium/shared';
import { DateTime } from 'luxon';

/** What a share shows when it has no denominator: the server sends null instead of dividing by zero. */
export const NO_OPEN_TIME = 'no open time';
/** A blank figure (no visits to measure, no referral to time). */
export const NONE = '—';

/** A figure rounded half up to `decimals` places (one by default, the same way everywhere: tables, cards, CSV, print). */
export const fixed = (n: number, decimals = 1) => (Math.round(n * 10 ** decimals) / 10 ** decimals).toFixed(decimals);
export const fixed1 = (n: number) => fixed(n, 1);

/** A share 0..1 as a percentage number with one decimal, for table cells whose header carries the "%". */
export const percentNumber = (share: number | null, empty = NO_OPEN_TIME) => (share === null ? empty : fixed1(share * 100));

/** A share 0..1 as "62.5 %", for figures outside tables. */
export const percent = (share: number | null, empty = NO_OPEN_TIME) => (share === null ? empty : `${fixed1(share * 100)} %`);

/** Minutes as hours with one decimal ("412.5"); hours read better than minutes over weeks. */
export const hoursNumber = (minutes: number) => fixed1(minutes / 60);
export const hours = (minutes: number) => `${hoursNumber(minutes)} h`;

export const minutesNumber = (minutes: number | null, empty = NONE) => (minutes === null ? empty : fixed1(minutes));
export const daysNumber = (days: number | null, empty = NONE) => (days === null ? empty : fixed1(days));
export const weeksNumber = (weeks: number | null, empty = NO_OPEN_TIME, decimals = 1) => (weeks === null ? empty : fixed(weeks, decimals));
export function weeks(w: number | null, empty = NO_OPEN_TIME, decimals = 1) {
  if (w === null) return empty;
  const s = fixed(w, decimals);
  return `${s} ${Number(s) === 1 ? 'week' : 'weeks'}`;
}
/** The what-if shows weeks to two decimals: in a short backlog one chair day moves it by hundredths of a week. */
export const WHAT_IF_WEEK_DECIMALS = 2;

/** A change with its sign, so "−1.5" reads as an improvement in backlog weeks at a glance. */
export function signedNumber(n: number | null, empty = NONE, decimals = 1): string {
  if (n === null) return empty;
  const s = fixed(n, decimals);
  if (Number(s) === 0) return fixed(0, decimals);
  return n > 0 ? `+${s}` : `−${s.replace('-', '')}`;
}

/**
 * The change between two figures as shown (each rounded to one decimal first), so "0.3 → 0.2" reads
 * "−0.1" rather than a "0.0" that looks like no change; null when either side has no figure.
 */
export function shownChange(before: number | null, after: number | null, empty = NONE, decimals = 1): string {
  if (before === null || after === null) return empty;
  return signedNumber(Number(fixed(after, decimals)) - Number(fixed(before, decimals)), empty, decimals);
}

/**
 * One-decimal percentages that add up exactly as the shares do (largest remainder): rounding each share
 * by itself can show 33.3 + 33.3 + 33.3 = 99.9 % for a whole. Null shares stay null.
 * Common practice (Hamilton's method of apportionment), no source.
 */
export function sharesToTenths(shares: (number | null)[]): (string | null)[] {
  const present = shares.map((s, i) => ({ i, tenths: s === null ? null : s * 1000 })).filter((x): x is { i: number; tenths: number } => x.tenths !== null);
  const target = Math.round(present.reduce((sum, x) => sum + x.tenths, 0));
  const floors = present.map((x) => ({ ...x, floor: Math.floor(x.tenths + 1e-9), rest: x.tenths - Math.floor(x.tenths + 1e-9) }));
  let left = target - floors.reduce((sum, x) => sum + x.floor, 0);
  const byRest = [...floors].sort((a, b) => b.rest - a.rest || a.i - b.i);
  const out: (string | null)[] = shares.map(() => null);
  const bumped = new Set<number>();
  for (const x of byRest) {
    if (left <= 0) break;
    bumped.add(x.i);
    left--;
  }
  for (const x of floors) out[x.i] = ((x.floor + (bumped.has(x.i) ? 1 : 0)) / 10).toFixed(1);
  return out;
}

export const LEVEL_LABELS: Record<Level | 'untriaged', string> = { low: 'Low', moderate: 'Moderate', high: 'High', untriaged: 'Not yet triaged' };

export const WEEKDAY_LABELS = ['Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday', 'Sunday'] as const;
export const WEEKDAY_SHORT = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'] as const;

/** "Oct 5" for a week starting on that Monday. */
export const weekLabel = (weekStart: string) => DateTime.fromISO(weekStart).toFormat('LLL d');
/** "Oct 2026" for a "2026-10" month. */
export const monthLabel = (month: string) => DateTime.fromFormat(month, 'yyyy-LL').toFormat('LLL yyyy');
/** "Tue, Oct 6, 2026". */
export const dayLabel = (date: string) => DateTime.fromISO(date).toFormat('ccc, LLL d, yyyy');
/** "Oct 5 – Nov 29, 2026" (the year once when both ends share it). */
export function rangeLabel(from: string, to: string): string {
  const a = DateTime.fromISO(from);
  const b = DateTime.fromISO(to);
  return a.year === b.year ? `${a.toFormat('LLL d')} – ${b.toFormat('LLL d, yyyy')}` : `${a.toFormat('LLL d, yyyy')} – ${b.toFormat('LLL d, yyyy')}`;
}

/** "08:00"-style clock times as they come, or an instant shown on the location's wall clock. */
export function clockTime(value: string, zone: string): string {
  if (/^\d{2}:\d{2}(:\d{2})?$/.test(value)) return value.slice(0, 5);
  const t = DateTime.fromISO(value, { setZone: true });
  return t.isValid ? t.setZone(zone).toFormat('HH:mm') : value;
}

/** "08:00–09:00" for an hour of the heat map. */
export const hourLabel = (h: number) => `${String(h).padStart(2, '0')}:00`;
