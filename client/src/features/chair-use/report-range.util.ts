import type { ReportQuery } from '@ostium/shared';
import { DateTime } from 'luxon';

export const DEFAULT_WEEKS = 8;
const DAY = /^\d{4}-\d{2}-\d{2}$/;

/**
 * The last `count` full weeks (Monday to Sunday, ISO 8601) before the week containing `now` on the
 * location's wall clock: on Wednesday Dec 2, 2026 the last 8 full weeks run Oct 5 – Nov 29.
 */
export function lastFullWeeks(now: Date, zone: string, count = DEFAULT_WEEKS): { from: string; to: string } {
  const thisMonday = DateTime.fromJSDate(now, { zone }).startOf('week');
  return { from: thisMonday.minus({ weeks: count }).toISODate()!, to: thisMonday.minus({ days: 1 }).toISODate()! };
}

/** The quick ranges offered beside the date picker, all ending on a whole week or month. */
export function rangePresets(now: Date, zone: string): { label: string; value: [string, string] }[] {
  const today = DateTime.fromJSDate(now, { zone }).startOf('day');
  const lastMonth = today.minus({ months: 1 });
  const w = (n: number) => {
    const r = lastFullWeeks(now, zone, n);
    return [r.from, r.to] as [string, string];
  };
  return [
    { label: 'Last 4 full weeks', value: w(4) },
    { label: 'Last 8 full weeks', value: w(8) },
    { label: 'Last 13 full weeks', value: w(13) },
    { label: 'Last month', value: [lastMonth.startOf('month').toISODate()!, lastMonth.endOf('month').toISODate()!] },
    { label: 'This month so far', value: [today.startOf('month').toISODate()!, today.toISODate()!] },
  ];
}

const id = (v: string | null) => (v && /^\d+$/.test(v) ? Number(v) : undefined);
const day = (v: string | null) => (v && DAY.test(v) && DateTime.fromISO(v).isValid ? v : undefined);

/**
 * The filters kept in the address (so a report can be bookmarked and shared): from, to, locationId,
 * chairId, operatorId. A missing or malformed range falls back to the default one.
 */
export function readFilters(params: URLSearchParams, fallback: { from: string; to: string }): ReportQuery {
  let from = day(params.get('from'));
  let to = day(params.get('to'));
  if (!from || !to || from > to) ({ from, to } = fallback);
  const q: ReportQuery = { from, to };
  const locationId = id(params.get('locationId'));
  const chairId = id(params.get('chairId'));
  const operatorId = id(params.get('operatorId'));
  if (locationId !== undefined) q.locationId = locationId;
  if (chairId !== undefined) q.chairId = chairId;
  if (operatorId !== undefined) q.operatorId = operatorId;
  return q;
}

/** Part of a file name: the range, so exports of different months never overwrite each other. */
export const rangeFilePart = (q: { from: string; to: string }) => `${q.from}_to_${q.to}`;
