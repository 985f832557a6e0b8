// The hand-computed fixture week of the report specs: America/New_York, Thu 2026-10-29 … Wed 2026-11-04,
// across the end of daylight saving (Sun 2026-11-01 02:00 EDT → 01:00 EST; IANA tz database through
// luxon, references.md "Calendars"). One location open Mon–Fri 08:00–17:00 and Sat 09:00–13:00, shut on
// Tue 2026-11-03 (closure) and Sundays; two chairs; 10-minute turnover; "now" is Wed 2026-11-04 12:00,
// so actual use counts the days up to Tue 11-03.
import { DateTime } from 'luxon';
import type { ChairBooking, ReportChair } from './chair-use.util.js';
import type { ReportLocation } from './report-time.util.js';
import type { AttendanceVisit } from './attendance.util.js';
import type { ReportOperator, OperatorBooking } from './operator-use.util.js';

export const NY = 'America/New_York';

/** Instant of a New York wall-clock reading 'YYYY-MM-DD HH:mm' (the reading must exist). */
export function ny(reading: string): number {
  const dt = DateTime.fromFormat(reading, 'yyyy-MM-dd HH:mm', { zone: NY });
  if (!dt.isValid) throw new RangeError(`bad reading '${reading}'`);
  return dt.toMillis();
}

const weekdays = [1, 2, 3, 4, 5].map((weekday) => ({ weekday, open: '08:00', close: '17:00' }));

export const FIXTURE_LOCATION: ReportLocation = {
  id: 1,
  name: 'Fernhollow',
  timeZone: NY,
  openingHours: [...weekdays, { weekday: 6, open: '09:00', close: '13:00' }],
  closures: ['2026-11-03'],
};

export const FIXTURE_CHAIRS: ReportChair[] = [
  { id: 11, name: 'Fernhollow 1', locationId: 1 },
  { id: 12, name: 'Fernhollow 2', locationId: 1 },
];

export const FROM = '2026-10-29';
export const TO = '2026-11-04';
export const NOW = ny('2026-11-04 12:00');

export interface FixtureBooking extends ChairBooking, OperatorBooking {
  key: string;
}

const T = 10;
const b = (key: string, chairId: number, operatorId: number, start: string, end: string, state: ChairBooking['state'], seated?: string, dismissed?: string): FixtureBooking => ({
  key,
  chairId,
  operatorId,
  locationId: 1,
  start: ny(start),
  end: ny(end),
  turnoverMinutes: T,
  state,
  seatedAt: seated ? ny(seated) : null,
  dismissedAt: dismissed ? ny(dismissed) : null,
});

// Operators: O1 (id 21) works Mon–Fri 08:00–12:00 with a break 10:00–10:15 and is off Fri 10-30 08:00–10:00;
// O2 (id 22) works Thu and Fri 12:00–17:00.
export const FIXTURE_BOOKINGS: FixtureBooking[] = [
  // Chair 1
  b('b1', 11, 21, '2026-10-29 08:00', '2026-10-29 09:30', 'dismissed', '2026-10-29 08:05', '2026-10-29 09:40'),
  // Booked to end at 16:50, its turnover at 17:00 = closing; it ran to 17:15 (+10 turnover = 17:25: a 25-minute overrun).
  b('b2', 11, 22, '2026-10-29 16:00', '2026-10-29 16:50', 'dismissed', '2026-10-29 16:10', '2026-10-29 17:15'),
  // On time, but its turnover runs 16:30+30+10 = 17:10, past 17:00: a 10-minute overrun; the turnover past closing is no use.
  b('b3', 11, 22, '2026-10-30 16:30', '2026-10-30 17:00', 'dismissed', '2026-10-30 16:30', '2026-10-30 17:00'),
  b('b4', 11, 21, '2026-10-31 09:00', '2026-10-31 10:00', 'no_show'),
  b('b5', 11, 21, '2026-11-02 10:00', '2026-11-02 11:00', 'cancelled'),
  // Booked on the closure day: no open time, so no use.
  b('b6', 11, 21, '2026-11-03 09:00', '2026-11-03 10:00', 'booked'),
  // Today's visit: booked, not yet done.
  b('b7', 11, 21, '2026-11-04 09:00', '2026-11-04 11:00', 'booked'),
  // Chair 2
  b('b8', 12, 22, '2026-10-29 12:00', '2026-10-29 13:00', 'dismissed', '2026-10-29 12:00', '2026-10-29 12:50'),
  // Monday's visit was never marked: Monday is not done for chair 2.
  b('b9', 12, 21, '2026-11-02 08:00', '2026-11-02 09:00', 'booked'),
  // Starts half an hour before Saturday's 09:00 opening: only 09:00–09:40 is inside open time.
  b('b10', 12, 21, '2026-10-31 07:30', '2026-10-31 09:30', 'dismissed', '2026-10-31 07:30', '2026-10-31 09:30'),
];

export const FIXTURE_OPERATORS: ReportOperator[] = [
  {
    id: 21,
    name: 'Dr. Fixture One',
    rules: [{ locationId: 1, rrule: 'FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR', startLocal: '08:00', endLocal: '12:00', breaks: [{ startLocal: '10:00', endLocal: '10:15' }] }],
    timeOff: [{ start: ny('2026-10-30 08:00'), end: ny('2026-10-30 10:00') }],
  },
  { id: 22, name: 'Dr. Fixture Two', rules: [{ locationId: 1, rrule: 'FREQ=WEEKLY;BYDAY=TH,FR', startLocal: '12:00', endLocal: '17:00', breaks: [] }], timeOff: [] },
];

/**
 * The same week for attendance, with booking, cancellation and confirmation facts. Late-cancellation
 * notice 48 h.
 */
export function fixtureAttendance(): AttendanceVisit[] {
  const base = (key: string, over: Partial<AttendanceVisit>): AttendanceVisit => {
    const f = FIXTURE_BOOKINGS.find((x) => x.key === key);
    return {
      id: Number(key.slice(1)),
      locationId: 1,
      chairId: f?.chairId ?? 12,
      start: f?.start ?? 0,
      end: f?.end ?? 0,
      turnoverMinutes: T,
      state: f?.state ?? 'booked',
      createdAt: ny('2026-10-20 10:00'),
      cancelledAt: null,
      cancelNoticeHours: null,
      confirmedAt: null,
      confirmedVia: null,
      remindersBeforeConfirmation: 0,
      ...over,
    };
  };
  const confirmed = (via: string, reminders: number) => ({ confirmedAt: ny('2026-10-27 09:00'), confirmedVia: via, remindersBeforeConfirmation: reminders });
  return [
    base('b1', confirmed('sms', 1)),
    base('b2', confirmed('link', 2)),
    base('b3', {}),
    base('b4', confirmed('desk', 0)),
    // Cancelled three days ahead (stored notice 72 h): early.
    base('b5', { cancelledAt: ny('2026-10-30 10:00'), cancelNoticeHours: 72 }),
    base('b6', {}),
    base('b7', {}),
    base('b8', confirmed('sms', 3)),
    base('b9', {}),
    // 'text' is read as the sms channel.
    base('b10', confirmed('text', 1)),
    // Cancelled at 07:30 on the day of a 14:00 visit: 6.5 h notice, late …
    base('b11', { chairId: 12, start: ny('2026-11-04 14:00'), end: ny('2026-11-04 15:00'), state: 'cancelled', cancelledAt: ny('2026-11-04 07:30'), cancelNoticeHours: 6.5 }),
    // … and its time filled at 08:00 the same day: a same-day fill (still confirmed, not yet taken place).
    base('b12', { chairId: 12, start: ny('2026-11-04 14:00'), end: ny('2026-11-04 14:45'), state: 'confirmed', createdAt: ny('2026-11-04 08:00'), ...confirmed('desk', 0) }),
    // Sat 10-31 10:00 EDT → Mon 11-02 09:00 EST is 47 h on the wall clock but 48 real hours (the clock fell
    // back on Sunday): with no stored notice the real 48 h count, which is not under 48 h, so early.
    base('b13', { chairId: 11, start: ny('2026-11-02 09:00'), end: ny('2026-11-02 09:30'), state: 'cancelled', cancelledAt: ny('2026-10-31 10:00') }),
    // Cancelled 2.5 h ahead, nothing filled the time: late.
    base('b14', { chairId: 12, start: ny('2026-10-29 14:00'), end: ny('2026-10-29 15:00'), state: 'cancelled', cancelledAt: ny('2026-10-29 11:30'), cancelNoticeHours: 2.5 }),
    // Wed 10-28 23:30 New York is already 10-29 in UTC, but its local day is before the range: left out.
    base('b15', { chairId: 12, start: ny('2026-10-28 23:30'), end: ny('2026-10-28 23:55'), state: 'dismissed' }),
    // Wed 11-04 23:30 New York (11-05 in UTC) is inside the range: counted, still open.
    base('b16', { chairId: 12, start: ny('2026-11-04 23:30'), end: ny('2026-11-04 23:55'), state: 'booked' }),
  ];
}
