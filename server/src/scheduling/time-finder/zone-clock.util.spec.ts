// ZoneClock against luxon and the IANA tz database (references.md "Calendars": America/New_York moves
// 2026-03-08 02:00 → 03:00 and 2026-11-01 02:00 → 01:00).
import fc from 'fast-check';
import { DateTime } from 'luxon';
import { describe, expect, it } from 'vitest';
import { DAY_MS, MINUTE_MS, parseLocalDate, parseLocalTime, weekdayOfDay, zoneClock } from './zone-clock.util.js';

const NY = 'America/New_York';
const utc = (iso: string): number => Date.parse(iso);

describe('ZoneClock (America/New_York, 2026)', () => {
  const clock = zoneClock(NY, utc('2026-02-01T00:00:00Z'), utc('2026-12-01T00:00:00Z'));

  it('finds the two 2026 transitions at 07:00Z and 06:00Z (IANA tzdb via luxon)', () => {
    expect(clock.segments.map((s) => s.to).filter(Number.isFinite)).toEqual([utc('2026-03-08T07:00:00Z'), utc('2026-11-01T06:00:00Z')]);
    expect(clock.segments.map((s) => s.offsetMs / 3_600_000)).toEqual([-5, -4, -5]);
  });

  it('maps the skipped hour 02:00–03:00 on 2026-03-08 to no instant', () => {
    const day = parseLocalDate('2026-03-08');
    expect(clock.readingRange(day, parseLocalTime('02:00'), parseLocalTime('03:00'))).toEqual([]);
    // 01:00–04:00 local is two real hours that day.
    const [iv] = clock.readingRange(day, 60, 240);
    expect(iv.end - iv.start).toBe(2 * 3_600_000);
    // A range starting inside the gap begins at the transition, 03:00 EDT (not luxon's shifted 03:30).
    expect(clock.readingRange(day, 150, 300)[0].start).toBe(utc('2026-03-08T07:00:00Z'));
  });

  it('maps the repeated hour on 2026-11-01 to both passes', () => {
    const day = parseLocalDate('2026-11-01');
    const pieces = clock.readingRange(day, 60, 120);
    expect(pieces).toEqual([{ start: utc('2026-11-01T05:00:00Z'), end: utc('2026-11-01T07:00:00Z') }]);
    // 00:00–01:30 local: first pass 04:00Z–05:30Z and the repeat of 01:00–01:30 at 06:00Z–06:30Z.
    expect(clock.readingRange(day, 0, 90)).toEqual([
      { start: utc('2026-11-01T04:00:00Z'), end: utc('2026-11-01T05:30:00Z') },
      { start: utc('2026-11-01T06:00:00Z'), end: utc('2026-11-01T06:30:00Z') },
    ]);
  });

  it('puts grid starts on local wall-clock multiples across the gap', () => {
    // 01:50 EST + grid 30 → 02:00 does not exist → 03:00 EDT.
    expect(clock.nextGridStart(utc('2026-03-08T06:50:00Z'), 30)).toBe(utc('2026-03-08T07:00:00Z'));
    // 03:07 EDT + grid 15 → 03:15 EDT.
    expect(clock.nextGridStart(utc('2026-03-08T07:07:00Z'), 15)).toBe(utc('2026-03-08T07:15:00Z'));
  });

  it('agrees with luxon on local readings for any instant (property, 300 runs)', () => {
    fc.assert(
      fc.property(fc.integer({ min: utc('2026-02-02T00:00:00Z'), max: utc('2026-11-30T00:00:00Z') }), (t) => {
        const dt = DateTime.fromMillis(t, { zone: NY });
        expect(clock.offsetMs(t)).toBe(dt.offset * MINUTE_MS);
        expect(clock.day(t)).toBe(parseLocalDate(dt.toISODate()!));
        expect(clock.minuteOfDay(t)).toBe(dt.hour * 60 + dt.minute);
        expect(weekdayOfDay(clock.day(t))).toBe(dt.weekday);
      }),
      { numRuns: 300 },
    );
  });

  it('grid starts are the first instant at or after t on the local grid (property, 300 runs)', () => {
    fc.assert(
      fc.property(fc.integer({ min: utc('2026-03-07T00:00:00Z'), max: utc('2026-03-10T00:00:00Z') }), fc.constantFrom(5, 15, 30, 45, 60), (t, grid) => {
        const s = clock.nextGridStart(t, grid);
        expect(s).toBeGreaterThanOrEqual(t);
        expect(clock.minuteOfDay(s) % grid).toBe(0);
        expect(s % MINUTE_MS).toBe(0);
        // No earlier whole minute in [t, s) is on the grid.
        for (let m = Math.ceil(t / MINUTE_MS) * MINUTE_MS; m < s; m += MINUTE_MS) expect(clock.minuteOfDay(m) % grid).not.toBe(0);
      }),
      { numRuns: 300 },
    );
  });

  it('numbers local days and weekdays like ISO 8601 (2026-03-02 is a Monday)', () => {
    expect(weekdayOfDay(parseLocalDate('2026-03-02'))).toBe(1);
    expect(weekdayOfDay(parseLocalDate('2026-03-08'))).toBe(7);
    expect(parseLocalDate('1970-01-02')).toBe(1);
    expect(DAY_MS).toBe(86_400_000);
  });

  it('rejects bad times, dates and zones', () => {
    expect(() => parseLocalTime('8:00')).toThrow(RangeError);
    expect(() => parseLocalTime('24:30')).toThrow(RangeError);
    expect(() => parseLocalDate('2026-3-2')).toThrow(RangeError);
    expect(() => zoneClock('Mars/Olympus_Mons', 0, DAY_MS)).toThrow(RangeError);
  });

  it('handles a 30-minute DST shift (Australia/Lord_Howe ends DST 2026-04-05 02:00 → 01:30)', () => {
    // IANA tzdb: Lord Howe is UTC+11 in summer and UTC+10:30 in winter.
    const lh = zoneClock('Australia/Lord_Howe', utc('2026-04-01T00:00:00Z'), utc('2026-04-10T00:00:00Z'));
    expect(lh.segments.map((s) => s.offsetMs / MINUTE_MS)).toEqual([660, 630]);
    const pieces = lh.readingRange(parseLocalDate('2026-04-05'), 60, 180);
    expect(pieces.reduce((sum, p) => sum + p.end - p.start, 0)).toBe(150 * MINUTE_MS);
  });
});
