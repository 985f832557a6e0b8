// Open and working time of the reports on local calendar days, reusing the time finder's zone clock
// (tz database through luxon) and interval arithmetic. Opening hours and working rules are wall-clock
// readings: on a daylight-saving day a 08:00–17:00 opening is still nine hours, while a range that
// covers the changed hour is an hour shorter (spring) or longer (autumn) — 00:00–24:00 is 23 or 25 h.
import type { OpeningHours } from '@ostium/shared';
import { intersectIntervals, normalizeIntervals, subtractIntervals } from '../scheduling/time-finder/interval.util.js';
import { expandRuleDays } from '../scheduling/time-finder/recurrence.util.js';
import type { Interval } from '../scheduling/time-finder/time-finder.types.js';
import {
  DAY_MS,
  HOUR_MS,
  MINUTE_MS,
  formatLocalDate,
  parseLocalDate,
  parseLocalTime,
  weekdayOfDay,
  zoneClock,
  type LocalDay,
  type ZoneClock,
} from '../scheduling/time-finder/zone-clock.util.js';

export { DAY_MS, HOUR_MS, MINUTE_MS, formatLocalDate, parseLocalDate, weekdayOfDay, type LocalDay, type ZoneClock };

/** A location as the reports see it: its zone, weekly wall-clock hours and closed local dates. */
export interface ReportLocation {
  id: number;
  name: string;
  timeZone: string;
  openingHours: OpeningHours;
  /** Local dates 'YYYY-MM-DD' on which the location is shut. */
  closures: readonly string[];
}

export interface WallRange {
  startLocal: string;
  endLocal: string;
}

/** An operator's recurring working block at one location (RRULE days, wall-clock times, breaks). */
export interface ReportWorkingRule {
  locationId: number;
  rrule: string;
  startLocal: string;
  endLocal: string;
  breaks: readonly WallRange[];
}

/** Local days first…last inclusive, as day numbers. */
export interface DaySpan {
  first: LocalDay;
  last: LocalDay;
}

export function daySpan(from: string, to: string): DaySpan {
  const first = parseLocalDate(from);
  const last = parseLocalDate(to);
  if (last < first) throw new RangeError(`to (${to}) is before from (${from})`);
  return { first, last };
}

/** The zone clock covering local days [first, last] with a margin on both sides. */
export function clockFor(timeZone: string, span: DaySpan): ZoneClock {
  return zoneClock(timeZone, (span.first - 2) * DAY_MS, (span.last + 3) * DAY_MS);
}

/** Monday (ISO 8601) of the week holding a local day. */
export function mondayOf(day: LocalDay): LocalDay {
  return day - (weekdayOfDay(day) - 1);
}

/** Instants of wall-clock [start, end) on a local day, minus the breaks. */
export function wallRangeOnDay(clock: ZoneClock, day: LocalDay, range: WallRange, breaks: readonly WallRange[] = []): Interval[] {
  const s = parseLocalTime(range.startLocal);
  const e = parseLocalTime(range.endLocal);
  if (e <= s) return [];
  let pieces = clock.readingRange(day, s, e);
  if (breaks.length > 0) {
    const cut: Interval[] = [];
    for (const b of breaks) cut.push(...clock.readingRange(day, parseLocalTime(b.startLocal), parseLocalTime(b.endLocal)));
    pieces = subtractIntervals(pieces, normalizeIntervals(cut));
  }
  return pieces;
}

/** Open instants of a location on one local day: its opening hours for the weekday, nothing on a closure. */
export function openOnDay(clock: ZoneClock, location: Pick<ReportLocation, 'openingHours'>, closed: ReadonlySet<LocalDay>, day: LocalDay): Interval[] {
  if (closed.has(day)) return [];
  const weekday = weekdayOfDay(day);
  const pieces: Interval[] = [];
  for (const h of location.openingHours) {
    if (h.weekday === weekday) pieces.push(...wallRangeOnDay(clock, day, { startLocal: h.open, endLocal: h.close }));
  }
  return normalizeIntervals(pieces);
}

export function closedDays(location: Pick<ReportLocation, 'closures'>): Set<LocalDay> {
  return new Set(location.closures.map(parseLocalDate));
}

/**
 * Working instants of an operator per local day over the span: every rule's days (RRULE anchored at the
 * span's first day when it carries no DTSTART, as in the time finder) × its wall-clock block minus
 * breaks, minus the location's closures, minus time off. Days without work are absent.
 */
export function workingByDay(
  rules: readonly ReportWorkingRule[],
  locations: ReadonlyMap<number, { clock: ZoneClock; closed: ReadonlySet<LocalDay> }>,
  timeOff: readonly Interval[],
  span: DaySpan,
): Map<LocalDay, Interval[]> {
  const raw = new Map<LocalDay, Interval[]>();
  for (const rule of rules) {
    const loc = locations.get(rule.locationId);
    if (!loc) continue;
    for (const day of expandRuleDays(rule.rrule, span.first, span.first, span.last)) {
      if (loc.closed.has(day)) continue;
      const pieces = wallRangeOnDay(loc.clock, day, rule, rule.breaks);
      if (pieces.length) (raw.get(day) ?? raw.set(day, []).get(day)!).push(...pieces);
    }
  }
  const off = normalizeIntervals(timeOff);
  const out = new Map<LocalDay, Interval[]>();
  for (const day of [...raw.keys()].sort((a, b) => a - b)) {
    const pieces = subtractIntervals(normalizeIntervals(raw.get(day)!), off);
    if (pieces.length) out.set(day, pieces);
  }
  return out;
}

/** Which interval of a time-sorted list of per-day interval lists a booking union overlaps: list ∩ union. */
export function overlapWith(dayIntervals: readonly Interval[], union: readonly Interval[]): Interval[] {
  if (dayIntervals.length === 0 || union.length === 0) return [];
  const lo = dayIntervals[0]!.start;
  const hi = dayIntervals[dayIntervals.length - 1]!.end;
  // Binary search the first union piece ending after lo; only pieces up to hi can meet the day.
  let a = 0;
  let b = union.length;
  while (a < b) {
    const mid = (a + b) >>> 1;
    if (union[mid]!.end > lo) b = mid;
    else a = mid + 1;
  }
  const slice: Interval[] = [];
  for (let i = a; i < union.length && union[i]!.start < hi; i++) slice.push(union[i]!);
  return intersectIntervals(dayIntervals, slice);
}

function segmentAt(clock: ZoneClock, t: number) {
  const segs = clock.segments;
  for (const s of segs) if (t < s.to) return s;
  return segs[segs.length - 1]!;
}

/**
 * Cuts an interval at every local hour boundary (and at offset changes) and hands each piece to `add`
 * with the local day and hour it lies in. On the autumn change the repeated 01:00 hour adds twice to
 * hour 1; on the spring change hour 2 never occurs.
 */
export function splitByLocalHour(clock: ZoneClock, iv: Interval, add: (day: LocalDay, hour: number, ms: number) => void): void {
  let t = iv.start;
  while (t < iv.end) {
    const seg = segmentAt(clock, t);
    const local = t + seg.offsetMs;
    const nextHourLocal = (Math.floor(local / HOUR_MS) + 1) * HOUR_MS;
    const next = Math.min(iv.end, nextHourLocal - seg.offsetMs, seg.to);
    const day = Math.floor(local / DAY_MS);
    add(day, Math.floor((local - day * DAY_MS) / HOUR_MS), next - t);
    t = next;
  }
}

/** The local day of an instant in a zone clock. */
export const localDayOf = (clock: ZoneClock, t: number): LocalDay => clock.day(t);

export const minutes = (ms: number) => ms / MINUTE_MS;

/** Minutes for the response: two decimals at most (times are stored to the millisecond). */
export const roundMinutes = (m: number) => Math.round(m * 100) / 100;

/** a ÷ b, or null when there is nothing to divide by ("no open time", never ÷ 0). */
export const ratio = (a: number, b: number): number | null => (b > 0 ? a / b : null);

/** 'YYYY-MM' of a local day. */
export const monthOf = (day: LocalDay) => formatLocalDate(day).slice(0, 7);

/** Today's local day number in a zone at the instant `now`. */
export const zoneClockToday = (timeZone: string, now: number): LocalDay => zoneClock(timeZone, now - 2 * DAY_MS, now + 2 * DAY_MS).day(now);
