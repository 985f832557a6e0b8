import { DateTime } from 'luxon';
import { describe, expect, it } from 'vitest';
import { readiness, recallDates, type CaseVisit } from './completion.util.js';

const ZONE = 'America/New_York';
const at = (local: string) => DateTime.fromISO(local, { zone: ZONE }).toJSDate();
const visit = (id: number, start: string, end: string, state: CaseVisit['state']): CaseVisit => ({
  appointmentId: id,
  start: at(start),
  end: at(end),
  state,
  endodontist: 'Dr. Imre Castellan',
  locationName: 'Riverside',
  timeZone: ZONE,
});
const now = at('2026-12-10T12:00');

describe('readiness', () => {
  it('is ready when a visit is dismissed and nothing is booked ahead; lists the dismissed visits in local time', () => {
    const r = readiness(
      [visit(2, '2026-12-08T13:00', '2026-12-08T14:00', 'dismissed'), visit(1, '2026-12-01T09:00', '2026-12-01T10:30', 'dismissed'), visit(3, '2026-12-03T09:00', '2026-12-03T10:00', 'cancelled')],
      now,
    );
    expect(r.canComplete).toBe(true);
    expect(r.blockedBy).toBeNull();
    expect(r.visits.map((v) => [v.appointmentId, v.date, v.startTime, v.endTime])).toEqual([
      [1, '2026-12-01', '09:00', '10:30'],
      [2, '2026-12-08', '13:00', '14:00'],
    ]);
    expect(r.treatmentEndedOn).toBe('2026-12-08');
  });

  it('names every visit still booked ahead or in the chair', () => {
    const r = readiness(
      [visit(1, '2026-12-01T09:00', '2026-12-01T10:30', 'dismissed'), visit(2, '2026-12-15T09:00', '2026-12-15T10:00', 'confirmed'), visit(3, '2026-12-10T11:30', '2026-12-10T12:30', 'seated')],
      now,
    );
    expect(r.canComplete).toBe(false);
    expect(r.openVisits.map((o) => o.description)).toEqual(['the visit on Thu 10 Dec 2026 at 11:30 is in progress (seated)', 'the visit on Tue 15 Dec 2026 at 09:00 is still confirmed']);
    expect(r.blockedBy).toBe(
      'The case still has 2 open visits: the visit on Thu 10 Dec 2026 at 11:30 is in progress (seated); the visit on Tue 15 Dec 2026 at 09:00 is still confirmed',
    );
  });

  it('refuses without a dismissed visit, and a past visit left booked neither blocks nor counts', () => {
    expect(readiness([], now).blockedBy).toBe('No visit of this case has been dismissed yet; complete the case after its last visit');
    const r = readiness([visit(1, '2026-12-01T09:00', '2026-12-01T10:00', 'dismissed'), visit(2, '2026-12-02T09:00', '2026-12-02T10:00', 'booked')], now);
    expect(r.canComplete).toBe(true);
    expect(r.visits.map((v) => v.appointmentId)).toEqual([1]);
    // Ending exactly now is over: "in the future" is strictly after now.
    expect(readiness([visit(1, '2026-12-01T09:00', '2026-12-01T10:00', 'dismissed'), visit(2, '2026-12-10T11:00', '2026-12-10T12:00', 'booked')], now).canComplete).toBe(true);
  });

  it('reads local dates in the location zone across the end of daylight saving (IANA via luxon, references.md)', () => {
    // 2026-11-01 02:00 EDT → 01:00 EST: a 09:00 visit the day after is 14:00 UTC, not 13:00.
    const r = readiness([visit(1, '2026-11-02T09:00', '2026-11-02T10:00', 'dismissed')], now);
    expect(r.visits[0]!.start).toBe('2026-11-02T14:00:00.000Z');
    expect(r.visits[0]!.startTime).toBe('09:00');
    // A 23:30 local visit is the next day in UTC but stays on its local date.
    expect(readiness([visit(1, '2026-12-01T23:30', '2026-12-01T23:55', 'dismissed')], now).visits[0]!.date).toBe('2026-12-01');
  });
});

describe('recallDates', () => {
  it('adds calendar months to the treatment end, sorted, without repeats', () => {
    expect(recallDates('2026-12-08', [12, 6, 6])).toEqual([
      { months: 6, dueOn: '2027-06-08' },
      { months: 12, dueOn: '2027-12-08' },
    ]);
  });

  it('clamps to the end of a shorter month (common practice, no source; luxon plus months)', () => {
    expect(recallDates('2026-08-31', [6])).toEqual([{ months: 6, dueOn: '2027-02-28' }]);
    expect(recallDates('2027-08-31', [6])).toEqual([{ months: 6, dueOn: '2028-02-29' }]);
    expect(recallDates('2026-12-08', [])).toEqual([]);
  });
});
