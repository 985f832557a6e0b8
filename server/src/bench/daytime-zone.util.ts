// For runs on the real clock (benchmarks, spawned-server tests): a time zone where it is daytime now, so
// quiet hours (08:00–21:00 local) let the texts go whatever hour the machine runs at.
import { DateTime } from 'luxon';

const ZONES = [
  'America/New_York',
  'America/Chicago',
  'America/Denver',
  'America/Los_Angeles',
  'America/Anchorage',
  'Pacific/Honolulu',
  'Pacific/Auckland',
  'Australia/Sydney',
  'Asia/Tokyo',
  'Asia/Kolkata',
  'Europe/Berlin',
  'Europe/London',
  'Atlantic/Azores',
];

/** The first zone whose local time is between 09:00 and 18:00 at `now` (hours of margin either side). */
export function daytimeZone(now: Date = new Date()): string {
  for (const zone of ZONES) {
    const hour = DateTime.fromJSDate(now, { zone }).hour;
    if (hour >= 9 && hour < 18) return zone;
  }
  throw new Error(`no zone in the list is in daytime at ${now.toISOString()}`);
}
