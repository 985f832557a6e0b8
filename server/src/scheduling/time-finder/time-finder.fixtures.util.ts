// Small builders for time-finder tests: a one-location world and wall-clock ↔ instant helpers (luxon).
import { DateTime } from 'luxon';
import type { BusyIntervals, Chair, Interval, Location, Microscope, Operator, SchedulingResources } from './time-finder.types.js';

/** Instant of a wall-clock reading 'YYYY-MM-DD HH:mm' in zone (the reading must exist). */
export function at(zone: string, reading: string): number {
  const dt = DateTime.fromFormat(reading, 'yyyy-MM-dd HH:mm', { zone });
  if (!dt.isValid) throw new RangeError(`bad reading '${reading}'`);
  return dt.toMillis();
}

/** Wall-clock reading 'YYYY-MM-DD HH:mm' of an instant in zone. */
export function reading(t: number, zone: string): string {
  return DateTime.fromMillis(t, { zone }).toFormat('yyyy-MM-dd HH:mm');
}

export function span(zone: string, from: string, to: string): Interval {
  return { start: at(zone, from), end: at(zone, to) };
}

export const WEEKDAYS_RULE = 'FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR';

export interface WorldOptions {
  zone?: string;
  chairs?: Chair[];
  microscopes?: Microscope[];
  operators?: Operator[];
  location?: Partial<Location>;
}

/** One location open Mon–Fri 08:00–17:00 with chair C1 and operator O1 (Mon–Fri 08:00–17:00, lunch 12:00–12:45). */
export function world(options: WorldOptions = {}): SchedulingResources {
  const zone = options.zone ?? 'Europe/Vienna';
  const week = [{ startLocal: '08:00', endLocal: '17:00' }];
  const location: Location = {
    id: 'L1',
    timeZone: zone,
    openingHours: { 1: week, 2: week, 3: week, 4: week, 5: week },
    closures: [],
    ...options.location,
  };
  return {
    locations: [location],
    chairs: options.chairs ?? [{ id: 'C1', locationId: 'L1' }],
    microscopes: options.microscopes ?? [],
    operators: options.operators ?? [operator('O1')],
    holds: [],
  };
}

export function operator(id: string, rule = WEEKDAYS_RULE, extra: Partial<Operator> = {}): Operator {
  return {
    id,
    name: `Operator ${id}`,
    workingRules: [{ locationId: 'L1', rrule: rule, startLocal: '08:00', endLocal: '17:00', breaks: [{ startLocal: '12:00', endLocal: '12:45' }] }],
    timeOff: [],
    ...extra,
  };
}

export function noBusy(): BusyIntervals {
  return { chairs: {}, operators: {}, microscopes: {} };
}
