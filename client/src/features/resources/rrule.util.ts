/** RFC 5545 weekday codes in ISO order (Monday first). */
export const RRULE_DAYS = ['MO', 'TU', 'WE', 'TH', 'FR', 'SA', 'SU'] as const;
export type RruleDay = (typeof RRULE_DAYS)[number];

export const DAY_NAMES: Record<RruleDay, { short: string; long: string }> = {
  MO: { short: 'Mon', long: 'Monday' },
  TU: { short: 'Tue', long: 'Tuesday' },
  WE: { short: 'Wed', long: 'Wednesday' },
  TH: { short: 'Thu', long: 'Thursday' },
  FR: { short: 'Fri', long: 'Friday' },
  SA: { short: 'Sat', long: 'Saturday' },
  SU: { short: 'Sun', long: 'Sunday' },
};

const isDay = (s: string): s is RruleDay => (RRULE_DAYS as readonly string[]).includes(s);
const inWeekOrder = (days: Iterable<string>) => RRULE_DAYS.filter((d) => new Set(days).has(d));

/** Splits "FREQ=WEEKLY;BYDAY=MO,WE" (an optional "RRULE:" prefix allowed) into ordered parts. */
function parts(rrule: string): [string, string][] {
  return rrule
    .replace(/^RRULE:/i, '')
    .split(';')
    .filter(Boolean)
    .map((p) => {
      const i = p.indexOf('=');
      return [p.slice(0, i).toUpperCase(), p.slice(i + 1)] as [string, string];
    });
}

/**
 * The weekdays of a weekly rule (RFC 5545 §3.3.10 BYDAY), or null when the rule is not one the picker can
 * show: another frequency, or days with an ordinal such as "1MO".
 */
export function weekdaysOf(rrule: string): RruleDay[] | null {
  const p = new Map(parts(rrule));
  if (p.get('FREQ') !== 'WEEKLY') return null;
  const byday = p.get('BYDAY');
  if (!byday) return [];
  const days = byday.split(',').map((d) => d.trim().toUpperCase());
  return days.every(isDay) ? inWeekOrder(days) : null;
}

/**
 * A weekly rule on these days. Other parts of an existing rule (INTERVAL=2, UNTIL=…) are kept, so editing
 * the days never loses them; BYDAY follows FREQ and the days are in week order.
 */
export function withWeekdays(days: Iterable<string>, base = 'FREQ=WEEKLY'): string {
  const ordered = inWeekOrder(days);
  const rest = parts(base).filter(([k]) => k !== 'FREQ' && k !== 'BYDAY');
  const out: [string, string][] = [['FREQ', 'WEEKLY']];
  if (ordered.length) out.push(['BYDAY', ordered.join(',')]);
  return [...out, ...rest].map(([k, v]) => `${k}=${v}`).join(';');
}

/** "Mon, Wed" for a weekly rule, "every other week" noted; the raw rule when it is something else. */
export function describeRule(rrule: string): string {
  const days = weekdaysOf(rrule);
  if (!days) return rrule;
  const interval = Number(new Map(parts(rrule)).get('INTERVAL') ?? '1');
  const list = days.length === 7 ? 'Every day' : days.length === 0 ? 'Every week (the start day)' : days.map((d) => DAY_NAMES[d].short).join(', ');
  return interval > 1 ? `${list}, every ${interval} weeks` : list;
}
