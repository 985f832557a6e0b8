// Checks of admin input for scheduling resources: IANA zones (luxon), wall-clock times, RFC 5545 RRULEs (rrule).
import { DateTime, IANAZone } from 'luxon';
import rrulePkg from 'rrule';

// rrule ships CommonJS for Node: its named exports only exist on the default export under ESM.
const { RRule } = rrulePkg;

const HHMM = /^([01]\d|2[0-3]):[0-5]\d$|^24:00$/;

export const isWallClock = (v: string) => HHMM.test(v);

export const minutesOf = (v: string) => Number(v.slice(0, 2)) * 60 + Number(v.slice(3, 5));

/** A real IANA zone name (not an offset like '+02:00' nor a made-up name). */
export function isIanaZone(name: string): boolean {
  return typeof name === 'string' && name.includes('/') && IANAZone.isValidZone(name) && DateTime.now().setZone(name).isValid;
}

/** Why an RRULE value is unusable, or null when it is fine (needs FREQ and must yield a date within 2 years). */
export function rruleProblem(value: string): string | null {
  const text = value.trim();
  if (!text) return 'rrule is empty';
  try {
    const parsed = RRule.parseString(text);
    if (parsed.freq === undefined) return 'rrule needs FREQ (e.g. FREQ=WEEKLY;BYDAY=MO,WE)';
    const dtstart = parsed.dtstart ?? new Date(Date.UTC(2026, 0, 1));
    const rule = new RRule({ ...parsed, dtstart });
    const next = rule.after(dtstart, true);
    if (!next || next.getTime() - dtstart.getTime() > 2 * 366 * 86_400_000) return 'rrule yields no date within two years';
    return null;
  } catch (e) {
    return `rrule is not valid RFC 5545: ${(e as Error).message}`;
  }
}

/** Why a wall-clock range is unusable, or null. */
export function rangeProblem(start: string, end: string): string | null {
  if (!isWallClock(start) || !isWallClock(end)) return 'times are HH:mm (00:00–24:00)';
  if (minutesOf(end) <= minutesOf(start)) return 'the end must be after the start';
  return null;
}
