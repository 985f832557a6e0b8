// Chair use on the hand-computed fixture week (reports.fixtures.util.ts). Daylight saving: IANA tz
// database through luxon (references.md "Calendars"): America/New_York 2026-11-01 02:00 → 01:00 and
// 2026-03-08 02:00 → 03:00.
import { describe, expect, it } from 'vitest';
import { chairUse } from './chair-use.util.js';
import { FIXTURE_BOOKINGS, FIXTURE_CHAIRS, FIXTURE_LOCATION, FROM, NOW, NY, ny, TO } from './reports.fixtures.util.js';

const report = () => chairUse({ from: FROM, to: TO, now: NOW, locations: [FIXTURE_LOCATION], chairs: FIXTURE_CHAIRS, bookings: FIXTURE_BOOKINGS });

describe('chairUse on the fixture week', () => {
  it('open minutes: opening hours minus the closure, per chair', () => {
    // Per chair: Thu 540 + Fri 540 + Sat 240 + Sun 0 + Mon 540 + Tue 0 (closure) + Wed 540 = 2400.
    const r = report();
    expect(r.byChair.map((c) => c.openMinutes)).toEqual([2400, 2400]);
    expect(r.totals.openMinutes).toBe(4800);
  });

  it('booked minutes: visit + turnover, clipped to open time, no-shows and cancellations left out', () => {
    // Chair 1: b1 90+10 = 100; b2 50+10 = 60 (ends 17:00); b3 30 (its turnover is past closing);
    // b4 no-show and b5 cancelled 0; b6 on the closure day 0; b7 120+10 = 130 → 320.
    // Chair 2: b8 60+10 = 70; b9 60+10 = 70; b10 09:00–09:40 of 07:30–09:40 = 40 → 180.
    const r = report();
    expect(r.byChair.map((c) => c.bookedMinutes)).toEqual([320, 180]);
    expect(r.totals.bookedMinutes).toBe(500);
    expect(r.totals.share).toBeCloseTo(500 / 4800, 12);
    expect(r.byLocation).toEqual([{ locationId: 1, locationName: 'Fernhollow', ...r.totals }]);
  });

  it('actual use: seated → dismissed + turnover, on days before today whose visits are done', () => {
    // Chair 1 counts Thu, Fri, Sat, Mon (open 540+540+240+540 = 1860; Tue's visit is open but Tue is
    // closed; Wed is today). Actual: b1 08:05–09:50 = 105, b2 16:10–17:00 of 16:10–17:25 = 50, b3 30 → 185.
    // Chair 2 counts Thu, Fri, Sat (1320; Monday's b9 was never marked). Actual: b8 60, b10 40 → 100.
    const r = report();
    expect(r.byChair.map((c) => [c.actualOpenMinutes, c.actualMinutes])).toEqual([
      [1860, 185],
      [1320, 100],
    ]);
    expect(r.totals.actualShare).toBeCloseTo(285 / 3180, 12);
  });

  it('per local day and per ISO week', () => {
    const r = report();
    expect(r.byDay.map((d) => [d.date, d.openMinutes, d.bookedMinutes, d.actualOpenMinutes, d.actualMinutes])).toEqual([
      ['2026-10-29', 1080, 230, 1080, 215],
      ['2026-10-30', 1080, 30, 1080, 30],
      ['2026-10-31', 480, 40, 480, 40],
      ['2026-11-01', 0, 0, 0, 0],
      ['2026-11-02', 1080, 70, 540, 0],
      ['2026-11-03', 0, 0, 0, 0],
      ['2026-11-04', 1080, 130, 0, 0],
    ]);
    expect(r.byDay.find((d) => d.date === '2026-11-01')!.share).toBeNull();
    // Weeks start on Monday: 10-26 (Thu–Sun of it in range) and 11-02 (Mon–Wed).
    expect(r.byWeek.map((w) => [w.weekStart, w.openMinutes, w.bookedMinutes])).toEqual([
      ['2026-10-26', 2640, 300],
      ['2026-11-02', 2160, 200],
    ]);
  });

  it('heat map by weekday × local hour, only where there is open time', () => {
    const r = report();
    const cell = (weekday: number, hour: number) => r.heatmap.find((c) => c.weekday === weekday && c.hour === hour);
    // Thursday 08:00–09:00: two chairs open 120, b1 books 60; 09:00–10:00: b1 09:00–09:40 → 40.
    expect(cell(4, 8)).toEqual({ weekday: 4, hour: 8, openMinutes: 120, bookedMinutes: 60, share: 0.5 });
    expect(cell(4, 9)!.bookedMinutes).toBe(40);
    // Wednesday: b7 09:00–11:10 → 60, 60, 10.
    expect([9, 10, 11].map((h) => cell(3, h)!.bookedMinutes)).toEqual([60, 60, 10]);
    // Saturday opens 09:00–13:00; the only Tuesday is the closure; no Sunday hours.
    expect(r.heatmap.filter((c) => c.weekday === 6).map((c) => c.hour)).toEqual([9, 10, 11, 12]);
    expect(r.heatmap.some((c) => c.weekday === 2 || c.weekday === 7)).toBe(false);
    const sum = r.heatmap.reduce((s, c) => s + c.bookedMinutes, 0);
    expect(sum).toBe(r.totals.bookedMinutes);
  });
});

describe('daylight saving: opening hours are wall-clock', () => {
  const allDay = { id: 2, name: 'Around the clock', timeZone: NY, openingHours: [1, 2, 3, 4, 5, 6, 7].map((weekday) => ({ weekday, open: '00:00', close: '24:00' })), closures: [] };
  const chairs = [{ id: 31, name: 'Night 1', locationId: 2 }];

  it('a 00:00–24:00 day lasts 25 h on 2026-11-01 and 23 h on 2026-03-08', () => {
    const autumn = chairUse({ from: '2026-10-31', to: '2026-11-02', now: NOW, locations: [allDay], chairs, bookings: [] });
    expect(autumn.byDay.map((d) => d.openMinutes)).toEqual([1440, 1500, 1440]);
    const spring = chairUse({ from: '2026-03-07', to: '2026-03-09', now: NOW, locations: [allDay], chairs, bookings: [] });
    expect(spring.byDay.map((d) => d.openMinutes)).toEqual([1440, 1380, 1440]);
  });

  it('the repeated hour counts twice in the heat map; the skipped hour never appears', () => {
    // 00:30 EDT → 02:30 EST is three real hours: 30 min of hour 0, 60 + 60 of hour 1 (EDT, then EST), 30 of hour 2.
    const booking = { chairId: 31, start: Date.parse('2026-11-01T04:30:00Z'), end: Date.parse('2026-11-01T07:20:00Z'), turnoverMinutes: 10, state: 'booked' as const, seatedAt: null, dismissedAt: null };
    const r = chairUse({ from: '2026-11-01', to: '2026-11-01', now: NOW, locations: [allDay], chairs, bookings: [booking] });
    const sunday = r.heatmap.filter((c) => c.weekday === 7);
    expect(sunday.find((c) => c.hour === 1)!.openMinutes).toBe(120);
    expect([0, 1, 2].map((h) => sunday.find((c) => c.hour === h)!.bookedMinutes)).toEqual([30, 120, 30]);
    expect(r.totals.bookedMinutes).toBe(180);
    const spring = chairUse({ from: '2026-03-08', to: '2026-03-08', now: NOW, locations: [allDay], chairs, bookings: [] });
    expect(spring.heatmap.map((c) => c.hour)).not.toContain(2);
    expect(spring.heatmap).toHaveLength(23);
  });

  it('a 08:00–17:00 opening stays nine hours on both sides of the change', () => {
    const loc = { ...allDay, openingHours: [1, 2, 3, 4, 5, 6, 7].map((weekday) => ({ weekday, open: '08:00', close: '17:00' })) };
    const r = chairUse({ from: '2026-10-31', to: '2026-11-02', now: NOW, locations: [loc], chairs, bookings: [] });
    expect(r.byDay.map((d) => d.openMinutes)).toEqual([540, 540, 540]);
    // And it opens at 08:00 local after the change too: 13:00 UTC instead of 12:00 (Oct 31 → Nov 1 08:00 is 25 h).
    const before = chairUse({ from: '2026-10-31', to: '2026-10-31', now: NOW, locations: [loc], chairs, bookings: [{ chairId: 31, start: ny('2026-10-31 08:00'), end: ny('2026-10-31 08:50'), turnoverMinutes: 10, state: 'booked', seatedAt: null, dismissedAt: null }] });
    const after = chairUse({ from: '2026-11-02', to: '2026-11-02', now: NOW, locations: [loc], chairs, bookings: [{ chairId: 31, start: ny('2026-11-02 08:00'), end: ny('2026-11-02 08:50'), turnoverMinutes: 10, state: 'booked', seatedAt: null, dismissedAt: null }] });
    expect(ny('2026-11-01 08:00') - ny('2026-10-31 08:00')).toBe(25 * 3_600_000);
    expect(before.heatmap.find((c) => c.hour === 8)!.bookedMinutes).toBe(60);
    expect(after.heatmap.find((c) => c.hour === 8)!.bookedMinutes).toBe(60);
  });
});
