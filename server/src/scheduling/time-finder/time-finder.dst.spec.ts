// Daylight saving in the time finder. Source: IANA time zone database through luxon (references.md
// "Calendars"): America/New_York moves 2026-03-08 02:00 → 03:00 and 2026-11-01 02:00 → 01:00; a weekly
// 09:00 opening stays 09:00 local across both. Design rule: scheduling.md "Time zones".
import fc from 'fast-check';
import { DateTime } from 'luxon';
import { describe, expect, it } from 'vitest';
import { naiveEarliestSeries } from './naive-scan.util.js';
import { findTimes } from './time-finder.util.js';
import { at, noBusy, reading } from './time-finder.fixtures.util.js';
import type { BusyIntervals, LocalRange, OpeningHours, SchedulingResources, TimeFinderRequest } from './time-finder.types.js';

const NY = 'America/New_York';
const MIN = 60_000;

function nyWorld(hours: LocalRange[], rule = 'FREQ=DAILY', work: LocalRange = hours[0]): SchedulingResources {
  const openingHours: OpeningHours = { 1: hours, 2: hours, 3: hours, 4: hours, 5: hours, 6: hours, 7: hours };
  return {
    locations: [{ id: 'NYC', timeZone: NY, openingHours, closures: [] }],
    chairs: [{ id: 'C1', locationId: 'NYC' }],
    microscopes: [],
    operators: [{ id: 'O1', name: 'Operator O1', workingRules: [{ locationId: 'NYC', rrule: rule, ...work }], timeOff: [] }],
    holds: [],
  };
}

function req(from: string, to: string, minutes: number, extra: Partial<TimeFinderRequest> = {}): TimeFinderRequest {
  return { plan: { visits: [{ minutes, needsMicroscope: false }] }, from: at(NY, from), to: at(NY, to), now: at(NY, from), ...extra };
}

describe('weekly 09:00 opening across both 2026 changes', () => {
  const res = nyWorld([{ startLocal: '09:00', endLocal: '17:00' }], 'FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR,SA,SU');

  for (const [from, to, change] of [
    ['2026-03-05 00:00', '2026-03-12 00:00', '2026-03-08'],
    ['2026-10-29 00:00', '2026-11-05 00:00', '2026-11-01'],
  ]) {
    it(`stays 09:00 local before and after ${change}`, () => {
      const r = findTimes(res, noBusy(), req(from, to, 60, { limit: 7, preferences: { partOfDay: 'morning' } }));
      const mornings = r.proposals.map((p) => p.visits[0].start);
      expect(mornings).toHaveLength(7);
      for (const t of mornings) expect(reading(t, NY).slice(11)).toBe('09:00');
      const offsets = mornings.map((t) => DateTime.fromMillis(t, { zone: NY }).offset / 60);
      // EST (UTC−5) ↔ EDT (UTC−4) switch happens between the mornings of the change day's eve and the change day.
      expect(new Set(offsets).size).toBe(2);
      const gaps = mornings.slice(1).map((t, i) => (t - mornings[i]) / 3_600_000);
      expect(gaps.filter((g) => g !== 24)).toEqual([change === '2026-03-08' ? 23 : 25]);
    });
  }
});

describe('visits spanning the change', () => {
  const night = nyWorld([{ startLocal: '00:00', endLocal: '06:00' }], 'FREQ=WEEKLY;BYDAY=SU');

  it('a 90-minute visit across 2026-03-08 02:00 is 90 real minutes (01:00 EST → 03:30 EDT)', () => {
    const busy: BusyIntervals = { ...noBusy(), chairs: { C1: [{ start: at(NY, '2026-03-08 00:00'), end: at(NY, '2026-03-08 01:00') }] } };
    const r = findTimes(night, busy, req('2026-03-08 00:00', '2026-03-09 00:00', 90, { turnoverMinutes: 0 }));
    const v = r.proposals[0].visits[0];
    expect(reading(v.start, NY)).toBe('2026-03-08 01:00');
    expect(reading(v.end, NY)).toBe('2026-03-08 03:30');
    expect(v.end - v.start).toBe(90 * MIN);
  });

  it('a 90-minute visit across 2026-11-01 02:00 is 90 real minutes (01:00 EDT → 01:30 EST)', () => {
    const busy: BusyIntervals = { ...noBusy(), chairs: { C1: [{ start: at(NY, '2026-11-01 00:00'), end: Date.parse('2026-11-01T05:00:00Z') }] } };
    const r = findTimes(night, busy, req('2026-11-01 00:00', '2026-11-02 00:00', 90, { turnoverMinutes: 0 }));
    const v = r.proposals[0].visits[0];
    expect(v.start).toBe(Date.parse('2026-11-01T05:00:00Z'));
    expect(DateTime.fromMillis(v.start, { zone: NY }).offset).toBe(-240);
    expect(DateTime.fromMillis(v.end, { zone: NY }).toFormat('HH:mm ZZ')).toBe('01:30 -05:00');
    expect(v.end - v.start).toBe(90 * MIN);
  });
});

describe('the skipped hour 02:00–03:00 on 2026-03-08', () => {
  it('never holds a slot start: a rule starting 02:30 starts work at 03:00 EDT', () => {
    const res = nyWorld([{ startLocal: '00:00', endLocal: '06:00' }], 'FREQ=WEEKLY;BYDAY=SU', { startLocal: '02:30', endLocal: '06:00' });
    const r = findTimes(res, noBusy(), req('2026-03-08 00:00', '2026-03-09 00:00', 30));
    expect(r.proposals[0].visits[0].start).toBe(Date.parse('2026-03-08T07:00:00Z'));
    expect(reading(r.proposals[0].visits[0].start, NY)).toBe('2026-03-08 03:00');
  });

  it('an opening only inside the skipped hour gives no slot that day', () => {
    const res = nyWorld([{ startLocal: '02:00', endLocal: '02:45' }], 'FREQ=WEEKLY;BYDAY=SU');
    const r = findTimes(res, noBusy(), req('2026-03-08 00:00', '2026-03-09 00:00', 30));
    expect(r.proposals).toEqual([]);
    expect(r.unplaceable?.code).toBe('no-opening-hours');
  });

  it('no proposal ever starts in it, and the earliest start equals the minute scan (property, 200 runs)', () => {
    const res = nyWorld([{ startLocal: '00:00', endLocal: '06:00' }], 'FREQ=WEEKLY;BYDAY=SU');
    const base = at(NY, '2026-03-08 00:00');
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.integer({ min: 0, max: 60 }), fc.integer({ min: 1, max: 12 })), { maxLength: 4 }),
        fc.constantFrom(5, 10, 15, 30, 60),
        fc.constantFrom(15, 30, 45, 60, 90),
        (blocks, grid, minutes) => {
          const busy: BusyIntervals = {
            ...noBusy(),
            chairs: { C1: blocks.map(([s, l]) => ({ start: base + s * 5 * MIN, end: base + (s + l) * 5 * MIN })) },
          };
          const request = req('2026-03-08 00:00', '2026-03-08 06:00', minutes, { gridMinutes: grid, limit: 5 });
          const r = findTimes(res, busy, request);
          for (const p of r.proposals) {
            const dt = DateTime.fromMillis(p.visits[0].start, { zone: NY });
            expect(dt.hour).not.toBe(2);
            // A start that exists round-trips through its wall-clock reading.
            expect(DateTime.fromObject({ year: 2026, month: 3, day: 8, hour: dt.hour, minute: dt.minute }, { zone: NY }).toMillis()).toBe(p.visits[0].start);
            expect((dt.hour * 60 + dt.minute) % grid).toBe(0);
          }
          const naive = naiveEarliestSeries(res, busy, request);
          expect(r.proposals[0]?.visits[0].start).toBe(naive?.[0].start);
        },
      ),
      { numRuns: 200 },
    );
  }, 60_000);
});
