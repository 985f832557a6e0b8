// Expands RFC 5545 RRULE values into local calendar days with the rrule library. rrule runs on
// "floating" dates (UTC fields = wall clock, as its docs advise), so daylight saving never moves a date;
// the wall-clock times are turned into instants later by the location's ZoneClock.
import rrulePkg from 'rrule';
import type { Options } from 'rrule';
import { DAY_MS, type LocalDay } from './zone-clock.util.js';

// rrule ships CommonJS for Node: its named exports only exist on the default export under ESM.
const { RRule } = rrulePkg;

const parsedCache = new Map<string, Partial<Options>>();
const expansionCache = new Map<string, readonly LocalDay[]>();
const EXPANSION_CACHE_LIMIT = 1024;

function parseRule(rule: string): Partial<Options> {
  let parsed = parsedCache.get(rule);
  if (parsed === undefined) {
    parsed = RRule.parseString(rule.trim());
    if (parsed.freq === undefined) throw new RangeError(`RRULE without FREQ: '${rule}'`);
    parsedCache.set(rule, parsed);
  }
  return parsed;
}

/**
 * Local days in [firstDay, lastDay] on which the rule occurs. anchorDay is the DTSTART used when the
 * rule carries none; a DTSTART in the rule is read as a local date (its zone, if any, is ignored).
 */
export function expandRuleDays(rule: string, anchorDay: LocalDay, firstDay: LocalDay, lastDay: LocalDay): readonly LocalDay[] {
  const key = `${rule}|${anchorDay}|${firstDay}|${lastDay}`;
  const cached = expansionCache.get(key);
  if (cached !== undefined) return cached;
  const parsed = parseRule(rule);
  const dtstartDay =
    parsed.dtstart instanceof Date ? Math.floor(parsed.dtstart.getTime() / DAY_MS) : anchorDay;
  // Times inside the rule are dropped: each occurrence is one date at floating midnight.
  const options: Partial<Options> = {
    ...parsed,
    dtstart: new Date(dtstartDay * DAY_MS),
    tzid: null,
    byhour: null,
    byminute: null,
    bysecond: null,
  };
  const dates = new RRule(options).between(new Date(firstDay * DAY_MS), new Date(lastDay * DAY_MS + DAY_MS - 1), true);
  const days: LocalDay[] = [];
  for (const date of dates) {
    const day = Math.floor(date.getTime() / DAY_MS);
    if (days[days.length - 1] !== day) days.push(day);
  }
  if (expansionCache.size >= EXPANSION_CACHE_LIMIT) expansionCache.delete(expansionCache.keys().next().value as string);
  expansionCache.set(key, days);
  return days;
}

export function clearRecurrenceCache(): void {
  parsedCache.clear();
  expansionCache.clear();
}
