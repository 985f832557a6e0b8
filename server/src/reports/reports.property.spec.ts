// Properties of the report figures over generated data (fast-check): shares stay in [0, 1], shares that
// must add to 1 do, and the backlog forecast never grows when capacity is added.
import { APPOINTMENT_STATES, type AppointmentState } from '@ostium/shared';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { attendance, type AttendanceVisit } from './attendance.util.js';
import { backlogForecast, type CapacityDay, type LocationCapacity } from './backlog.util.js';
import { chairUse, type ChairBooking } from './chair-use.util.js';
import { operatorUse } from './operator-use.util.js';
import { FIXTURE_CHAIRS, FIXTURE_LOCATION, FIXTURE_OPERATORS, NY, ny } from './reports.fixtures.util.js';

const MIN = 60_000;
const FROM = '2026-10-26';
const TO = '2026-11-08';
const LO = ny('2026-10-25 00:00');
const SPAN_MIN = 15 * 24 * 60;

const bookingArb = fc.record({
  chairId: fc.constantFrom(11, 12),
  operatorId: fc.constantFrom(21, 22),
  startMin: fc.integer({ min: 0, max: SPAN_MIN }),
  lengthMin: fc.integer({ min: 5, max: 240 }),
  state: fc.constantFrom(...APPOINTMENT_STATES),
  seatedDelay: fc.integer({ min: -10, max: 30 }),
  overrun: fc.integer({ min: -20, max: 90 }),
});

type BookingRow = { chairId: number; operatorId: number; startMin: number; lengthMin: number; state: AppointmentState; seatedDelay: number; overrun: number };

function toBookings(rows: BookingRow[]): (ChairBooking & { operatorId: number; locationId: number })[] {
  return rows.map((r) => {
    const start = LO + r.startMin * MIN;
    const end = start + r.lengthMin * MIN;
    const seatedAt = start + r.seatedDelay * MIN;
    const dismissedAt = Math.max(seatedAt + MIN, end + r.overrun * MIN);
    const done = r.state === 'dismissed';
    return { chairId: r.chairId, operatorId: r.operatorId, locationId: 1, start, end, turnoverMinutes: 10, state: r.state, seatedAt: done ? seatedAt : null, dismissedAt: done ? dismissedAt : null };
  });
}

const inUnit = (x: number | null) => x === null || (x >= 0 && x <= 1 + 1e-12);

describe('chair use and operator use shares', () => {
  it('every share lies in [0, 1], whatever the bookings (overlapping, outside hours, overrunning)', () => {
    fc.assert(
      fc.property(fc.array(bookingArb, { maxLength: 40 }), (rows) => {
        const bookings = toBookings(rows);
        const r = chairUse({ from: FROM, to: TO, now: ny('2026-11-05 12:00'), locations: [FIXTURE_LOCATION], chairs: FIXTURE_CHAIRS, bookings });
        for (const f of [r.totals, ...r.byChair, ...r.byLocation, ...r.byDay, ...r.byWeek]) {
          expect(inUnit(f.share) && inUnit(f.actualShare)).toBe(true);
          expect(f.actualOpenMinutes).toBeLessThanOrEqual(f.openMinutes);
        }
        for (const c of r.heatmap) expect(inUnit(c.share)).toBe(true);
        // The parts add up to the whole.
        const sum = (xs: { bookedMinutes: number }[]) => xs.reduce((s, x) => s + x.bookedMinutes, 0);
        expect(sum(r.byDay)).toBeCloseTo(r.totals.bookedMinutes, 6);
        expect(sum(r.byChair)).toBeCloseTo(r.totals.bookedMinutes, 6);
        expect(sum(r.heatmap)).toBeCloseTo(r.totals.bookedMinutes, 6);
        const o = operatorUse({ from: FROM, to: TO, locations: [FIXTURE_LOCATION], operators: FIXTURE_OPERATORS, bookings });
        for (const f of [o.totals, ...o.byOperator, ...o.byWeek]) expect(inUnit(f.share)).toBe(true);
      }),
      { numRuns: 150 },
    );
  });
});

describe('attendance shares', () => {
  const visitArb = fc.record({
    startMin: fc.integer({ min: 0, max: SPAN_MIN }),
    state: fc.constantFrom<AppointmentState>(...APPOINTMENT_STATES),
    noticeHours: fc.option(fc.double({ min: -5, max: 200, noNaN: true }), { nil: null }),
    confirmed: fc.boolean(),
    via: fc.constantFrom('sms', 'email', 'link', 'desk', null),
    reminders: fc.integer({ min: 0, max: 6 }),
    chairId: fc.constantFrom(11, 12),
    bookedSameDay: fc.boolean(),
  });
  it('outcomes add to 1 over visits; channels and reminder counts add to 1', () => {
    fc.assert(
      fc.property(fc.array(visitArb, { maxLength: 50 }), fc.integer({ min: 0, max: 96 }), (rows, notice) => {
        const visits: AttendanceVisit[] = rows.map((r, i) => {
          const start = LO + r.startMin * MIN;
          return {
            id: i + 1,
            locationId: 1,
            chairId: r.chairId,
            start,
            end: start + 60 * MIN,
            turnoverMinutes: 10,
            state: r.state,
            createdAt: r.bookedSameDay ? start - 60 * MIN : start - 5 * 86_400_000,
            cancelledAt: r.state === 'cancelled' ? start - 3_600_000 * (r.noticeHours ?? 1) : null,
            cancelNoticeHours: r.state === 'cancelled' ? r.noticeHours : null,
            confirmedAt: r.confirmed ? start - 86_400_000 : null,
            confirmedVia: r.via,
            remindersBeforeConfirmation: r.reminders,
          };
        });
        const a = attendance({ from: FROM, to: TO, lateCancelNoticeHours: notice, zones: new Map([[1, NY]]), visits });
        const t = a.totals;
        expect(t.attended + t.noShows + t.lateCancellations).toBe(t.visits);
        if (t.visits > 0) expect(t.attendedShare! + t.noShowShare! + t.lateCancellationShare!).toBeCloseTo(1, 9);
        else expect(t.attendedShare).toBeNull();
        const base = t.attended + t.noShows;
        const channels = a.confirmationByChannel.reduce((s, c) => s + c.visits, 0);
        expect(channels).toBe(base);
        if (base > 0) {
          expect(a.confirmationByChannel.reduce((s, c) => s + c.share!, 0)).toBeCloseTo(1, 9);
          const confirmedShare = a.confirmationByChannel.filter((c) => c.channel !== 'unconfirmed').reduce((s, c) => s + c.share!, 0);
          expect(confirmedShare).toBeCloseTo(a.confirmationRate!, 9);
        }
        const confirmed = a.confirmationByReminders.reduce((s, c) => s + c.visits, 0);
        if (confirmed > 0) expect(a.confirmationByReminders.reduce((s, c) => s + c.share!, 0)).toBeCloseTo(1, 9);
        expect(t.sameDayFills).toBeLessThanOrEqual(rows.length);
      }),
      { numRuns: 200 },
    );
  });
});

describe('backlog forecast', () => {
  const dayArb = fc.record({ chairFree: fc.integer({ min: 0, max: 3000 }), operatorFree: fc.integer({ min: 0, max: 2000 }), chairOpen: fc.integer({ min: 0, max: 4000 }) });
  const locationArb = (id: number) =>
    fc.record({
      days: fc.array(dayArb, { minLength: 14, maxLength: 14 }),
      openChairDays: fc.integer({ min: 0, max: 40 }),
      operatorDays: fc.integer({ min: 0, max: 20 }),
      workingMinutes: fc.integer({ min: 0, max: 10_000 }),
    }).map((l): LocationCapacity => ({ locationId: id, locationName: `L${id}`, ...l, days: l.days as CapacityDay[] }));
  const casesArb = fc.array(fc.record({ locationId: fc.constantFrom(1, 2), level: fc.constantFrom('low' as const, 'moderate' as const, 'high' as const, 'untriaged' as const), cases: fc.integer({ min: 0, max: 30 }) }), { maxLength: 8 });
  const averages = [
    { level: 'low' as const, minutes: 70, basis: 'visits' as const },
    { level: 'moderate' as const, minutes: 110, basis: 'visits' as const },
    { level: 'high' as const, minutes: 200, basis: 'visits' as const },
    { level: 'untriaged' as const, minutes: 120, basis: 'visits' as const },
  ];
  const knob = fc.integer({ min: -10, max: 10 });
  const inf = (x: number | null) => (x === null ? Infinity : x);

  it('adding chair days or operator days never increases the weeks of backlog or the lead time', () => {
    fc.assert(
      fc.property(fc.tuple(locationArb(1), locationArb(2)), casesArb, knob, knob, fc.nat(5), fc.nat(5), fc.option(fc.constantFrom(1, 2), { nil: undefined }), (locs, cases, c, o, dc, doo, locationId) => {
        const before = backlogForecast({ locations: locs, cases, averages, whatIf: { chairDaysPerWeek: c, operatorDaysPerWeek: o, locationId } });
        const after = backlogForecast({ locations: locs, cases, averages, whatIf: { chairDaysPerWeek: c + dc, operatorDaysPerWeek: o + doo, locationId } });
        expect(inf(after.totals.weeksOfBacklog)).toBeLessThanOrEqual(inf(before.totals.weeksOfBacklog) + 1e-9);
        expect(inf(after.leadTimeWeeks)).toBeLessThanOrEqual(inf(before.leadTimeWeeks) + 1e-9);
        expect(after.capacityMinutesPerWeek).toBeGreaterThanOrEqual(before.capacityMinutesPerWeek - 1e-9);
        for (const row of after.rows) {
          const prev = before.rows.find((r) => r.locationId === row.locationId && r.level === row.level)!;
          expect(inf(row.weeksOfBacklog)).toBeLessThanOrEqual(inf(prev.weeksOfBacklog) + 1e-9);
        }
        for (const r of [before, after]) {
          expect(r.noOpenTime).toBe(r.capacityMinutesPerWeek === 0);
          if (r.noOpenTime) expect([r.totals.weeksOfBacklog, r.leadTimeWeeks]).toEqual([null, null]);
          else {
            expect(Number.isFinite(r.totals.weeksOfBacklog)).toBe(true);
            expect(r.totals.weeksOfBacklog).toBeGreaterThanOrEqual(0);
          }
        }
      }),
      { numRuns: 300 },
    );
  });

  it('zero capacity always says "no open time"', () => {
    fc.assert(
      fc.property(casesArb, fc.integer({ min: -5, max: 0 }), fc.integer({ min: -5, max: 0 }), (cases, c, o) => {
        const shut: LocationCapacity = { locationId: 1, locationName: 'L1', days: Array.from({ length: 14 }, () => ({ chairFree: 0, operatorFree: 0, chairOpen: 0 })), openChairDays: 0, operatorDays: 0, workingMinutes: 0 };
        const r = backlogForecast({ locations: [shut], cases, averages, whatIf: { chairDaysPerWeek: c, operatorDaysPerWeek: o } });
        expect(r.noOpenTime).toBe(true);
        expect(r.totals.weeksOfBacklog).toBeNull();
        expect(r.leadTimeWeeks).toBeNull();
      }),
    );
  });
});
